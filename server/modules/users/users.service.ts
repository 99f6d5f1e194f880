import { UserModel } from "../../models/user";
import { RoleRequestModel } from "../../models/role-request";
import { AppError, ConflictError, ForbiddenError } from "../../errors";
import { StaleError } from "../../kit/stale";
import { recordAudit } from "../audit/audit.service";
import { revokeApiTokensOf } from "../api-tokens/api-tokens.service";
import { issuePasswordLink } from "../invitations/invitations.service";
import { TOKEN_HOLDERS } from "../../kit/roles";
import { sequelize } from "../../db/sequelize";
import { config } from "../../config";
import { forgetFailures, lockedAccounts } from "../auth/sign-in-counts";
import type { Transaction } from "sequelize";
import type { SignedIn } from "../../kit/actor";
import type { Role } from "../../../shared/schemas/common";
import {
  needsSecondAdmin,
  type CreateUserBody,
  type CreateUserResult,
  type PasswordLinkBody,
  type UpdateUserBody,
  type User,
} from "../../../shared/schemas/user";
import { createRoleRequest, toRoleRequest } from "./role-requests.service";

export type AdminActor = SignedIn;

export function toUser(row: UserModel): User {
  return {
    id: row.id,
    email: row.email,
    name: row.name,
    role: row.role,
    disabled: row.disabled,
    createdAt: row.createdAt.toISOString(),
    lastSignInAt: row.lastSignInAt ? row.lastSignInAt.toISOString() : null,
    passwordSet: row.passwordHash !== null,
    lockedUntil: null,
    version: row.version,
  };
}

/** The audit trail keeps what changed, never a password hash. */
export function auditView(u: User) {
  return { email: u.email, name: u.name, role: u.role, disabled: u.disabled };
}

/**
 * The user locked for update, if the admin saw its current version; otherwise 409 `stale` with the
 * user as it now stands, so two admins editing the same user cannot both win.
 */
export async function lockUserAtVersion(id: number, version: number, transaction: Transaction): Promise<UserModel> {
  const row = await lockUser(id, transaction);
  if (row.version !== version) throw staleUser(row);
  return row;
}

export async function lockUser(id: number, transaction: Transaction): Promise<UserModel> {
  const row = await UserModel.findByPk(id, { transaction, lock: transaction.LOCK.UPDATE });
  if (!row) throw new AppError(404, "not_found", `No user with id ${id}.`);
  return row;
}

export function staleUser(row: UserModel): StaleError {
  return new StaleError(
    `Someone else changed ${row.name} (${row.email}) since you opened the list (now version ${row.version}). Look at the user again and apply your change if it is still needed.`,
    toUser(row),
  );
}

/** A person's grant of the CRO or administrator role that waits for a second administrator, if any. */
export function pendingRequestFor(email: string, transaction?: Transaction) {
  return RoleRequestModel.findOne({ where: { email, status: "pending" }, transaction });
}

/** Everyone's name by e-mail (disabled people too: they stay in the records), for showing people by name. */
export async function listPeople(): Promise<{ email: string; name: string }[]> {
  const rows = await UserModel.findAll({ attributes: ["email", "name"], order: [["name", "ASC"]] });
  return rows.map((r) => ({ email: r.email, name: r.name }));
}

export async function listUsers(): Promise<User[]> {
  const rows = await UserModel.findAll({ order: [["email", "ASC"]] });
  const locked = await lockedAccounts(
    rows.map((r) => r.email),
    config.signIn.perAccount,
  );
  return rows.map((r) => ({ ...toUser(r), lockedUntil: locked.get(r.email)?.until.toISOString() ?? null }));
}

/**
 * Unlocks an account locked out by failed sign-ins: its failed attempts are forgotten and the person may try again
 * at once. The limit per client address stays (it protects every account). Audit-logged with what was forgotten.
 */
export async function unlockUser(id: number, actor: AdminActor): Promise<User> {
  const row = await UserModel.findByPk(id);
  if (!row) throw new AppError(404, "not_found", `No user with id ${id}.`);
  const locked = (await lockedAccounts([row.email], config.signIn.perAccount)).get(row.email);
  if (!locked) throw new ConflictError(`${row.name} (${row.email}) is not locked out; nothing to unlock.`);
  await sequelize.transaction(async (transaction) => {
    await forgetFailures(row.email, row.id);
    await recordAudit(
      actor,
      "user.unlock",
      row.email,
      {
        before: { failedSignIns: locked.failures, lockedUntil: locked.until.toISOString() },
        after: { lockedUntil: null },
      },
      transaction,
    );
  });
  return toUser(row);
}

/**
 * Creates a user by invitation: the admin gives name, e-mail and role, never a password; the
 * person gets a one-time link by e-mail and chooses their own. A CRO or administrator is a grant
 * that needs a second administrator: nothing is created and nothing sent until another admin
 * approves the request (then the account and its invitation come together), so no account ever
 * exists, even without a password, with a role only one person decided.
 */
