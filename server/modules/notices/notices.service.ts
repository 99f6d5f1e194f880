/**
 * Overshooting notices (docs/rules.md#overshooting-notice, docs/api.md#notices): the list of an
 * entity's notices, the analyst's draft of the cause (optimistic locking), and the chief risk
 * officer's send: a PDF by e-mail to the entity's supervisor contacts, recorded with who and when.
 * The notices themselves are opened by the upload commit (notices.open.ts).
 */
import { QueryTypes, type Transaction } from "sequelize";
import { createHash, randomBytes } from "node:crypto";
import { sequelize } from "../../db/sequelize";
import { OvershootingNoticeModel } from "../../models/overshooting-notice";
import { AppError, ConflictError, NotFoundError, parseInput } from "../../errors";
import { checkVersion } from "../../kit/stale";
import { entityByCode } from "../../kit/lookups";
import { MailNotSentError, sendMail } from "../../mail/mailer";
import { recordAudit } from "../audit/audit.service";
import { renderNoticePdf, noticePdfFileName } from "../../pdf/notice-pdf";
import { noticeIsLate } from "../../../shared/backtest/notice-deadline";
import {
  noticeDraftBodySchema,
  noticeListQuerySchema,
  noticeSendBodySchema,
  type Notice,
} from "../../../shared/schemas/notice";
import type { SignedIn } from "../../kit/actor";

const todayUtc = () => new Date().toISOString().slice(0, 10);
const iso = (d: Date | string | null) => (d === null ? null : new Date(d).toISOString());
const num = (v: unknown) => (v === null || v === undefined ? null : Number(v));

interface NoticeRow {
  id: number;
  entity: string;
  entity_name: string;
  currency: string;
  portfolio: string;
  date: string;
  status: Notice["status"];
  revealed_on: string;
  due_on: string;
  series: Notice["series"];
  actual_pnl: string | null;
  hypothetical_pnl: string | null;
  var_99: string | null;
  excess: string | null;
  cause: string | null;
  drafted_by: string | null;
  drafted_at: Date | null;
  sent_by: string | null;
  sent_at: Date | null;
  recipients_json: string | null;
  withdrawn_at: Date | null;
  note: string | null;
  version: number;
}

const SELECT = `
  SELECT n.id, e.code AS entity, e.name AS entity_name, e.currency, p.code AS portfolio,
         DATE_FORMAT(n.business_date, '%Y-%m-%d') AS date, n.status,
         DATE_FORMAT(n.revealed_on, '%Y-%m-%d') AS revealed_on, DATE_FORMAT(n.due_on, '%Y-%m-%d') AS due_on,
         n.series, n.actual_pnl, n.hypothetical_pnl, n.var_99, n.excess, n.cause,
         d.name AS drafted_by, n.drafted_at, s.name AS sent_by, n.sent_at, n.recipients_json, n.withdrawn_at,
         n.note, n.version
    FROM overshooting_notices n
    JOIN portfolios p ON p.id = n.portfolio_id
    JOIN entities e ON e.id = p.entity_id
    LEFT JOIN users d ON d.id = n.drafted_by
    LEFT JOIN users s ON s.id = n.sent_by`;

function toNotice(r: NoticeRow, today = todayUtc()): Notice {
  const sentAt = iso(r.sent_at);
  return {
    id: Number(r.id),
    entity: r.entity,
    entityName: r.entity_name,
    portfolio: r.portfolio,
    currency: r.currency,
    date: r.date,
    status: r.status,
    revealedOn: r.revealed_on,
    dueOn: r.due_on,
    late: noticeIsLate({ status: r.status, dueOn: r.due_on, sentOn: sentAt?.slice(0, 10) ?? null }, today),
    series: r.series,
    actualPnl: num(r.actual_pnl),
    hypotheticalPnl: num(r.hypothetical_pnl),
    var99: num(r.var_99),
    excess: num(r.excess),
    cause: r.cause ?? "",
    draftedBy: r.drafted_by,
    draftedAt: iso(r.drafted_at),
    sentBy: r.sent_by,
    sentAt,
    recipients: r.recipients_json ? (JSON.parse(r.recipients_json) as string[]) : [],
    withdrawnAt: iso(r.withdrawn_at),
    note: r.note,
    version: Number(r.version),
  };
}

/** One notice as the API shows it (read inside the caller's transaction when there is one). */
export async function noticeById(id: number): Promise<Notice> {
  const [row] = await sequelize.query<NoticeRow>(`${SELECT} WHERE n.id = :id`, {
    replacements: { id },
    type: QueryTypes.SELECT,
  });
  if (!row) throw new NotFoundError(`No overshooting notice #${id}.`);
  return toNotice(row);
}

/** An entity's notices, newest overshooting first. */
export async function listNotices(query: unknown): Promise<Notice[]> {
  const { entity } = parseInput(noticeListQuerySchema, query, "query");
  const row = await entityByCode(entity);
  const rows = await sequelize.query<NoticeRow>(`${SELECT} WHERE e.id = :id ORDER BY n.business_date DESC, n.id DESC`, {
    replacements: { id: row.id },
    type: QueryTypes.SELECT,
  });
  return rows.map((r) => toNotice(r));
}

async function lockNotice(id: number): Promise<OvershootingNoticeModel> {
  const row = await OvershootingNoticeModel.findByPk(id, { lock: true });
  if (!row) throw new NotFoundError(`No overshooting notice #${id}.`);
  return row;
}

const staleOf = (id: number) => async () => ({
  message: "Someone changed this notice since you opened it. Here it is as it now stands; check it and try again.",
  current: await noticeById(id),
});

