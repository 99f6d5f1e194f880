import { AppError } from "../errors";

/**
 * The one 409 for optimistic locking: the row changed since the caller read it. `details.current`
 * is the row as it now stands, so the screen can show it and the person can apply the change again.
 */
export class StaleError extends AppError {
  constructor(message: string, current: unknown) {
    super(409, "stale", message, { current });
  }
}

/**
 * Checks the version the caller saw against the row's version now (read under its lock). When
 * they differ, `stale` says why and gives the row as it now stands; nothing has been written.
 * A `seen` of undefined means the caller did not send one and the check does not apply.
 */
export async function checkVersion(
  actual: number,
  seen: number | undefined,
  stale: () => { message: string; current: unknown } | Promise<{ message: string; current: unknown }>,
): Promise<void> {
  if (seen === undefined || actual === seen) return;
  const { message, current } = await stale();
  throw new StaleError(message, current);
}
