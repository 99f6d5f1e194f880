import { createHash, randomBytes } from "node:crypto";
import type { Transaction } from "sequelize";
import { config } from "../../config";
import { sequelize } from "../../db/sequelize";
import { AppError } from "../../errors";
import { sendMail } from "../../mail/mailer";
import { UserModel } from "../../models/user";
import { UserInvitationModel, type InvitationPurpose } from "../../models/user-invitation";
import { recordAudit } from "../audit/audit.service";
import { hashPassword, toSessionUser } from "../auth/auth.service";
import { assertNewPassword } from "../auth/password-rule";
import { signSessionToken } from "../auth/tokens";
import type { Actor, SignedIn } from "../../kit/actor";
import type { AcceptInvitationBody, Invitation, SessionUser } from "../../../shared/schemas/auth";
import type { PendingInvitation } from "../../../shared/schemas/user";
import type { Role } from "../../../shared/schemas/common";

/** How the e-mail names the role (the screens' own labels live in the client). */
const ROLE_NAMES: Record<Role, string> = {
  analyst: "analyst",
  cro: "chief risk officer",
  treasury: "treasury",
  regulator: "regulator",
  admin: "administrator",
};

const sha256 = (token: string) => createHash("sha256").update(token, "utf8").digest("hex");

/** The link in the e-mail: the token rides in the fragment, which browsers never send to a server or in a Referer. */
export function setPasswordLink(token: string): string {
  return `${config.publicUrl}/set-password#${token}`;
}

function mailFor(user: UserModel, purpose: InvitationPurpose, link: string, expiresAt: Date, by: string | null) {
  const until = `${expiresAt.toISOString().slice(0, 16).replace("T", " ")} UTC`;
  if (purpose === "invite") {
    return {
      subject: "Your Quartermark account: choose your password",
      text: [
        `Hello ${user.name},`,
        "",
        `${by ?? "An administrator"} has given you a Quartermark account (${ROLE_NAMES[user.role]}), signing in as ${user.email}.`,
        "Choose your password here (the link works once, until " + until + "):",
        "",
        link,
        "",
        "Nobody else knows or chooses your password, administrators included.",
        "If you did not expect this message, ignore it: without the link nothing happens.",
      ].join("\n"),
    };
  }
  return {
    subject: "Quartermark: set a new password",
    text: [
      `Hello ${user.name},`,
      "",
      `${by ?? "An administrator"} sent you a link to set a new Quartermark password for ${user.email}.`,
      `It works once, until ${until}. Your current password keeps working until you use it.`,
      "",
      link,
      "",
      "If you did not ask for this, ignore this message and tell your administrator.",
    ].join("\n"),
  };
}

/**
 * Sends `user` a new one-time link to set their password, inside the caller's transaction: any
 * earlier open link of theirs stops working, only the SHA-256 of the new token is stored, and
 * the message goes out last, so a mail server that refuses it rolls everything back.
 */
export async function issuePasswordLink(
  user: UserModel,
  purpose: InvitationPurpose,
  actor: SignedIn,
  transaction: Transaction,
): Promise<{ expiresAt: Date; purpose: InvitationPurpose }> {
  const now = new Date();
  await UserInvitationModel.update(
    { revokedAt: now },
    { where: { userId: user.id, usedAt: null, revokedAt: null }, transaction },
  );
  const token = randomBytes(32).toString("base64url");
  const expiresAt = new Date(now.getTime() + config.invitationTtlHours * 3600_000);
  await UserInvitationModel.create(
    {
      userId: user.id,
      purpose,
      tokenHash: sha256(token),
      createdBy: actor.user.id,
      expiresAt,
      usedAt: null,
      revokedAt: null,
    },
    { transaction },
  );
  await recordAudit(
    actor,
    purpose === "invite" ? "user.invite" : "user.password_link",
    user.email,
    { after: { purpose, expiresAt: expiresAt.toISOString() } },
    transaction,
  );
  await sendMail({
    to: [user.email],
    ...mailFor(user, purpose, setPasswordLink(token), expiresAt, actor.user.name),
    attachments: [],
  });
  return { expiresAt, purpose };
}

class LinkRefused extends AppError {}

