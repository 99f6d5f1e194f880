import { UserModel } from "../../models/user";
import { AppError, ConflictError, NotFoundError, ForbiddenError } from "../../errors";
import { recordAudit } from "../audit/audit.service";
import { hashPassword } from "../auth/auth.service";
import { revokeApiTokensOf } from "../api-tokens/api-tokens.service";
import { TOKEN_HOLDERS } from "../../kit/roles";
import { sequelize } from "../../db/sequelize";
import type { Transaction } from "sequelize";
import type { SignedIn } from "../../kit/actor";
import type { CreateUserBody, ResetPasswordBody, UpdateUserBody, User } from "../../../shared/schemas/user";

function toUser(row: UserModel): User {
  return {
    id: row.id,
    email: row.email,
    name: row.name,
    role: row.role,
    disabled: row.disabled,
    createdAt: row.createdAt.toISOString(),
    lastSignInAt: row.lastSignInAt ? row.lastSignInAt.toISOString() : null,
    version: row.version,
  };
}

/** The audit trail keeps what changed, never a password hash. */
function auditView(u: User) {
  return { email: u.email, name: u.name, role: u.role, disabled: u.disabled };
}

async function findUser(id: number): Promise<UserModel> {
  const user = await UserModel.findByPk(id);
  if (!user) throw new NotFoundError(`No user with id ${id}.`);
  return user;
}

/**
 * The user locked for update, if the admin saw its current version; otherwise 409 `stale` with the
 * user as it now stands, so two admins editing the same user cannot both win.
 */
async function lockUserAtVersion(id: number, version: number, transaction: Transaction): Promise<UserModel> {
  const row = await UserModel.findByPk(id, { transaction, lock: transaction.LOCK.UPDATE });
  if (!row) throw new NotFoundError(`No user with id ${id}.`);
  if (row.version !== version) {
    throw new AppError(
      409,
      "stale",
      `Someone else changed ${row.name} (${row.email}) since you opened the list (now version ${row.version}). Look at the user again and apply your change if it is still needed.`,
      {
        current: toUser(row),
      },
    );
  }
  return row;
}

export async function listUsers(): Promise<User[]> {
  const rows = await UserModel.findAll({ order: [["email", "ASC"]] });
  return rows.map(toUser);
}

export async function createUser(input: CreateUserBody, actor: SignedIn): Promise<User> {
  if (await UserModel.findOne({ where: { email: input.email } })) {
    throw new ConflictError(`A user with the e-mail ${input.email} already exists.`);
  }
  const passwordHash = await hashPassword(input.password);
  return sequelize.transaction(async (transaction) => {
    const row = await UserModel.create(
      { email: input.email, name: input.name, role: input.role, passwordHash, lastSignInAt: null },
      { transaction },
    );
    const user = toUser(row);
    await recordAudit(actor, "user.create", user.email, { after: auditView(user) }, transaction);
    return user;
  });
}

/** Role and status changes revoke the user's sessions at once (token version). */
export async function updateUser(id: number, change: UpdateUserBody, actor: SignedIn): Promise<User> {
  if (id === actor.user.id && (change.disabled === true || (change.role && change.role !== "admin"))) {
    throw new ForbiddenError("You cannot disable your own account or remove your own admin role.", "self_lockout");
  }
  return sequelize.transaction(async (transaction) => {
    const row = await lockUserAtVersion(id, change.version, transaction);
    const before = auditView(toUser(row));
    const revokes =
      (change.role !== undefined && change.role !== row.role) ||
      (change.disabled !== undefined && change.disabled !== row.disabled);
    if (change.name !== undefined) row.name = change.name;
    if (change.role !== undefined) row.role = change.role;
    if (change.disabled !== undefined) row.disabled = change.disabled;
    if (revokes) row.tokenVersion = row.tokenVersion + 1;
    row.version = row.version + 1;
    await row.save({ transaction });
    // Their API tokens end too, so that giving the role back later does not revive old ones.
    if (revokes && (row.disabled || !TOKEN_HOLDERS.includes(row.role))) {
      await revokeApiTokensOf(
        row.id,
        row.disabled ? "account disabled" : `role changed to ${row.role}`,
        actor,
        transaction,
      );
    }
    const user = toUser(row);
    await recordAudit(actor, "user.update", user.email, { before, after: auditView(user) }, transaction);
    return user;
  });
}

export async function resetPassword(
  id: number,
  { password, version }: ResetPasswordBody,
  actor: SignedIn,
): Promise<User> {
  await findUser(id);
  const passwordHash = await hashPassword(password); // slow on purpose: outside the transaction
  return sequelize.transaction(async (transaction) => {
    const row = await lockUserAtVersion(id, version, transaction);
    row.passwordHash = passwordHash;
    row.tokenVersion = row.tokenVersion + 1; // from the locked row: every older session ends
    row.version = row.version + 1;
    await row.save({ transaction });
    await recordAudit(actor, "user.reset_password", row.email, {}, transaction);
    return toUser(row);
  });
}