/** Saves an edited notice with its version bumped and audits the action; the notice as it now stands. */
async function saveNotice(
  row: OvershootingNoticeModel,
  actor: SignedIn,
  action: string,
  change: (notice: Notice) => { before: unknown; after: unknown },
  transaction: Transaction,
): Promise<Notice> {
  row.version += 1;
  await row.save({ transaction });
  const notice = await noticeById(row.id);
  await recordAudit(actor, action, `${notice.entity} ${notice.portfolio} ${notice.date}`, change(notice), transaction);
  return notice;
}

/** The PDF of a sent notice exactly as the supervisor received it, with its sha256. */
export async function sentNoticePdf(id: number): Promise<{ fileName: string; bytes: Buffer; sha256: string }> {
  const row = await OvershootingNoticeModel.scope("withPdf").findByPk(id);
  if (!row) throw new NotFoundError(`No overshooting notice #${id}.`);
  if (row.status !== "sent" || !row.pdf)
    throw new NotFoundError(`Notice #${id} has not been sent, so there is no PDF of it yet.`);
  const notice = await noticeById(id);
  return { fileName: noticePdfFileName(notice), bytes: row.pdf, sha256: row.pdfSha256 ?? "" };
}

/** The analyst writes (or rewrites) the cause so far; only a notice not yet sent. */
export async function draftNotice(id: number, body: unknown, actor: SignedIn): Promise<Notice> {
  const input = parseInput(noticeDraftBodySchema, body);
  return sequelize.transaction(async (transaction) => {
    const row = await lockNotice(id);
    await checkVersion(row.version, input.version, staleOf(id));
    if (row.status !== "open")
      throw new ConflictError(
        `Notice #${id} is ${row.status === "sent" ? "already sent" : "withdrawn"}; it no longer changes.`,
      );
    const before = { cause: row.cause, draftedBy: row.draftedBy };
    row.cause = input.cause;
    row.draftedBy = actor.user.id;
    row.draftedAt = new Date();
    return saveNotice(row, actor, "notice.draft", () => ({ before, after: { cause: input.cause } }), transaction);
  });
}

/**
 * The chief risk officer sends a drafted notice: its PDF by e-mail to the entity's supervisor
 * contacts, one message to all of them. The row stays locked while the mail server takes the message;
 * a refusal rolls everything back (nothing recorded as sent) and says why.
 */
export async function sendNotice(id: number, body: unknown, actor: SignedIn): Promise<Notice> {
  const input = parseInput(noticeSendBodySchema, body);
  return sequelize.transaction(async (transaction) => {
    const row = await lockNotice(id);
    await checkVersion(row.version, input.version, staleOf(id));
    if (row.status === "sent") throw new ConflictError(`Notice #${id} was already sent.`);
    if (row.status === "withdrawn")
      throw new ConflictError(`Notice #${id} was withdrawn (${row.note ?? "restated"}); there is nothing to send.`);
    if (!row.draftedAt || !row.cause)
      throw new AppError(
        422,
        "notice_not_drafted",
        `Notice #${id} has no draft yet; an analyst drafts the cause first.`,
      );
    const draft = await noticeById(id);
    const entity = await entityByCode(draft.entity, { transaction });
    const recipients = entity.supervisorEmails;
    if (recipients.length === 0)
      throw new AppError(
        422,
        "no_supervisor_contacts",
        `${entity.code} has no supervisor e-mail address; an admin adds one under Admin › Entities before sending.`,
      );
    const sentAt = new Date();
    const pdf = await renderNoticePdf(
      { ...draft, sentAt: sentAt.toISOString(), sentBy: actor.user.name, recipients },
      { supervisorName: entity.supervisorName },
    );
    const pdfSha256 = createHash("sha256").update(pdf).digest("hex");
    const messageId = `<notice-${id}-${randomBytes(12).toString("hex")}@quartermark>`;
    await sendMail({
      to: recipients,
      messageId,
      subject: `${entity.name}: overshooting notice, ${draft.portfolio} on ${draft.date}`,
      text:
        `Dear ${entity.supervisorName ?? "Supervisor"},\n\n` +
        `${entity.name} (${entity.code}) notifies an overshooting of its value-at-risk model on ${draft.date} ` +
        `(portfolio ${draft.portfolio}), in accordance with Article 366(5) of Regulation (EU) No 575/2013. ` +
        `The notice is attached as a PDF (SHA-256 ${pdfSha256}).\n\n` +
        `${actor.user.name}, chief risk officer\n`,
      attachments: [{ filename: noticePdfFileName(draft), content: pdf, contentType: "application/pdf" }],
    }).catch((err: unknown) => {
      if (!(err instanceof MailNotSentError)) throw err;
      throw new AppError(
        502,
        "mail_not_sent",
        `The mail server did not take the notice (${err.reason}). Nothing is recorded as sent; ` +
          (err.permanent ? "check the supervisor contacts under Admin › Entities, then send again." : "send it again."),
      );
    });
    row.status = "sent";
    row.sentAt = sentAt;
    row.sentBy = actor.user.id;
    row.recipientsJson = JSON.stringify(recipients);
    row.messageId = messageId;
    row.pdfSha256 = pdfSha256;
    row.pdf = pdf;
    return saveNotice(
      row,
      actor,
      "notice.send",
      (notice) => ({
        before: { status: "open" },
        after: { recipients, sha256: pdfSha256, messageId, late: notice.late },
      }),
      transaction,
    );
  });
}
