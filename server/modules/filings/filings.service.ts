import { createHash } from "node:crypto";
import { sequelize } from "../../db/sequelize";
import { AppError, ConflictError, NotFoundError } from "../../errors";
import { AuditEventModel } from "../../models/audit-event";
import { EntityModel } from "../../models/entity";
import { FilingModel } from "../../models/filing";
import { RegulatorAssignmentModel } from "../../models/regulator-assignment";
import { SnapshotModel } from "../../models/snapshot";
import { UserModel } from "../../models/user";
import { sendMail } from "../../mail/mailer";
import { renderSnapshotPack, snapshotPackFileName } from "../../pdf/snapshot-pack";
import { recordAudit } from "../audit/audit.service";
import { getSnapshot, lockForFiling, recordFiled, verifySnapshot } from "../snapshots/snapshots.service";
import { quarterLabel } from "../../../shared/schemas/snapshot";
import { CAUTION } from "../../../shared/schemas/common";
import type { Filing, FilingVerify } from "../../../shared/schemas/filing";
import type { Actor } from "../../http/context";
import type { SessionUser } from "../../../shared/schemas/auth";

type SignedIn = Actor & { user: SessionUser };

const sha256 = (bytes: Buffer) => createHash("sha256").update(bytes).digest("hex");

/** A regulator reads the filings of the entities assigned to them; the reporting office reads all. */
async function visibleEntityIds(actor: SignedIn): Promise<number[] | null> {
  if (actor.user.role !== "regulator") return null;
  return (await RegulatorAssignmentModel.findAll({ where: { userId: actor.user.id } })).map((a) => a.entityId);
}

async function toDtos(rows: FilingModel[]): Promise<Filing[]> {
  const snapshots = new Map((await SnapshotModel.findAll({ where: { id: rows.map((r) => r.snapshotId) } })).map((s) => [s.id, s]));
  const entities = new Map((await EntityModel.findAll({ where: { id: [...new Set([...snapshots.values()].map((s) => s.entityId))] } })).map((e) => [e.id, e]));
  const userIds = [...new Set(rows.flatMap((r) => [r.sentBy, r.acknowledgedBy]).filter((v): v is number => v !== null))];
  const emails = new Map((await UserModel.findAll({ where: { id: userIds }, attributes: ["id", "email"] })).map((u) => [u.id, u.email]));
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
      messageId: r.messageId,
      sentBy: emails.get(r.sentBy) ?? "unknown",
      sentAt: r.sentAt.toISOString(),
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
    if (!snapshot || !allowed.includes(snapshot.entityId)) {
      await recordAudit(actor, "filing.denied", `filing #${id}`, { after: { reason: "not assigned to the entity" } });
      throw new NotFoundError(`No filing #${id}.`);
    }
  }
  if (!row) throw new NotFoundError(`No filing #${id}.`);
  return row;
}

/** The sha256 recorded in the audit log when the pack was sent: a second witness beside the filing row. */
async function sentSha256(snapshotId: number): Promise<string | null> {
  const event = await AuditEventModel.findOne({ where: { action: "snapshot.file", target: `snapshot #${snapshotId}` }, order: [["id", "DESC"]] });
  const after = event?.afterJson ? (JSON.parse(event.afterJson) as { sha256?: string }) : null;
  return after?.sha256 ?? null;
}

/**
 * The CRO files an approved snapshot: its pack is rendered, e-mailed to the entity's supervisor
 * contacts and kept with its sha256, and the snapshot becomes filed — all in one transaction, so
 * a message the mail server refuses leaves nothing recorded.
 */
