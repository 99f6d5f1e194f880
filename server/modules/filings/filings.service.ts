import { createHash, randomBytes } from "node:crypto";
import { Op } from "sequelize";
import { sequelize } from "../../db/sequelize";
import { AppError, ConflictError, NotFoundError } from "../../errors";
import { logger } from "../../logger";
import { EntityModel } from "../../models/entity";
import { FilingModel } from "../../models/filing";
import { FilingDeliveryModel } from "../../models/filing-delivery";
import { RegulatorAssignmentModel } from "../../models/regulator-assignment";
import { SnapshotModel } from "../../models/snapshot";
import { UserModel } from "../../models/user";
import { handOver, MailNotSentError, type OutgoingMail } from "../../mail/mailer";
import { lastJournalEntry, noteInJournal } from "../../mail/journal";
import { toSessionUser } from "../auth/auth.service";
import { renderSnapshotPack, snapshotPackFileName } from "../../pdf/snapshot-pack";
import { recordAudit } from "../audit/audit.service";
import { lockForFiling, recordAcknowledged, recordFiled } from "../snapshots/snapshots.service";
import { verifySnapshot } from "../snapshots/snapshots.chain";
import { signatoriesOf } from "../snapshots/snapshots.read";
import { signedFilingRecord } from "../snapshot-chain/snapshot-chain";
import { quarterLabel } from "../../../shared/backtest/quarters";
import { CAUTION } from "../../../shared/schemas/common";
import type { Filing, FilingVerify } from "../../../shared/schemas/filing";
import type { SignedIn } from "../../kit/actor";
import { emailsById } from "../../kit/lookups";

const sha256 = (bytes: Buffer) => createHash("sha256").update(bytes).digest("hex");

/** A regulator reads the filings of the entities assigned to them; the reporting office reads all. */
async function visibleEntityIds(actor: SignedIn): Promise<number[] | null> {
  if (actor.user.role !== "regulator") return null;
  return (await RegulatorAssignmentModel.findAll({ where: { userId: actor.user.id } })).map((a) => a.entityId);
}

async function toDtos(rows: FilingModel[]): Promise<Filing[]> {
  const snapshots = new Map(
    (
      await SnapshotModel.findAll({
        where: { id: rows.map((r) => r.snapshotId) },
        // The columns a filing shows, not the frozen figures and history (tens of kilobytes a row).
        attributes: ["id", "entityId", "quarterEnd", "zone", "counted", "multiplier", "hash", "amendsId"],
      })
    ).map((s) => [s.id, s]),
  );
  const entities = new Map(
    (await EntityModel.findAll({ where: { id: [...new Set([...snapshots.values()].map((s) => s.entityId))] } })).map(
      (e) => [e.id, e],
    ),
  );
  const amendedBy = new Map(
    (
      await SnapshotModel.findAll({
        where: { amendsId: rows.map((r) => r.snapshotId) },
        attributes: ["id", "amendsId"],
      })
    ).map((s) => [s.amendsId!, s.id]),
  );
  const emails = await emailsById(rows.flatMap((r) => [r.sentBy, r.acknowledgedBy]));
  const deliveries = new Map<number, FilingDeliveryModel[]>();
  for (const d of await FilingDeliveryModel.findAll({
    where: { filingId: rows.map((r) => r.id) },
    order: [["id", "ASC"]],
  }))
    deliveries.set(d.filingId, [...(deliveries.get(d.filingId) ?? []), d]);
  return rows.map((r) => {
    const own = deliveries.get(r.id) ?? [];
    const s = snapshots.get(r.snapshotId)!;
    const e = entities.get(s.entityId)!;
    return {
      id: r.id,
      snapshotId: s.id,
      entity: e.code,
      entityName: e.name,
      quarterEnd: s.quarterEnd,
      zone: s.zone,
      counted: s.counted,
      multiplier: s.multiplier,
      fileName: r.fileName,
      sha256: r.packSha256,
      recipients: JSON.parse(r.recipientsJson) as string[],
      delivery: r.delivery,
      deliveries: own.map((d) => ({
        recipient: d.recipient,
        status: d.status,
        detail: d.detail,
        attempts: d.attempts,
        acceptedAt: d.acceptedAt ? d.acceptedAt.toISOString() : null,
      })),
      summary: own.length ? deliverySummary(own) : "No recipients recorded.",
      messageId: r.messageId,
      sentBy: emails.get(r.sentBy) ?? "unknown",
      sentAt: r.sentAt ? r.sentAt.toISOString() : null,
      lastError: own.some((d) => d.status === "pending") ? r.lastError : null,
      acknowledgedBy: r.acknowledgedBy ? (emails.get(r.acknowledgedBy) ?? "unknown") : null,
      acknowledgedAt: r.acknowledgedAt ? r.acknowledgedAt.toISOString() : null,
      snapshotHash: s.hash,
      amends: s.amendsId,
      amendedBy: amendedBy.get(s.id) ?? null,
    };
  });
}

