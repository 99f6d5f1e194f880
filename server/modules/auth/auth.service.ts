import { UserModel } from "../../models/user";
import { AppError, NotFoundError, UnauthorizedError } from "../../errors";
import { QueryTypes } from "sequelize";
import { sequelize } from "../../db/sequelize";
import { assertNewPassword } from "./password-rule";
import { recordAudit } from "../audit/audit.service";
import type { Actor, SignedIn } from "../../kit/actor";
import type { ChangePasswordBody, LoginBody, SessionUser } from "../../../shared/schemas/auth";
import { signSessionToken, verifySessionToken } from "./tokens";
import { hashPassword, passwordMatches as checkPassword } from "./password-hashing";

export { hashPassword };

// Compared against when the e-mail is unknown, so a wrong e-mail costs as long as a wrong password
// (a cost-12 bcrypt hash of a throw-away phrase).
const DUMMY_HASH = "$2b$12$oCr/2hbF00ueDRp4ozjaVeNBas.cDdWCFyiWGL/lJSbbD4215YFu.";

const WRONG_CREDENTIALS = "The e-mail address or password is not correct.";

type SessionCheck = Pick<UserModel, "email" | "name" | "role"> & {
  id: number | string;
  disabled: number | boolean;
  tokenVersion: number | string;
};

export function toSessionUser(user: Pick<UserModel, "id" | "email" | "name" | "role">): SessionUser {
  return { id: user.id, email: user.email, name: user.name, role: user.role };
}

/** Checks the credentials, records the attempt, and issues a session token. */
export async function signIn(credentials: LoginBody, actor: Actor): Promise<{ user: SessionUser; token: string }> {
  const user = await UserModel.findOne({ where: { email: credentials.email } });
  const passwordMatches = await checkPassword(credentials.password, user?.passwordHash ?? DUMMY_HASH);
  if (!user || !passwordMatches || user.disabled) {
    const reason = !user
      ? "unknown e-mail"
      : user.disabled
        ? "account disabled"
        : !user.passwordHash
          ? "no password set yet"
          : "wrong password";
    await recordAudit(actor, "auth.sign_in_failed", credentials.email, { after: { reason } });
    throw new UnauthorizedError(WRONG_CREDENTIALS);
  }
  user.lastSignInAt = new Date();
  await user.save();
  const sessionUser = toSessionUser(user);
  await recordAudit({ ...actor, user: sessionUser }, "auth.sign_in", user.email);
  return { user: sessionUser, token: signSessionToken(user.id, user.tokenVersion) };
}

/** Ends every session of the user at once by raising the token version. */
export async function signOut(actor: SignedIn): Promise<void> {
  await UserModel.increment("tokenVersion", { by: 1, where: { id: actor.user.id } });
  await recordAudit(actor, "auth.sign_out", actor.user.email);
}

/**
 * The user behind a session token, or why there is none. `genuine` says the token was ours
 * (signature, issuer and audience verified) but no longer valid: worth an audit event; forged or
 * malformed tokens are only logged, so nobody can fill the audit log with garbage cookies.
 */
export async function resolveSession(
  token: string,
): Promise<{ user: SessionUser } | { reason: string; genuine: boolean }> {
  const verified = verifySessionToken(token);
  if (!verified.ok) return { reason: verified.reason, genuine: /expired/i.test(verified.reason) };
  // Every signed-in request reads this row: one plain statement for the six columns the check needs
  // (a model finder builds its SQL on every call, about a third of a light request's CPU; see
  // DEVELOPERS.md, Performance notes).
  const [user] = await sequelize.query<SessionCheck>(
    "SELECT id, email, name, role, disabled, token_version AS tokenVersion FROM users WHERE id = ?",
    { replacements: [verified.userId], type: QueryTypes.SELECT },
  );
  if (!user) return { reason: "user no longer exists", genuine: true };
  if (Number(user.disabled)) return { reason: "account disabled", genuine: true };
  if (Number(user.tokenVersion) !== verified.tokenVersion) return { reason: "session revoked", genuine: true };
  return { user: toSessionUser({ ...user, id: Number(user.id) }) };
}

/**
 * Changes the signed-in person's own password: the current one must match, the new one follows
 * the password rule. Every other session of theirs ends (token version, as sign-out does); this
 * one continues with the new token returned.
 */
export async function changeOwnPassword(
  { currentPassword, newPassword }: ChangePasswordBody,
  actor: SignedIn,
): Promise<{ user: SessionUser; token: string }> {
  const found = await UserModel.findByPk(actor.user.id);
  if (!found) throw new NotFoundError("Your account no longer exists.");
  const matches = await checkPassword(currentPassword, found.passwordHash ?? DUMMY_HASH);
  if (!found.passwordHash || !matches) {
    await recordAudit(actor, "auth.password_change_failed", found.email, {
      after: { reason: "wrong current password" },
    });
    throw new AppError(422, "validation_failed", "Your current password is not correct. Nothing was changed.", {
      fields: { currentPassword: "This is not your current password" },
    });
  }
  assertNewPassword(newPassword, { email: found.email, name: found.name }, "newPassword");
  const passwordHash = await hashPassword(newPassword);
  return sequelize.transaction(async (transaction) => {
    const user = (await UserModel.findByPk(actor.user.id, { transaction, lock: transaction.LOCK.UPDATE }))!;
    user.passwordHash = passwordHash;
    user.tokenVersion = user.tokenVersion + 1; // from the locked row: every other session ends
    user.version = user.version + 1;
    await user.save({ transaction });
    await recordAudit(actor, "auth.password_change", user.email, {}, transaction);
    return { user: toSessionUser(user), token: signSessionToken(user.id, user.tokenVersion) };
  });
}