export async function createUser(input: CreateUserBody, actor: AdminActor): Promise<CreateUserResult> {
  return sequelize.transaction(async (transaction) => {
    if (await UserModel.findOne({ where: { email: input.email }, transaction })) {
      throw new ConflictError(`A user with the e-mail ${input.email} already exists.`);
    }
    const waiting = await pendingRequestFor(input.email, transaction);
    if (waiting) {
      throw new ConflictError(
        `An invitation of ${input.email} as ${waiting.toRole} is already waiting for a second administrator's approval.`,
      );
    }
    if (needsSecondAdmin(null, input.role)) {
      const request = await createRoleRequest(
        { kind: "invite", userId: null, email: input.email, name: input.name, fromRole: null, toRole: input.role },
        actor,
        transaction,
      );
      return { outcome: "awaiting_approval", request: await toRoleRequest(request, transaction) };
    }
    const { user, expiresAt } = await inviteNewUser(input, actor, transaction);
    return { outcome: "invited", user, invitation: { expiresAt: expiresAt.toISOString() } };
  });
}

/** The account (no password yet) and its invitation, in the caller's transaction. */
export async function inviteNewUser(
  input: { email: string; name: string; role: Role },
  actor: AdminActor,
  transaction: Transaction,
): Promise<{ user: User; expiresAt: Date }> {
  const row = await UserModel.create(
    { email: input.email, name: input.name, role: input.role, passwordHash: null, lastSignInAt: null },
    { transaction },
  );
  await recordAudit(actor, "user.create", row.email, { after: auditView(toUser(row)) }, transaction);
  const { expiresAt } = await issuePasswordLink(row, "invite", actor, transaction);
  return { user: toUser(row), expiresAt };
}

/**
 * Moves a locked user to `role`: their sessions end (token version) and, leaving the token
 * holders, so do their API tokens, so that giving the role back later does not revive old ones.
 */
export async function applyRole(row: UserModel, role: Role, actor: AdminActor, transaction: Transaction) {
  row.role = role;
  row.tokenVersion = row.tokenVersion + 1;
  if (!row.disabled && !TOKEN_HOLDERS.includes(role)) {
    await revokeApiTokensOf(row.id, `role changed to ${role}`, actor, transaction);
  }
}

/**
 * Name, status and role changes that one administrator may make. Granting or removing the CRO or
 * administrator role is refused here (403 `approval_required`): it goes through a role request.
 * Role and status changes revoke the user's sessions at once (token version).
 */
export async function updateUser(id: number, change: UpdateUserBody, actor: AdminActor): Promise<User> {
  if (id === actor.user.id && (change.disabled === true || (change.role && change.role !== "admin"))) {
    throw new ForbiddenError("You cannot disable your own account or remove your own admin role.", "self_lockout");
  }
  return sequelize.transaction(async (transaction) => {
    const row = await lockUserAtVersion(id, change.version, transaction);
    const before = auditView(toUser(row));
    const roleChanges = change.role !== undefined && change.role !== row.role;
    if (roleChanges && needsSecondAdmin(row.role, change.role!)) {
      throw new ForbiddenError(
        `Granting or removing the chief risk officer or administrator role needs a second administrator: propose the change (POST /api/role-requests) and another administrator approves it. Nothing was changed.`,
        "approval_required",
      );
    }
    if (roleChanges) {
      const waiting = await pendingRequestFor(row.email, transaction);
      if (waiting)
        throw new ConflictError(
          `A change of ${row.name}'s role to ${waiting.toRole} is waiting for approval; approve or reject it first. Nothing was changed.`,
        );
    }
    const statusChanges = change.disabled !== undefined && change.disabled !== row.disabled;
    if (change.name !== undefined) row.name = change.name;
    if (change.disabled !== undefined) row.disabled = change.disabled;
    if (roleChanges) await applyRole(row, change.role!, actor, transaction);
    else if (statusChanges) row.tokenVersion = row.tokenVersion + 1;
    if (statusChanges && row.disabled) await revokeApiTokensOf(row.id, "account disabled", actor, transaction);
    row.version = row.version + 1;
    await row.save({ transaction });
    const user = toUser(row);
    await recordAudit(actor, "user.update", user.email, { before, after: auditView(user) }, transaction);
    return user;
  });
}

/**
 * Sends the user a new one-time link to set their password: their invitation again while they
 * have none, else a reset link (the current password keeps working until the link is used). The
 * admin never sees a password or the link; any earlier link stops working.
 */
export async function sendPasswordLink(
  id: number,
  { version }: PasswordLinkBody,
  actor: AdminActor,
): Promise<{ user: User; invitation: { purpose: "invite" | "reset"; expiresAt: string } }> {
  return sequelize.transaction(async (transaction) => {
    const row = await lockUserAtVersion(id, version, transaction);
    if (row.disabled) throw new ConflictError(`${row.name} is disabled: enable them first. No link was sent.`);
    row.version = row.version + 1;
    await row.save({ transaction });
    const { purpose, expiresAt } = await issuePasswordLink(
      row,
      row.passwordHash ? "reset" : "invite",
      actor,
      transaction,
    );
    return { user: toUser(row), invitation: { purpose, expiresAt: expiresAt.toISOString() } };
  });
}
