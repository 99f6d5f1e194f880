import { AsyncLocalStorage } from "node:async_hooks";
import type { Sequelize, Transaction } from "sequelize";
import { ServerBusyError } from "../errors";
import { logger } from "../logger";
import { Semaphore, SemaphoreRefusal } from "../semaphore";

/**
 * One connection per transaction. Sequelize's CLS hook (`Sequelize.useCLS`) makes every query
 * issued inside `sequelize.transaction(async (t) => …)` run in that transaction when it names
 * none — however deep the call — so a transaction never asks the pool for a second connection
 * while holding one (under load, every pooled connection held by a transaction waiting for
 * another one stalled the whole application). The namespace Sequelize expects is built on
 * Node's AsyncLocalStorage instead of the cls-hooked package.
 */
const storage = new AsyncLocalStorage<Map<string, unknown>>();

const namespace = {
  get: (key: string) => storage.getStore()?.get(key),
  set: (key: string, value: unknown) => void storage.getStore()?.set(key, value),
  /** A new context that starts as a copy of the current one, as cls-hooked's `run` does. */
  run<T>(fn: (context: Map<string, unknown>) => T): T {
    const context = new Map(storage.getStore());
    return storage.run(context, () => fn(context));
  },
  bind: <F>(fn: F) => fn,
};

/** Where a transaction asked the pool for another connection (kept for tests; logged). */
const asked: string[] = [];

export function connectionsAskedInsideTransactions(): readonly string[] {
  return asked;
}

/** The transaction the current code runs in, if any. */
export function currentTransaction(): Transaction | null {
  const t = storage.getStore()?.get("transaction") as Transaction | null | undefined;
  return t && !(t as unknown as { finished?: string }).finished ? t : null;
}

export interface PoolLimits {
  /** Pooled connections. */
  max: number;
  /** Connections transactions may not take, so that reads are served while writers wait at locks. */
  readReserve: number;
  /** How long a caller waits for a connection (or a transaction for its turn) before 503. */
  acquireMs: number;
  /** Most callers that may wait for a connection; one more is told the server is busy at once. */
  queue: number;
}

/** Installs the CLS namespace; call before the Sequelize instance is made. */
export function useTransactionContext(SequelizeClass: typeof Sequelize): void {
  SequelizeClass.useCLS(namespace);
}

type PooledConnection = { uuid?: string };

/**
 * Watches the pool. A caller inside a live transaction asking for a connection is recorded and
 * logged. Transactions take turns for at most `max - readReserve` connections (a transaction
 * waiting at a row lock holds its connection, and without a reserve a burst of writers would
 * leave a plain read waiting behind all of them). Callers beyond the queue limit, or that wait
 * longer than `acquireMs`, are refused with 503 and Retry-After instead of piling up.
 */
export function watchPool(sequelize: Sequelize, limits: PoolLimits): void {
  const manager = sequelize.connectionManager as unknown as {
    getConnection(options?: { uuid?: string }): Promise<PooledConnection>;
    releaseConnection(connection: PooledConnection): Promise<void>;
    destroyConnection(connection: PooledConnection): Promise<void>;
  };
  const getConnection = manager.getConnection.bind(manager);
  const releaseConnection = manager.releaseConnection.bind(manager);
  const destroyConnection = manager.destroyConnection.bind(manager);
  const transactions = new Semaphore(Math.max(1, limits.max - limits.readReserve), limits.queue);
  /** Transaction id → its turn, given back when its connection goes back to the pool. */
  const turns = new Map<string, () => void>();
  let waiting = 0;

  const busy = () => new ServerBusyError("The database is busy with other requests.");
  manager.getConnection = async (options) => {
    const held = currentTransaction();
    if (held) {
      const where = new Error("a connection asked for inside a transaction").stack ?? "";
      asked.push(where);
      logger.error(
        `transaction ${(held as unknown as { id: string }).id} asked the pool for a second connection:\n${where}`,
      );
    }
    const transactionId = options?.uuid;
    if (transactionId) {
      try {
        turns.set(transactionId, await transactions.acquire(limits.acquireMs));
      } catch (err) {
        if (err instanceof SemaphoreRefusal) throw busy();
        throw err;
      }
    } else if (waiting >= limits.queue) throw busy();
    waiting++;
    try {
      return await getConnection(options);
    } catch (err) {
      giveBack(transactionId);
      throw err;
    } finally {
      waiting--;
    }
  };
  const giveBack = (transactionId: string | undefined) => {
    if (!transactionId) return;
    turns.get(transactionId)?.();
    turns.delete(transactionId);
  };
  manager.releaseConnection = async (connection) => {
    giveBack(connection.uuid);
    return releaseConnection(connection);
  };
  manager.destroyConnection = async (connection) => {
    giveBack(connection.uuid);
    return destroyConnection(connection);
  };
}