/**
 * A filing the actor may see, or 404: a regulator does not learn that other entities' filings
 * exist, and the attempt is in the audit log.
 */
async function visibleFiling(id: number, actor: SignedIn, scope?: "withPack"): Promise<FilingModel> {
  const row = scope ? await FilingModel.scope(scope).findByPk(id) : await FilingModel.findByPk(id);
  const allowed = await visibleEntityIds(actor);
  if (row && allowed) {
    const snapshot = await SnapshotModel.findByPk(row.snapshotId, { attributes: ["entityId"] });
    // A supervisor has only what reached them (sent, or sent to some of their addresses).
    if (!snapshot || !allowed.includes(snapshot.entityId) || row.delivery === "pending") {
      await recordAudit(actor, "filing.denied", `filing #${id}`, { after: { reason: "not assigned to the entity" } });
      throw new NotFoundError(`No filing #${id}.`);
    }
  }
  if (!row) throw new NotFoundError(`No filing #${id}.`);
  return row;
}

/** The message that carries a pack to the supervisor: one per filing, one Message-ID, sent to each recipient on its own. */
function packMail(entity: EntityModel, snapshot: SnapshotModel, filing: FilingModel, filedBy: string): OutgoingMail {
  return {
    to: JSON.parse(filing.recipientsJson) as string[],
    messageId: filing.messageId!,
    subject: `${entity.name}: ${snapshot.amendsId ? "amended " : ""}backtesting pack for ${quarterLabel(snapshot.quarterEnd)}`,
    text: [
      `${entity.supervisorName ? `Dear ${entity.supervisorName},` : "Dear colleagues,"}`,
      "",
      `Please find attached the ${snapshot.amendsId ? "amendment of the " : ""}backtesting and capital multiplier pack of ${entity.name} (${entity.code}) for the quarter ending ${snapshot.quarterEnd}.`,
      ...(snapshot.amendsId
        ? [
            `It amends the filed snapshot #${snapshot.amendsId} after a restatement of data inside the quarter; the pack lists every figure that changed.`,
          ]
        : []),
      `Traffic-light zone ${snapshot.zone}, ${snapshot.counted} counted exceptions, multiplier ${snapshot.multiplier.toFixed(2)}.`,
      "",
      `SHA-256 of the attached file: ${filing.packSha256}`,
      `Snapshot hash: ${snapshot.hash}`,
      "",
      `Filed by ${filedBy} through Quartermark.`,
      "",
      CAUTION,
    ].join("\n"),
    attachments: [{ filename: filing.fileName, content: filing.packPdf, contentType: "application/pdf" }],
  };
}

/** The mail server's answer for one hand-over, as the delivery row and the journal keep it. */
type Outcome =
  | { kind: "accepted"; detail: string }
  | { kind: "refused"; detail: string }
  | { kind: "failed"; detail: string } // not taken, nothing arrived: it waits and goes again
  | { kind: "unclear"; detail: string }; // the connection broke mid-message: it may have arrived

/** The database stopped after the mail server took the pack: the person is told it went out. */
export class DeliveryNotRecordedError extends AppError {
  constructor(recipient: string) {
    super(
      503,
      "delivery_not_recorded",
      `The mail server took the pack for ${recipient}, but the database stopped before Quartermark recorded it. It will be recorded from the mail journal once the database is back, without sending it again.`,
    );
  }
}

