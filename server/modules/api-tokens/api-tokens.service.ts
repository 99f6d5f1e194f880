import { lockedRow } from "../../kit/lookups";
import { createHash, randomBytes } from "node:crypto";
import { Op, type Transaction } from "sequelize";
import { sequelize } from "../../db/sequelize";
import { ApiTokenModel } from "../../models/api-token";
import { UserModel } from "../../models/user";
import { ConflictError } from "../../errors";
import { TOKEN_HOLDERS } from "../../kit/roles";
import { recordAudit } from "../audit/audit.service";
import { toSessionUser } from "../auth/auth.service";
import type { Actor, SignedIn } from "../../kit/actor";
import type { SessionUser } from "../../../shared/schemas/auth";
import {
  API_TOKEN_MARKER,
  API_TOKEN_MAX_ACTIVE,
  API_TOKEN_PATTERN,
  API_TOKEN_PREFIX_LENGTH,
  apiTokenStatusAt,
  type ApiToken,
  type CreatedApiToken,
  type createApiTokenBodySchema,
} from "../../../shared/schemas/api-token";
import type { z } from "zod";

type CreateInput = z.output<typeof createApiTokenBodySchema>;

const DAY_MS = 24 * 60 * 60 * 1000;
// last_used_at is a hint for the owner, not a log: one write a minute per token is enough.
const LAST_USED_RESOLUTION_MS = 60_000;

/** The secret: 32 random bytes behind a marker that says what it is (so it can be recognised when leaked). */
function newSecret(): string {
  return `${API_TOKEN_MARKER}${randomBytes(32).toString("base64url")}`;
}

/** Only this is stored; a token is found by it, so no secret is ever compared by hand. */
function hashOf(secret: string): string {
  return createHash("sha256").update(secret, "utf8").digest("hex");
}

function toApiToken(row: ApiTokenModel, now = new Date()): ApiToken {
  const token = {
    id: row.id,
    name: row.name,
    prefix: row.prefix,
    createdAt: row.createdAt.toISOString(),
    lastUsedAt: row.lastUsedAt ? row.lastUsedAt.toISOString() : null,
    expiresAt: row.expiresAt.toISOString(),
    revokedAt: row.revokedAt ? row.revokedAt.toISOString() : null,
  };
  return { ...token, status: apiTokenStatusAt(token, now) };
}

/** What the audit log keeps of a token: never the secret nor its hash. */
function auditView(t: ApiToken) {
  return { name: t.name, prefix: t.prefix, expiresAt: t.expiresAt, revokedAt: t.revokedAt };
}

const target = (id: number) => `api token #${id}`;

const activeWhere = (now: Date) => ({ revokedAt: null, expiresAt: { [Op.gt]: now } });

/** The caller's own tokens, newest first, whatever their status. */
export async function listApiTokens(actor: SignedIn): Promise<ApiToken[]> {
  const rows = await ApiTokenModel.findAll({
    where: { userId: actor.user.id },
    order: [
      ["createdAt", "DESC"],
      ["id", "DESC"],
    ],
  });
  const now = new Date();
  return rows.map((r) => toApiToken(r, now));
}

/** One person holds a bounded number of live tokens; the user row is locked so two creations cannot both squeeze in. */
async function assertRoomForAnotherToken(userId: number, now: Date, transaction: Transaction): Promise<void> {
  await UserModel.findByPk(userId, { transaction, lock: transaction.LOCK.UPDATE });
  const active = await ApiTokenModel.count({ where: { userId, ...activeWhere(now) }, transaction });
  if (active >= API_TOKEN_MAX_ACTIVE) {
    throw new ConflictError(
      `You already hold ${active} active API tokens, the most allowed. Revoke one you no longer use first.`,
    );
  }
}

