/**
 * Password hashing off the event loop: bcrypt at cost 12 takes about a quarter of a second of CPU,
 * so twelve sign-ins at once on the main thread would stall every other request for seconds.
 * A small piscina pool (PASSWORD_THREADS threads) runs password-worker.mjs; the main thread only
 * waits. Threads start on the first job and end when idle, so a process with no sign-ins holds none.
 */
import path from "node:path";
import { Piscina } from "piscina";
import { config } from "../../config";

export const BCRYPT_COST = 12;

let pool: Piscina | null = null;

function passwordPool(): Piscina {
  pool ??= new Piscina({
    filename: path.join(config.projectRoot, "server", "modules", "auth", "password-worker.mjs"),
    minThreads: 0,
    maxThreads: config.passwordThreads,
    idleTimeout: 30_000,
  });
  return pool;
}

export function hashPassword(password: string): Promise<string> {
  return passwordPool().run({ kind: "hash", password, cost: BCRYPT_COST });
}

export function passwordMatches(password: string, hash: string): Promise<boolean> {
  return passwordPool().run({ kind: "compare", password, hash });
}

/** Password jobs this process's pool has finished (tests check that the work left the main thread). */
export function passwordJobsDone(): number {
  return pool?.completed ?? 0;
}

/** Ends the threads (graceful shutdown, tests). */
export async function closePasswordPool(): Promise<void> {
  const ending = pool;
  pool = null;
  await ending?.destroy();
}