/**
 * Records one recipient's outcome (in its own transaction; locks go filing → snapshot → delivery →
 * chain head). The first acceptance files the snapshot and signs it into the chain with the pack's
 * sha256 and Message-ID. Does nothing when the attempt was settled meanwhile (reconciliation).
 */
async function settleDelivery(
  deliveryId: number,
  attempt: number,
  outcome: Outcome,
  actor: SignedIn,
  source: "server" | "journal",
): Promise<void> {
  await sequelize.transaction(async (transaction) => {
    const peek = await FilingDeliveryModel.findByPk(deliveryId, { attributes: ["filingId"], transaction });
    if (!peek) return;
    const filing = (await FilingModel.findByPk(peek.filingId, { transaction, lock: transaction.LOCK.UPDATE }))!;
    const snapshot = (await SnapshotModel.findByPk(filing.snapshotId, { transaction, lock: transaction.LOCK.UPDATE }))!;
    const delivery = (await FilingDeliveryModel.findByPk(deliveryId, { transaction, lock: transaction.LOCK.UPDATE }))!;
    if (delivery.status !== "sending" || delivery.attempts !== attempt) return;
    const status = { accepted: "accepted", refused: "refused", failed: "pending", unclear: "unknown" } as const;
    await delivery.update(
      {
        status: status[outcome.kind],
        detail: outcome.detail.slice(0, 500),
        acceptedAt: outcome.kind === "accepted" ? new Date() : null,
      },
      { transaction },
    );
    const all = await FilingDeliveryModel.findAll({ where: { filingId: filing.id }, transaction });
    const accepted = all.filter((d) => d.status === "accepted");
    const waiting = all.filter((d) => d.status === "pending");
    await filing.update(
      {
        delivery: accepted.length === all.length ? "sent" : accepted.length ? "partial" : "pending",
        sentAt: filing.sentAt ?? (accepted.length ? new Date() : null),
        attempts: Math.max(...all.map((d) => d.attempts)),
        lastError: waiting.length ? (waiting.find((d) => d.detail)?.detail?.slice(0, 500) ?? null) : null,
      },
      { transaction },
    );
    if (outcome.kind === "accepted" && snapshot.status === "approved") {
      await recordFiled(
        snapshot,
        `Pack ${filing.packSha256.slice(0, 12)}… sent to ${delivery.recipient}`,
        actor,
        transaction,
        {
          filingId: filing.id,
          packSha256: filing.packSha256,
          messageId: filing.messageId,
        },
      );
    }
    await recordAudit(
      actor,
      `filing.${outcome.kind}`,
      `filing #${filing.id}`,
      { after: { recipient: delivery.recipient, attempt, detail: outcome.detail, from: source } },
      transaction,
    );
  });
}

/**
 * Sends the filing's message to one waiting recipient, exactly once: the row is claimed
 * ("sending", attempt n) and the journal notes the hand-over before the SMTP server sees anything;
 * the server's answer goes to the journal, then to the database. If the database fails after the
 * server took the message, the row stays "sending" and reconciliation settles it from the journal.
 */
