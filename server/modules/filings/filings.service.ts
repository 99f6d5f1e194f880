import { createHash } from "node:crypto";
import { sequelize } from "../../db/sequelize";
import { AppError, ConflictError, NotFoundError } from "../../errors";
import { AuditEventModel } from "../../models/audit-event";
import { EntityModel } from "../../models/entity";
import { FilingModel } from "../../models/filing";
import { RegulatorAssignmentModel } from "../../models/regulator-assignment";
import { SnapshotModel } from "../../models/snapshot";
import { UserModel } from "../../models/user";
import { MailNotSentError, sendMail, type OutgoingMail } from "../../mail/mailer";
import { toSessionUser } from "../auth/auth.service";
import { renderSnapshotPack, snapshotPackFileName } from "../../pdf/snapshot-pack";
import { recordAudit } from "../audit/audit.service";
import { lockForFiling, recordFiled } from "../snapshots/snapshots.service";
import { verifySnapshot } from "../snapshots/snapshots.chain";
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
    (await SnapshotModel.findAll({ where: { id: rows.map((r) => r.snapshotId) } })).map((s) => [s.id, s]),
  );
  const entities = new Map(
    (await EntityModel.findAll({ where: { id: [...new Set([...snapshots.values()].map((s) => s.entityId))] } })).map(
      (e) => [e.id, e],
    ),
  );
  const emails = await emailsById(rows.flatMap((r) => [r.sentBy, r.acknowledgedBy]));
  return rows.map((r) => {
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
      messageId: r.messageId,
      sentBy: emails.get(r.sentBy) ?? "unknown",
      sentAt: r.sentAt ? r.sentAt.toISOString() : null,
      lastError: r.delivery === "pending" ? r.lastError : null,
      acknowledgedBy: r.acknowledgedBy ? (emails.get(r.acknowledgedBy) ?? "unknown") : null,
      acknowledgedAt: r.acknowledgedAt ? r.acknowledgedAt.toISOString() : null,
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
    if (!snapshot || !allowed.includes(snapshot.entityId) || row.delivery !== "sent") {
      await recordAudit(actor, "filing.denied", `filing #${id}`, { after: { reason: "not assigned to the entity" } });
      throw new NotFoundError(`No filing #${id}.`);
    }
  }
  if (!row) throw new NotFoundError(`No filing #${id}.`);
  return row;
}

/** The sha256 recorded in the audit log when the pack was sent: a second witness beside the filing row. */
async function sentSha256(snapshotId: number): Promise<string | null> {
  const event = await AuditEventModel.findOne({
    where: { action: "snapshot.file", target: `snapshot #${snapshotId}` },
    order: [["id", "DESC"]],
  });
  const after = event?.afterJson ? (JSON.parse(event.afterJson) as { sha256?: string }) : null;
  return after?.sha256 ?? null;
}