/** Issues a token for the caller's scripts; the secret is in this answer and nowhere else, ever. */
export async function createApiToken(input: CreateInput, actor: SignedIn): Promise<CreatedApiToken> {
  const secret = newSecret();
  const now = new Date();
  return sequelize.transaction(async (transaction) => {
    await assertRoomForAnotherToken(actor.user.id, now, transaction);
    const row = await ApiTokenModel.create(
      {
        userId: actor.user.id,
        name: input.name,
        tokenHash: hashOf(secret),
        prefix: secret.slice(0, API_TOKEN_PREFIX_LENGTH),
        createdAt: now,
        lastUsedAt: null,
        expiresAt: new Date(now.getTime() + input.expiresInDays * DAY_MS),
        revokedAt: null,
      },
      { transaction },
    );
    const token = toApiToken(row, now);
    await recordAudit(actor, "api_token.create", target(row.id), { after: auditView(token) }, transaction);
    return { ...token, secret };
  });
}

/** Revokes one of the caller's own tokens; another person's token is "not found" to them. Revoking twice changes nothing. */
export async function revokeApiToken(id: number, actor: SignedIn): Promise<void> {
  await sequelize.transaction(async (transaction) => {
    const row = await lockedRow(
      ApiTokenModel,
      { id, userId: actor.user.id },
      transaction,
      `You have no API token #${id}.`,
    );
    if (row.revokedAt) return;
    const before = toApiToken(row);
    row.revokedAt = new Date();
    await row.save({ transaction });
    await recordAudit(
      actor,
      "api_token.revoke",
      target(row.id),
      { before: auditView(before), after: auditView(toApiToken(row)) },
      transaction,
    );
  });
}

/**
 * Ends every live token of a user who can no longer hold them (disabled, or moved out of the
 * token-holding roles), inside the caller's transaction; the use-time checks refuse them anyway,
 * this keeps them from coming back if the role is given back later.
 */
export async function revokeApiTokensOf(
  userId: number,
  reason: string,
  actor: Actor,
  transaction: Transaction,
): Promise<number> {
  const now = new Date();
  const [count] = await ApiTokenModel.update(
    { revokedAt: now },
    { where: { userId, ...activeWhere(now) }, transaction },
  );
  if (count > 0)
    await recordAudit(actor, "api_token.revoke_all", `user #${userId}`, { after: { count, reason } }, transaction);
  return count;
}

export type TokenRejection = {
  reason: string;
  /** The token was ours (found by its hash) but may not be used: always worth an audit event. */
  genuine: boolean;
  token?: { id: number; prefix: string; owner: string | null };
};

/**
 * The owner behind a presented secret, with their current role, or why the token is refused.
 * Checked at every use: revoked, expired, owner disabled, owner no longer in a token-holding role.
 */
export async function resolveApiToken(
  presented: string,
  now = new Date(),
): Promise<{ user: SessionUser; tokenId: number } | TokenRejection> {
  if (!API_TOKEN_PATTERN.test(presented)) return { reason: "malformed token", genuine: false };
  const row = await ApiTokenModel.findOne({
    where: { tokenHash: hashOf(presented) },
    include: [{ model: UserModel, as: "user" }],
  });
  if (!row) return { reason: "unknown token", genuine: false };
  const owner = row.user ?? null;
  const refuse = (reason: string): TokenRejection => ({
    reason,
    genuine: true,
    token: { id: row.id, prefix: row.prefix, owner: owner?.email ?? null },
  });
  if (row.revokedAt) return refuse("token revoked");
  if (row.expiresAt.getTime() <= now.getTime()) return refuse("token expired");
  if (!owner) return refuse("owner no longer exists");
  if (owner.disabled) return refuse("owner's account disabled");
  if (!TOKEN_HOLDERS.includes(owner.role)) return refuse(`owner's role is now ${owner.role}`);
  if (!row.lastUsedAt || now.getTime() - row.lastUsedAt.getTime() >= LAST_USED_RESOLUTION_MS) {
    await ApiTokenModel.update({ lastUsedAt: now }, { where: { id: row.id } });
  }
  return { user: toSessionUser(owner), tokenId: row.id };
}