async function deliverTo(filingId: number, deliveryId: number, actor: SignedIn): Promise<void> {
  const [claimed] = await FilingDeliveryModel.update(
    { status: "sending", attempts: sequelize.literal("attempts + 1"), claimedAt: new Date() },
    { where: { id: deliveryId, status: "pending" } },
  );
  if (claimed === 0) return; // another round has it
  const delivery = (await FilingDeliveryModel.findByPk(deliveryId))!;
  const filing = (await FilingModel.scope("withPack").findByPk(filingId))!;
  const snapshot = (await SnapshotModel.findByPk(filing.snapshotId))!;
  const entity = (await EntityModel.findByPk(snapshot.entityId))!;
  const filedBy = (await UserModel.findByPk(filing.sentBy))?.email ?? "the chief risk officer";
  const note = { messageId: filing.messageId!, recipient: delivery.recipient, attempt: delivery.attempts };
  try {
    await noteInJournal({ ...note, event: "handing" });
  } catch (err) {
    await settleDelivery(
      deliveryId,
      note.attempt,
      { kind: "failed", detail: `mail journal: ${(err as Error).message}` },
      actor,
      "server",
    );
    return;
  }
  let outcome: Outcome;
  try {
    const { response } = await handOver({
      ...packMail(entity, snapshot, filing, filedBy),
      envelope: { to: [delivery.recipient] },
    });
    outcome = { kind: "accepted", detail: response || "accepted" };
  } catch (err) {
    if (!(err instanceof MailNotSentError)) throw err;
    outcome = err.maybeDelivered
      ? { kind: "unclear", detail: `the connection broke while the message was handed over (${err.reason})` }
      : { kind: err.permanent ? "refused" : "failed", detail: err.reason };
  }
  await noteInJournal({ ...note, event: outcome.kind, detail: outcome.detail }).catch((err: Error) =>
    logger.error(`mail journal: ${err.message}`),
  );
  try {
    await settleDelivery(deliveryId, note.attempt, outcome, actor, "server");
  } catch (err) {
    logger.error(
      `filing #${filingId}: the answer for ${delivery.recipient} was not recorded: ${(err as Error).message}`,
    );
    if (outcome.kind === "accepted") throw new DeliveryNotRecordedError(delivery.recipient);
    throw err;
  }
}

/**
 * Settles deliveries left "sending" for longer than `olderThanMs` (the process or the database
 * stopped mid-delivery) from the mail journal, never by sending again: the server's recorded answer
 * if there is one; "unknown" if the message was being handed over when everything stopped; back to
 * pending if it never reached the server.
 */
export async function reconcileDeliveries(olderThanMs: number): Promise<number> {
  const stuck = await FilingDeliveryModel.findAll({
    where: { status: "sending", claimedAt: { [Op.lte]: new Date(Date.now() - olderThanMs) } },
    order: [["id", "ASC"]],
  });
  for (const d of stuck) {
    const filing = await FilingModel.findByPk(d.filingId);
    if (!filing) continue;
    const filer = await UserModel.findByPk(filing.sentBy);
    const actor = systemActor(filer, filing.sentBy, "filing-reconcile");
    const last = await lastJournalEntry(filing.messageId!, d.recipient, d.attempts);
    const outcome: Outcome = !last
      ? { kind: "failed", detail: "never handed to the mail server (the process stopped first)" }
      : last.event === "handing"
        ? {
            kind: "unclear",
            detail: "the process stopped while the message was handed over; whether it arrived is not known",
          }
        : { kind: last.event, detail: `${last.detail ?? last.event} (recorded from the mail journal)` };
    await settleDelivery(d.id, d.attempts, outcome, actor, "journal");
  }
  return stuck.length;
}

function systemActor(filer: UserModel | null, id: number, requestId: string): SignedIn {
  return {
    user: filer ? toSessionUser(filer) : { id, email: "unknown", name: "unknown", role: "cro" as const },
    ip: "127.0.0.1",
    requestId,
  };
}

/** "Sent to a@x; refused by b@y: 550 …": what happened to each recipient, in words. */
export function deliverySummary(deliveries: Pick<FilingDeliveryModel, "recipient" | "status" | "detail">[]): string {
  const of = (status: FilingDeliveryModel["status"]) => deliveries.filter((d) => d.status === status);
  const parts: string[] = [];
  if (of("accepted").length)
    parts.push(
      `Sent to ${of("accepted")
        .map((d) => d.recipient)
        .join(", ")}`,
    );
  for (const d of of("refused")) parts.push(`refused by ${d.recipient}: ${d.detail ?? "no reason given"}`);
  for (const d of of("sending")) parts.push(`being sent to ${d.recipient}`);
  for (const d of of("unknown"))
    parts.push(`not known whether ${d.recipient} received it (${d.detail ?? "the delivery was cut off"})`);
  const waiting = of("pending");
  if (waiting.length)
    parts.push(
      `waiting for the mail server for ${waiting.map((d) => d.recipient).join(", ")}${waiting[0].detail ? ` (${waiting[0].detail})` : ""}`,
    );
  const text = parts.join("; ");
  return `${text.charAt(0).toUpperCase()}${text.slice(1)}.`;
}

