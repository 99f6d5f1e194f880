import { QueryTypes } from "sequelize";
import type { ClientRateLimitInfo, Options, Store } from "express-rate-limit";
import { sequelize } from "../../db/sequelize";

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
    return `${this.keyPrefix}:${key}`.slice(0, 320);
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
