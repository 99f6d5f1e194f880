/**
 * E-mail notifications about the work: who is told what, and each person's choice of what they
 * receive (nothing until they choose, on Your account). A message goes out after the write it tells of has committed, through the product's
 * mailer (the local sink in development, where Admin › Outbox shows it), and each is in the audit
 * log. A mail server that fails never undoes or delays the work: the failure is logged and audited.
 */
import { Op } from "sequelize";
import { UserModel } from "../../models/user";
import { NotificationSubscriptionModel } from "../../models/notification-subscription";
import { sequelize } from "../../db/sequelize";
import { sendMail } from "../../mail/mailer";
import { logger } from "../../logger";
import { config } from "../../config";
import { recordAudit } from "../audit/audit.service";
import type { Actor, SignedIn } from "../../kit/actor";
import {
  NOTIFICATION_KINDS,
  type NotificationChoices,
  type NotificationChoicesBody,
  type NotificationKind,
} from "../../../shared/schemas/notification";

const SYSTEM: Actor = { user: null, ip: null, requestId: null };

function kindsFor(role: string) {
  return NOTIFICATION_KINDS.filter((k) => k.audience.includes(role as never));
}

/** The kinds that concern the person's role, each with whether they chose to receive it. */
export async function notificationChoices(actor: SignedIn): Promise<NotificationChoices> {
  const on = new Set(
    (await NotificationSubscriptionModel.findAll({ where: { userId: actor.user.id } })).map((o) => o.kind),
  );
  return { choices: kindsFor(actor.user.role).map((k) => ({ kind: k.kind, label: k.label, on: on.has(k.kind) })) };
}

/** Replaces the person's chosen kinds (kinds outside their role are ignored, never stored). */
export async function setNotificationChoices(
  body: NotificationChoicesBody,
  actor: SignedIn,
): Promise<NotificationChoices> {
  const allowed = new Set(kindsFor(actor.user.role).map((k) => k.kind));
  const on = [...new Set(body.on)].filter((k) => allowed.has(k));
  await sequelize.transaction(async (transaction) => {
    await NotificationSubscriptionModel.destroy({ where: { userId: actor.user.id }, transaction });
    if (on.length)
      await NotificationSubscriptionModel.bulkCreate(
        on.map((kind) => ({ userId: actor.user.id, kind })),
        { transaction },
      );
    await recordAudit(actor, "notification.choices", actor.user.email, { after: { on } }, transaction);
  });
  return notificationChoices(actor);
}

/** The people a kind goes to: enabled accounts of its audience that chose it (a role change drops it). */
async function recipientsOf(kind: NotificationKind): Promise<{ email: string; name: string }[]> {
  const audience = NOTIFICATION_KINDS.find((k) => k.kind === kind)!.audience;
  const chosen = (await NotificationSubscriptionModel.findAll({ where: { kind } })).map((o) => o.userId);
  if (chosen.length === 0) return [];
  return UserModel.findAll({
    where: { id: chosen, role: [...audience], disabled: false, passwordHash: { [Op.ne]: null } },
    attributes: ["email", "name"],
    order: [["id", "ASC"]],
  });
}

export interface Notice {
  kind: NotificationKind;
  subject: string;
  /** The message's body; a line with where to act is added. */
  text: string;
  /** The address in the product where the reader acts on it, e.g. `/backtest/LKS-EU-TOTAL?exception=…`. */
  href: string;
  /** What the audit log names as the target ("LKS-EU Q3 2026"). */
  target: string;
}

/** Sends one notice to each of its recipients, one message each; never throws. */
export async function notify(notice: Notice): Promise<number> {
  try {
    const recipients = await recipientsOf(notice.kind);
    let sent = 0;
    for (const r of recipients) {
      try {
        await sendMail({
          to: [r.email],
          attachments: [],
          subject: `Quartermark: ${notice.subject}`,
          text:
            `Dear ${r.name},\n\n${notice.text}\n\nOpen it in Quartermark: ${config.publicUrl}${notice.href}\n\n` +
            "You receive this because of your role. Choose which messages you receive under Your account.\n",
        });
        sent++;
        await recordAudit(SYSTEM, "notification.sent", notice.target, { after: { kind: notice.kind, to: r.email } });
      } catch (err) {
        logger.error(`notification ${notice.kind} to ${r.email} was not sent: ${(err as Error).message}`);
        await recordAudit(SYSTEM, "notification.failed", notice.target, {
          after: { kind: notice.kind, to: r.email, error: String((err as Error).message).slice(0, 200) },
        }).catch(() => undefined);
      }
    }
    return sent;
  } catch (err) {
    logger.error(`notification ${notice.kind} failed: ${(err as Error).message}`);
    return 0;
  }
}