/**
 * Sends the filing to every recipient still waiting, then settles the filing: one that reached
 * nobody and never can (every recipient refused it) is withdrawn — the snapshot stays approved;
 * a filing that reached anyone is never deleted.
 */
export async function deliverFiling(filingId: number, actor: SignedIn): Promise<{ withdrawn: string | null }> {
  const waiting = await FilingDeliveryModel.findAll({
    where: { filingId, status: "pending" },
    attributes: ["id"],
    order: [["id", "ASC"]],
  });
  for (const d of waiting) await deliverTo(filingId, d.id, actor);
  return sequelize.transaction(async (transaction) => {
    const filing = await FilingModel.findByPk(filingId, { transaction, lock: transaction.LOCK.UPDATE });
    if (!filing) return { withdrawn: null };
    const all = await FilingDeliveryModel.findAll({ where: { filingId }, order: [["id", "ASC"]], transaction });
    if (all.length === 0 || all.some((d) => d.status !== "refused")) return { withdrawn: null };
    const summary = deliverySummary(all);
    await recordAudit(
      actor,
      "filing.withdrawn",
      `filing #${filing.id}`,
      { before: { snapshot: filing.snapshotId, sha256: filing.packSha256 }, after: { reason: summary } },
      transaction,
    );
    await FilingDeliveryModel.destroy({ where: { filingId }, transaction });
    await filing.destroy({ transaction });
    return { withdrawn: summary };
  });
}

/** One round of the delivery loop: settle what a stop left half-done, then send every waiting recipient, oldest filing first. */
export async function deliverPendingFilings(
  options: { reconcileAfterMs?: number } = {},
): Promise<{ reconciled: number; sent: number; pending: number; refused: number }> {
  const reconciled = await reconcileDeliveries(options.reconcileAfterMs ?? RECONCILE_AFTER_MS);
  const counts = { reconciled, sent: 0, pending: 0, refused: 0 };
  const filingIds = [
    ...new Set(
      (
        await FilingDeliveryModel.findAll({
          where: { status: "pending" },
          attributes: ["filingId"],
          order: [["id", "ASC"]],
        })
      ).map((d) => d.filingId),
    ),
  ];
  for (const id of filingIds) {
    const f = await FilingModel.findByPk(id, { attributes: ["id", "sentBy"] });
    if (!f) continue;
    const { withdrawn } = await deliverFiling(
      id,
      systemActor(await UserModel.findByPk(f.sentBy), f.sentBy, "filing-delivery"),
    );
    if (withdrawn) counts.refused++;
    else if ((await FilingModel.findByPk(id))?.delivery === "pending") counts.pending++;
    else counts.sent++;
  }
  return counts;
}

/**
 * Longer than a delivery can take (the mailer's timeouts add up to 30 s): a row "sending" for
 * longer was left by a process or database that stopped.
 */
const RECONCILE_AFTER_MS = 120_000;

/**
 * The CRO files an approved snapshot whose seal still verifies. One transaction writes the filing:
 * the pack and its sha256, the message's Message-ID and one delivery row per supervisor contact
 * (the outbox). Then the message goes to each contact on its own. The answer says what happened:
 * sent to everyone (201), to some (201, "partial": the CRO can send to the rest), to nobody yet
 * (202: the delivery loop goes on), or refused by everyone (502: the filing is withdrawn).
 */
