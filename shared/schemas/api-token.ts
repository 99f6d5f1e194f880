import { z } from "zod";
import { plainNameSchema } from "./common";

/**
 * Personal API tokens: treasury's scripts read capital figures with one (docs/architecture.md#roles).
 * The secret is shown once, at creation; the server keeps only its SHA-256 and a short prefix to
 * recognise it by.
 */

/** "qmk_" and 43 base64url characters (32 random bytes). */
export const API_TOKEN_PATTERN = /^qmk_[A-Za-z0-9_-]{43}$/;
export const API_TOKEN_MARKER = "qmk_";
/** How much of the secret is kept in clear and shown in lists: the marker and 8 characters. */
export const API_TOKEN_PREFIX_LENGTH = 12;

export const API_TOKEN_DEFAULT_DAYS = 90;
export const API_TOKEN_MAX_DAYS = 365;
/** Active (neither expired nor revoked) tokens one person may hold at once. */
export const API_TOKEN_MAX_ACTIVE = 10;

export const apiTokenStatusSchema = z.enum(["active", "expired", "revoked"]);
export type ApiTokenStatus = z.infer<typeof apiTokenStatusSchema>;

export const apiTokenSchema = z.object({
  id: z.number().int(),
  name: z.string(),
  /** The first characters of the secret, for telling tokens apart; not enough to use one. */
  prefix: z.string(),
  createdAt: z.string(),
  lastUsedAt: z.string().nullable(),
  expiresAt: z.string(),
  revokedAt: z.string().nullable(),
  status: apiTokenStatusSchema,
});
export type ApiToken = z.infer<typeof apiTokenSchema>;
export const apiTokenListSchema = z.array(apiTokenSchema);

/** The answer to a creation: the token and, this once only, its secret. */
export const createdApiTokenSchema = apiTokenSchema.extend({ secret: z.string().regex(API_TOKEN_PATTERN) });
export type CreatedApiToken = z.infer<typeof createdApiTokenSchema>;

export const createApiTokenBodySchema = z.strictObject({
  name: plainNameSchema.pipe(z.string().max(80, "At most 80 characters")),
  expiresInDays: z
    .number("A number of days")
    .int("A whole number of days")
    .min(1, "At least 1 day")
    .max(API_TOKEN_MAX_DAYS, `At most ${API_TOKEN_MAX_DAYS} days`)
    .default(API_TOKEN_DEFAULT_DAYS),
});
export type CreateApiTokenBody = z.input<typeof createApiTokenBodySchema>;

/** What a token's status is at `now`: revoked wins over expired. */
export function apiTokenStatusAt(
  token: { expiresAt: string; revokedAt: string | null },
  now = new Date(),
): ApiTokenStatus {
  if (token.revokedAt) return "revoked";
  return new Date(token.expiresAt).getTime() <= now.getTime() ? "expired" : "active";
}
