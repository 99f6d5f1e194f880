import { QueryTypes } from "sequelize";
import type { ClientRateLimitInfo, Options, Store } from "express-rate-limit";
import { sequelize } from "../../db/sequelize";

/** The namespace of the server's own limits (tests give theirs to count apart). */
export const SIGN_IN_NAMESPACE = "sign-in";

/** The key of an account's failed sign-ins within a limiter (the e-mail as typed, trimmed and lower-cased). */
export function accountCounterKey(email: string): string {
  return `account:${email.trim().toLowerCase()}`;
}
export function passwordChangeCounterKey(userId: number | string): string {
  return `password-change:${userId}`;
}

/** The row key a store with this prefix keeps for `key`. */
function rowKey(keyPrefix: string, key: string): string {
  return `${keyPrefix}:${key}`.slice(0, 320);
}

// The account and password-change counters of any limiter namespace end with these (tests count in their own).
const accountSuffix = (email: string) => `:account:${accountCounterKey(email)}`;
const passwordChangeSuffix = (userId: number) => `:password-change:${passwordChangeCounterKey(userId)}`;
const ACCOUNT_MARK = ":account:account:";

/**
 * The accounts (by e-mail) locked out now: as many failed sign-ins as the limit within a window that has not ended,
 * with when the window ends and the count.
 */
export async function lockedAccounts(
  emails: readonly string[],
  limit: number,
): Promise<Map<string, { until: Date; failures: number }>> {
  const out = new Map<string, { until: Date; failures: number }>();
  if (emails.length === 0) return out;
  const wanted = new Set(emails.map((e) => e.trim().toLowerCase()));
  // Few rows: only windows not yet ended at the limit, swept now and then (increment below).
  const rows = await sequelize.query<{ k: string; hits: number; resetAt: Date }>(
    `SELECT counter_key AS k, hits, reset_at AS resetAt FROM sign_in_counts
      WHERE INSTR(counter_key, :mark) > 0 AND hits >= :limit AND reset_at > NOW(3)`,
    { replacements: { mark: ACCOUNT_MARK, limit }, type: QueryTypes.SELECT },
  );
  for (const r of rows) {
    const email = r.k.slice(r.k.indexOf(ACCOUNT_MARK) + ACCOUNT_MARK.length);
    if (!wanted.has(email)) continue;
    const until = new Date(r.resetAt);
    const seen = out.get(email);
    if (!seen || until > seen.until) out.set(email, { until, failures: Number(r.hits) });
  }
  return out;
}

/** Forgets an account's failed sign-ins and password-change attempts (an admin's unlock); the address limit stays. */
export async function forgetFailures(email: string, userId: number): Promise<void> {
  await sequelize.query(
    `DELETE FROM sign_in_counts
      WHERE RIGHT(counter_key, CHAR_LENGTH(:a)) = :a OR RIGHT(counter_key, CHAR_LENGTH(:p)) = :p`,
    { replacements: { a: accountSuffix(email), p: passwordChangeSuffix(userId) } },
  );
}

/**
 * A store for express-rate-limit that keeps the sign-in counts in MariaDB (table sign_in_counts),
 * so that every server process counts the same attempts: with one memory store per worker, N
 * workers would allow N times the limit. Each increment is one atomic upsert that starts a new
 * window when the old one has ended; expired rows are swept now and then.
 */
export class DatabaseCountStore implements Store {
  private windowMs = 60_000;
  private increments = 0;
  /** Tells this limiter's keys from another's in the one table ("address", "account", …). */
  constructor(private readonly keyPrefix: string) {}

  init(options: Options): void {
    this.windowMs = options.windowMs;
  }

  private key(key: string): string {
    return rowKey(this.keyPrefix, key);
  }

  async get(key: string): Promise<ClientRateLimitInfo | undefined> {
    const [row] = await sequelize.query<{ hits: number; resetAt: Date }>(
      "SELECT hits, reset_at AS resetAt FROM sign_in_counts WHERE counter_key = :key AND reset_at > NOW(3)",
      { replacements: { key: this.key(key) }, type: QueryTypes.SELECT },
    );
    return row ? { totalHits: Number(row.hits), resetTime: new Date(row.resetAt) } : undefined;
  }

  async increment(key: string): Promise<ClientRateLimitInfo> {
    const k = this.key(key);
    const ms = Math.round(this.windowMs) * 1000; // microseconds for INTERVAL … MICROSECOND
    await sequelize.query(
      `INSERT INTO sign_in_counts (counter_key, hits, reset_at) VALUES (:k, 1, NOW(3) + INTERVAL :ms MICROSECOND)
       ON DUPLICATE KEY UPDATE
         hits = IF(reset_at <= NOW(3), 1, hits + 1),
         reset_at = IF(reset_at <= NOW(3), NOW(3) + INTERVAL :ms MICROSECOND, reset_at)`,
      { replacements: { k, ms } },
    );
    if (++this.increments % 500 === 0)
      await sequelize.query("DELETE FROM sign_in_counts WHERE reset_at < NOW(3) - INTERVAL 1 HOUR");
    const [row] = await sequelize.query<{ hits: number; resetAt: Date }>(
      "SELECT hits, reset_at AS resetAt FROM sign_in_counts WHERE counter_key = :k",
      { replacements: { k }, type: QueryTypes.SELECT },
    );
    return { totalHits: Number(row.hits), resetTime: new Date(row.resetAt) };
  }

  async decrement(key: string): Promise<void> {
    await sequelize.query(
      "UPDATE sign_in_counts SET hits = GREATEST(hits - 1, 0) WHERE counter_key = :k AND reset_at > NOW(3)",
      { replacements: { k: this.key(key) } },
    );
  }

  async resetKey(key: string): Promise<void> {
    await sequelize.query("DELETE FROM sign_in_counts WHERE counter_key = :k", {
      replacements: { k: this.key(key) },
    });
  }
}