export async function fileSnapshot(
  snapshotId: number,
  actor: SignedIn,
): Promise<{ filing: Filing; delivered: boolean }> {
  const filingId = await sequelize.transaction(async (transaction) => {
    const { row: snapshotRow, entity, asFiled } = await lockForFiling(snapshotId, transaction);
    const waiting = await FilingModel.findOne({ where: { snapshotId }, transaction });
    if (waiting)
      throw new ConflictError(
        `Snapshot #${snapshotId} is already filed (filing #${waiting.id}, ${waiting.delivery === "pending" ? "waiting for the mail server" : waiting.delivery === "partial" ? "partly delivered" : "sent"}).`,
        { filingId: waiting.id },
      );
    // Only figures that still match their seal go to a supervisor.
    const seal = await verifySnapshot(snapshotId, actor);
    if (!seal.valid)
      throw new ConflictError(`Snapshot #${snapshotId} does not verify, so it cannot be filed: ${seal.detail}`);
    const recipients = entity.supervisorEmails;
    if (recipients.length === 0) {
      throw new AppError(
        422,
        "no_supervisor_contacts",
        `${entity.code} has no supervisor e-mail address; an admin adds one under Admin › Entities before filing.`,
      );
    }
    const pack = await renderSnapshotPack(asFiled, { signatories: await signatoriesOf(snapshotRow) });
    const packSha256 = sha256(pack);
    const filing = await FilingModel.create(
      {
        snapshotId,
        packPdf: pack,
        packSha256,
        fileName: snapshotPackFileName(asFiled),
        recipientsJson: JSON.stringify(recipients),
        messageId: null,
        sentBy: actor.user.id,
        sentAt: null,
        delivery: "pending",
        attempts: 0,
        lastError: null,
        acknowledgedBy: null,
        acknowledgedAt: null,
      },
      { transaction },
    );
    // Fixed before anything is sent: every hand-over of this filing carries the same Message-ID.
    await filing.update(
      { messageId: `<filing-${filing.id}-${randomBytes(12).toString("hex")}@quartermark>` },
      { transaction },
    );
    await FilingDeliveryModel.bulkCreate(
      recipients.map((recipient) => ({
        filingId: filing.id,
        recipient,
        claimedAt: null,
        detail: null,
        acceptedAt: null,
      })),
      { transaction },
    );
    await recordAudit(
      actor,
      "snapshot.file",
      `snapshot #${snapshotId}`,
      {
        before: { status: "approved" },
        after: { filing: filing.id, recipients, sha256: packSha256, messageId: filing.messageId },
      },
      transaction,
    );
    return filing.id;
  });
  const { withdrawn } = await deliverFiling(filingId, actor);
  if (withdrawn)
    throw new AppError(
      502,
      "mail_not_sent",
      `Nothing was sent: ${withdrawn.charAt(0).toLowerCase()}${withdrawn.slice(1)} The filing was withdrawn and the quarter stays approved; check the supervisor contacts under Admin › Entities and file again.`,
    );
  const row = (await FilingModel.findByPk(filingId))!;
  return { filing: (await toDtos([row]))[0], delivered: row.delivery !== "pending" };
}

/**
 * The CRO finishes a filing that did not reach everyone: the recipients not yet accepted (refused,
 * or unknown after a cut-off delivery) are sent the same message again; those who accepted it never are.
 */
export async function finishFiling(id: number, actor: SignedIn): Promise<Filing> {
  await sequelize.transaction(async (transaction) => {
    const filing = await FilingModel.findByPk(id, { transaction, lock: transaction.LOCK.UPDATE });
    if (!filing) throw new NotFoundError(`No filing #${id}.`);
    const open = await FilingDeliveryModel.findAll({
      where: { filingId: id, status: ["refused", "unknown", "pending"] },
      transaction,
      lock: transaction.LOCK.UPDATE,
    });
    if (open.length === 0)
      throw new ConflictError(
        `Filing #${id} has no recipient left to send to: ${deliverySummary(await FilingDeliveryModel.findAll({ where: { filingId: id }, order: [["id", "ASC"]], transaction }))}`,
      );
    await FilingDeliveryModel.update(
      { status: "pending" },
      { where: { id: open.map((d) => d.id), status: ["refused", "unknown"] }, transaction },
    );
    await recordAudit(
      actor,
      "filing.retry",
      `filing #${id}`,
      { after: { recipients: open.map((d) => d.recipient) } },
      transaction,
    );
  });
  await deliverFiling(id, actor);
  const row = await FilingModel.findByPk(id);
  if (!row) throw new NotFoundError(`No filing #${id}.`);
  return (await toDtos([row]))[0];
}

