import mariadb from "mariadb";
import { config } from "../../../server/config";

/** A database session of its own, outside the application's pool: to hold locks or kill connections from outside. */
export function outsideSession() {
  return mariadb.createConnection({
    host: config.db.host,
    port: config.db.port,
    user: config.db.user,
    password: config.db.password,
    database: config.db.name,
  });
}

/**
 * Watches the process list from `session` every few milliseconds, for at most `ms` and while `go()` holds, for
 * another connection whose running query `matches`: that connection's id, or undefined when none came.
 */
export async function otherConnectionRunning(
  session: mariadb.Connection,
  matches: (query: string) => boolean,
  ms: number,
  go = () => true,
): Promise<number | undefined> {
  const [{ id: own }] = (await session.query("SELECT CONNECTION_ID() AS id")) as { id: bigint }[];
  for (const until = Date.now() + ms; Date.now() < until && go();) {
    const rows: { Id: number; Info: string | null }[] = await session.query("SHOW FULL PROCESSLIST");
    const found = rows.find((r) => BigInt(r.Id) !== BigInt(own) && matches(r.Info ?? ""));
    if (found) return Number(found.Id);
    await new Promise((r) => setTimeout(r, 2));
  }
  return undefined;
}

/** An outside session in a transaction that holds the rows `lockQuery` locks, as another writer would; the caller ends it. */
export async function sessionHolding(lockQuery: string, values: unknown[]) {
  const session = await outsideSession();
  await session.beginTransaction();
  await session.query(lockQuery, values);
  return session;
}