/** The message that carries a pack to the supervisor. */
function packMail(entity: EntityModel, snapshot: SnapshotModel, filing: FilingModel, filedBy: string): OutgoingMail {
  return {
    to: JSON.parse(filing.recipientsJson) as string[],
    // One Message-ID per filing, so that a message sent again after a lost answer is recognisably the same.
    messageId: `<filing-${filing.id}-${filing.packSha256.slice(0, 16)}@quartermark>`,
    subject: `${entity.name}: backtesting pack for ${quarterLabel(snapshot.quarterEnd)}`,
    text: [
      `${entity.supervisorName ? `Dear ${entity.supervisorName},` : "Dear colleagues,"}`,
      "",
      `Please find attached the backtesting and capital multiplier pack of ${entity.name} (${entity.code}) for the quarter ending ${snapshot.quarterEnd}.`,
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

export type DeliveryOutcome = "sent" | "pending" | "refused";

/**
 * Hands one pending filing to the mail server. Sent: the filing records the Message-ID and the
 * snapshot becomes filed. The server did not answer: the filing stays pending for the next round.
 * The server refused it (an address it will never accept): the filing is withdrawn and the
 * snapshot stays approved. The filing row is locked meanwhile, so two rounds never send one pack twice.
 */
export async function deliverFiling(
  filingId: number,
  actor: SignedIn,
): Promise<{ outcome: DeliveryOutcome; error?: MailNotSentError }> {
  return sequelize.transaction(async (transaction) => {
    const filing = await FilingModel.scope("withPack").findByPk(filingId, {
      transaction,
      lock: transaction.LOCK.UPDATE,
      skipLocked: true,
    });
    if (!filing || filing.delivery === "sent") return { outcome: "sent" as const };
    const snapshot = (await SnapshotModel.findByPk(filing.snapshotId, { transaction, lock: transaction.LOCK.UPDATE }))!;
    const entity = (await EntityModel.findByPk(snapshot.entityId, { transaction }))!;
    const filedBy = (await UserModel.findByPk(filing.sentBy, { transaction }))?.email ?? "the chief risk officer";
    try {
      const messageId = await sendMail(packMail(entity, snapshot, filing, filedBy));
      await filing.update(
        { delivery: "sent", messageId, sentAt: new Date(), attempts: filing.attempts + 1, lastError: null },
        { transaction },
      );
      await recordFiled(
        snapshot,
        `Pack ${filing.packSha256.slice(0, 12)}… sent to ${(JSON.parse(filing.recipientsJson) as string[]).join(", ")}`,
        actor,
        transaction,
      );
      await recordAudit(
        actor,
        "filing.sent",
        `filing #${filing.id}`,
        { after: { messageId, attempts: filing.attempts } },
        transaction,
      );
      return { outcome: "sent" as const };
    } catch (err) {
      if (!(err instanceof MailNotSentError)) throw err;
      if (err.permanent) {
        await recordAudit(
          actor,
          "filing.refused",
          `filing #${filing.id}`,
          { after: { reason: err.reason } },
          transaction,
        );
        await filing.destroy({ transaction });
        return { outcome: "refused" as const, error: err };
      }
      await filing.update({ attempts: filing.attempts + 1, lastError: err.reason.slice(0, 500) }, { transaction });
      return { outcome: "pending" as const, error: err };
    }
  });
}

/** One round of the delivery loop: every pending filing, oldest first. */
export async function deliverPendingFilings(): Promise<Record<DeliveryOutcome, number>> {
  const counts: Record<DeliveryOutcome, number> = { sent: 0, pending: 0, refused: 0 };
  const pending = await FilingModel.findAll({
    where: { delivery: "pending" },
    attributes: ["id", "sentBy"],
    order: [["id", "ASC"]],
  });
  for (const f of pending) {
    const filer = await UserModel.findByPk(f.sentBy);
    const actor = {
      user: filer ? toSessionUser(filer) : { id: f.sentBy, email: "unknown", name: "unknown", role: "cro" as const },
      ip: "127.0.0.1",
      requestId: "filing-delivery",
    };
    counts[(await deliverFiling(f.id, actor)).outcome]++;
  }
  return counts;
}

/**
 * The CRO files an approved snapshot whose seal still verifies. The pack is rendered and kept
 * with its sha256 (also written to the audit log) in one transaction; then it is e-mailed to the
 * entity's supervisor contacts. If the mail server does not answer, the filing waits as pending
 * and the delivery loop sends it once the server is back; if it refuses the address, the filing
 * is withdrawn and nothing was sent.
 */
export async function fileSnapshot(
  snapshotId: number,
  actor: SignedIn,
): Promise<{ filing: Filing; delivered: boolean }> {
  const filingId = await sequelize.transaction(async (transaction) => {
    const { entity, asFiled } = await lockForFiling(snapshotId, transaction);
    const waiting = await FilingModel.findOne({ where: { snapshotId }, transaction });
    if (waiting)
      throw new ConflictError(
        `Snapshot #${snapshotId} is already filed (filing #${waiting.id}, ${waiting.delivery === "pending" ? "waiting for the mail server" : "sent"}).`,
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
    const pack = await renderSnapshotPack(asFiled);
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
    await recordAudit(
      actor,
      "snapshot.file",
      `snapshot #${snapshotId}`,
      { before: { status: "approved" }, after: { filing: filing.id, recipients, sha256: packSha256 } },
      transaction,
    );
    return filing.id;
  });
  const { outcome, error } = await deliverFiling(filingId, actor);
  if (outcome === "refused") throw error!;
  const row = (await FilingModel.findByPk(filingId))!;
  return { filing: (await toDtos([row]))[0], delivered: outcome === "sent" };
}

export async function listFilings(actor: SignedIn): Promise<Filing[]> {
  const allowed = await visibleEntityIds(actor);
  let rows = await FilingModel.findAll({ order: [["id", "DESC"]] });
  if (allowed) {
    rows = rows.filter((r) => r.delivery === "sent"); // a supervisor has only what reached them
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
    await row.update({ acknowledgedBy: actor.user.id, acknowledgedAt: new Date() }, { transaction });
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

/** The kept pack still has the sha256 that was sent, and the snapshot behind it still verifies. */
export async function verifyFiling(id: number, actor: SignedIn): Promise<FilingVerify> {
  const row = await visibleFiling(id, actor, "withPack");
  const recomputed = sha256(row.packPdf);
  const chain = await verifySnapshot(row.snapshotId, actor);
  const witnessed = await sentSha256(row.snapshotId);
  if (witnessed !== row.packSha256) {
    return {
      valid: false,
      sha256: row.packSha256,
      snapshotHash: chain.hash,
      detail: "The filing's sha256 differs from the one recorded in the audit log when the pack was sent.",
    };
  }
  if (recomputed !== row.packSha256) {
    return {
      valid: false,
      sha256: row.packSha256,
      snapshotHash: chain.hash,
      detail: `The kept pack no longer has the sha256 that was sent (it gives ${recomputed.slice(0, 12)}…).`,
    };
  }
  return {
    valid: chain.valid,
    sha256: row.packSha256,
    snapshotHash: chain.hash,
    detail: chain.valid
      ? `The pack is the file that was sent, and its snapshot verifies: ${chain.detail}`
      : `The pack is the file that was sent, but its snapshot does not verify: ${chain.detail}`,
  };
}