export async function listFilings(actor: SignedIn): Promise<Filing[]> {
  const allowed = await visibleEntityIds(actor);
  let rows = await FilingModel.findAll({ order: [["id", "DESC"]] });
  if (allowed) {
    rows = rows.filter((r) => r.delivery !== "pending"); // a supervisor has only what reached them
    const entityOf = new Map(
      (
        await SnapshotModel.findAll({ where: { id: rows.map((r) => r.snapshotId) }, attributes: ["id", "entityId"] })
      ).map((s) => [s.id, s.entityId]),
    );
    rows = rows.filter((r) => allowed.includes(entityOf.get(r.snapshotId)!));
  }
  return toDtos(rows);
}

export async function filingPack(
  id: number,
  actor: SignedIn,
): Promise<{ fileName: string; bytes: Buffer; sha256: string }> {
  const row = await visibleFiling(id, actor, "withPack");
  return { fileName: row.fileName, bytes: row.packPdf, sha256: row.packSha256 };
}

/** The supervisor's staff confirm they received the pack (once; a second time changes nothing). */
export async function acknowledgeFiling(id: number, actor: SignedIn): Promise<Filing> {
  await visibleFiling(id, actor);
  await sequelize.transaction(async (transaction) => {
    const row = await FilingModel.findByPk(id, { transaction, lock: transaction.LOCK.UPDATE });
    if (!row) throw new NotFoundError(`No filing #${id}.`);
    if (row.acknowledgedAt) return;
    // The hash the supervisor acknowledged, on the filing and signed into the entity's chain.
    await row.update(
      { acknowledgedBy: actor.user.id, acknowledgedAt: new Date(), acknowledgedSha256: row.packSha256 },
      { transaction },
    );
    await recordAcknowledged(
      row.snapshotId,
      { filingId: row.id, packSha256: row.packSha256, by: actor.user.email },
      transaction,
    );
    await recordAudit(
      actor,
      "filing.acknowledge",
      `filing #${id}`,
      { after: { acknowledgedBy: actor.user.email } },
      transaction,
    );
  });
  return (await toDtos([(await FilingModel.findByPk(id))!]))[0];
}

/**
 * The kept pack is the file that was sent: its sha256 recomputed equals the filing's, the one the
 * signed chain recorded when the pack first reached the supervisor, and the one the supervisor
 * acknowledged (on the filing and in the chain) — witnesses the database alone cannot rewrite —
 * and the snapshot behind it still verifies.
 */
export async function verifyFiling(id: number, actor: SignedIn): Promise<FilingVerify> {
  const row = await visibleFiling(id, actor, "withPack");
  const recomputed = sha256(row.packPdf);
  const snapshot = (await SnapshotModel.findByPk(row.snapshotId, { attributes: ["entityId"] }))!;
  const chain = await verifySnapshot(row.snapshotId, actor);
  const signed = await signedFilingRecord(snapshot.entityId, row.id);
  const answer = (valid: boolean, detail: string) => ({
    valid,
    sha256: row.packSha256,
    snapshotHash: chain.hash,
    detail,
  });
  if (!chain.valid)
    return answer(false, `The pack's snapshot does not verify, so the filing cannot be trusted: ${chain.detail}`);
  if (signed.filedSha256 === null)
    return answer(
      false,
      "The signed record holds no filing of this pack: the filing was not made through Quartermark, or its record was removed.",
    );
  if (signed.filedSha256 !== row.packSha256)
    return answer(
      false,
      `The filing's sha256 (${row.packSha256.slice(0, 12)}…) differs from the one the signed record fixed when the pack was sent (${signed.filedSha256.slice(0, 12)}…).`,
    );
  if (row.acknowledgedAt && (signed.acknowledgedSha256 !== row.packSha256 || row.acknowledgedSha256 !== row.packSha256))
    return answer(
      false,
      `The filing's sha256 differs from the one the supervisor acknowledged (${(signed.acknowledgedSha256 ?? row.acknowledgedSha256 ?? "none").slice(0, 12)}…).`,
    );
  if (recomputed !== row.packSha256)
    return answer(
      false,
      `The kept pack no longer has the sha256 that was sent (it gives ${recomputed.slice(0, 12)}…).`,
    );
  const witnesses = row.acknowledgedAt
    ? "the signed record and the supervisor's acknowledgement say"
    : "the signed record says";
  return answer(
    true,
    `The pack is the file that was sent (as ${witnesses}), and its snapshot verifies: ${chain.detail}`,
  );
}