export async function fileSnapshot(snapshotId: number, actor: SignedIn): Promise<Filing> {
  const filed = await sequelize.transaction(async (transaction) => {
    const { row, entity, asFiled } = await lockForFiling(snapshotId, transaction);
    // Only figures that still match their seal go to a supervisor.
    const seal = await verifySnapshot(snapshotId, actor);
    if (!seal.valid) throw new ConflictError(`Snapshot #${snapshotId} does not verify, so it cannot be filed: ${seal.detail}`);
    const recipients = entity.supervisorEmails;
    if (recipients.length === 0) {
      throw new AppError(422, "no_supervisor_contacts", `${entity.code} has no supervisor e-mail address; an admin adds one under Admin › Entities before filing.`);
    }
    const pack = await renderSnapshotPack(asFiled);
    const fileName = snapshotPackFileName(asFiled);
    const packSha256 = sha256(pack);
    // Recorded first, sent second: a database refusal sends nothing, a mail refusal rolls the record back.
    const filing = await FilingModel.create(
      { snapshotId, packPdf: pack, packSha256, fileName, recipientsJson: JSON.stringify(recipients), messageId: "(sending)", sentBy: actor.user.id, sentAt: new Date(), acknowledgedBy: null, acknowledgedAt: null },
      { transaction },
    );
    const messageId = await sendMail({
      to: recipients,
      subject: `${entity.name}: backtesting pack for ${quarterLabel(row.quarterEnd)}`,
      text: [
        `${entity.supervisorName ? `Dear ${entity.supervisorName},` : "Dear colleagues,"}`,
        "",
        `Please find attached the backtesting and capital multiplier pack of ${entity.name} (${entity.code}) for the quarter ending ${row.quarterEnd}.`,
        `Traffic-light zone ${asFiled.zone}, ${asFiled.counted} counted exceptions, multiplier ${asFiled.multiplier.toFixed(2)}.`,
        "",
        `SHA-256 of the attached file: ${packSha256}`,
        `Snapshot hash: ${asFiled.hash}`,
        "",
        `Sent by ${actor.user.name} (${actor.user.email}) through Quartermark.`,
        "",
        CAUTION,
      ].join("\n"),
      attachments: [{ filename: fileName, content: pack, contentType: "application/pdf" }],
    });
    await filing.update({ messageId }, { transaction });
    await recordFiled(row, `Pack ${packSha256.slice(0, 12)}… sent to ${recipients.join(", ")}`, actor, transaction);
    await recordAudit(actor, "snapshot.file", `snapshot #${snapshotId}`, { before: { status: "approved" }, after: { status: "filed", filing: filing.id, recipients, messageId, sha256: packSha256 } }, transaction);
    return filing;
  });
  return (await toDtos([filed]))[0];
}

export async function listFilings(actor: SignedIn): Promise<Filing[]> {
  const allowed = await visibleEntityIds(actor);
  let rows = await FilingModel.findAll({ order: [["sentAt", "DESC"]] });
  if (allowed) {
    const entityOf = new Map((await SnapshotModel.findAll({ where: { id: rows.map((r) => r.snapshotId) }, attributes: ["id", "entityId"] })).map((s) => [s.id, s.entityId]));
    rows = rows.filter((r) => allowed.includes(entityOf.get(r.snapshotId)!));
  }
  return toDtos(rows);
}

export async function filingPack(id: number, actor: SignedIn): Promise<{ fileName: string; bytes: Buffer; sha256: string }> {
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
    await recordAudit(actor, "filing.acknowledge", `filing #${id}`, { after: { acknowledgedBy: actor.user.email } }, transaction);
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
    return { valid: false, sha256: row.packSha256, snapshotHash: chain.hash, detail: "The filing's sha256 differs from the one recorded in the audit log when the pack was sent." };
  }
  if (recomputed !== row.packSha256) {
    return { valid: false, sha256: row.packSha256, snapshotHash: chain.hash, detail: `The kept pack no longer has the sha256 that was sent (it gives ${recomputed.slice(0, 12)}…).` };
  }
  return {
    valid: chain.valid,
    sha256: row.packSha256,
    snapshotHash: chain.hash,
    detail: chain.valid ? `The pack is the file that was sent, and its snapshot verifies: ${chain.detail}` : `The pack is the file that was sent, but its snapshot does not verify: ${chain.detail}`,
  };
}

/** The pack of any snapshot, for the reporting office to read before filing (drafts say so on the page). */
export async function snapshotPack(id: number, actor: SignedIn): Promise<{ fileName: string; bytes: Buffer }> {
  const snapshot = await getSnapshot(id, actor);
  return { fileName: snapshotPackFileName(snapshot), bytes: await renderSnapshotPack(snapshot) };
}
