import type { Transaction } from "sequelize";

/** The mariadb connection a Sequelize transaction runs on, for the few writes Sequelize makes slow. */
export interface RawConnection {
  /** Text protocol: values are escaped into the statement. */
  query(sql: string, values?: unknown[]): Promise<unknown>;
  /** Binary protocol (a prepared statement): values travel as they are, a Buffer without escaping. */
  execute(sql: string, values?: unknown[]): Promise<unknown>;
}

export function connectionOf(transaction: Transaction): RawConnection {
  const connection = (transaction as unknown as { connection?: RawConnection }).connection;
  if (!connection) throw new Error("the transaction has no connection yet");
  return connection;
}