/** The open link behind a token, or a refusal that says plainly why (unknown, replaced, used, expired, account disabled). */
function checkOpen(
  row: UserInvitationModel | null,
  now = new Date(),
): asserts row is UserInvitationModel & { user: UserModel } {
  if (!row || !row.user)
    throw new LinkRefused(
      404,
      "link_unknown",
      "This link is not known to Quartermark. Check that you opened the whole link from the e-mail, or ask your administrator for a new one.",
    );
  if (row.usedAt)
    throw new LinkRefused(
      410,
      "link_used",
      "This link has already been used. Sign in with the password you chose, or ask your administrator for a new link.",
    );
  if (row.revokedAt)
    throw new LinkRefused(
      410,
      "link_replaced",
      "A newer link was sent after this one, so this one no longer works. Use the link in the most recent e-mail.",
    );
  if (row.expiresAt.getTime() <= now.getTime())
    throw new LinkRefused(
      410,
      "link_expired",
      `This link expired on ${row.expiresAt.toISOString().slice(0, 16).replace("T", " ")} UTC. Ask your administrator to send a new one.`,
    );
  if (row.user.disabled)
    throw new LinkRefused(410, "account_disabled", "This account is disabled. Ask your administrator.");
}

function findByToken(token: string, transaction?: Transaction) {
  return UserInvitationModel.findOne({
    where: { tokenHash: sha256(token) },
    include: [{ model: UserModel, as: "user" }],
    transaction,
    lock: transaction ? transaction.LOCK.UPDATE : undefined,
  });
}

/** Public: what the set-password screen shows for a link. Reads only. */
export async function lookupInvitation(token: string): Promise<Invitation> {
  const row = await findByToken(token);
  checkOpen(row);
  return {
    purpose: row.purpose,
    email: row.user.email,
    name: row.user.name,
    role: row.user.role,
    expiresAt: row.expiresAt.toISOString(),
  };
}

/**
 * Public: the invitee sets their password with the link. The password rule is checked and
 * bcrypt runs before the transaction; inside it the link is locked and checked again (two tabs
 * using it at once: one wins), the password is set, every older session ends (token version),
 * the link is spent, and the person is signed in.
 */
export async function acceptInvitation(
  { token, password }: AcceptInvitationBody,
  actor: Actor,
): Promise<{ user: SessionUser; token: string }> {
  const first = await findByToken(token);
  checkOpen(first);
  assertNewPassword(password, { email: first.user.email, name: first.user.name });
  const passwordHash = await hashPassword(password);
  return sequelize.transaction(async (transaction) => {
    const row = await findByToken(token, transaction);
    checkOpen(row);
    const user = (await UserModel.findByPk(row.userId, { transaction, lock: transaction.LOCK.UPDATE }))!;
    const now = new Date();
    user.passwordHash = passwordHash;
    user.tokenVersion = user.tokenVersion + 1;
    user.version = user.version + 1;
    user.lastSignInAt = now;
    await user.save({ transaction });
    row.usedAt = now;
    await row.save({ transaction });
    const sessionUser = toSessionUser(user);
    const as = { ...actor, user: sessionUser };
    await recordAudit(
      as,
      row.purpose === "invite" ? "invitation.accept" : "password_link.accept",
      user.email,
      { after: { purpose: row.purpose } },
      transaction,
    );
    await recordAudit(as, "auth.sign_in", user.email, {}, transaction);
    return { user: sessionUser, token: signSessionToken(user.id, user.tokenVersion) };
  });
}

/** Links not used and not replaced: still open, or expired (the admin sends a new one). */
export async function listPendingInvitations(): Promise<PendingInvitation[]> {
  const rows = await UserInvitationModel.findAll({
    where: { usedAt: null, revokedAt: null },
    include: [
      { model: UserModel, as: "user", where: { disabled: false } },
      { model: UserModel, as: "creator" },
    ],
    order: [["createdAt", "DESC"]],
  });
  const now = Date.now();
  return rows.map((r) => ({
    id: r.id,
    userId: r.userId,
    email: r.user!.email,
    name: r.user!.name,
    role: r.user!.role,
    purpose: r.purpose,
    createdBy: r.creator?.name ?? null,
    createdAt: r.createdAt.toISOString(),
    expiresAt: r.expiresAt.toISOString(),
    expired: r.expiresAt.getTime() <= now,
  }));
}
