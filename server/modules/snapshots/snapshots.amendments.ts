import type { Transaction } from "sequelize";
import { sequelize } from "../../db/sequelize";
import { AppError } from "../../errors";
import { FilingModel } from "../../models/filing";
import { SnapshotModel } from "../../models/snapshot";
import { UserModel } from "../../models/user";
import { recordAudit } from "../audit/audit.service";
import { quarterFigures } from "../backtest/quarter-figures";
import { amendmentChanges } from "../../../shared/backtest/amendment";
import { quarterLabel } from "../../../shared/backtest/quarters";
import type { AmendmentRecord, CreateSnapshotBody, Snapshot, SnapshotFigures } from "../../../shared/schemas/snapshot";
import type { SignedIn } from "../../kit/actor";
import { entityByCode, findLocked } from "../../kit/lookups";
import { snapshotDto } from "./snapshots.read";
import { snapshotEvent as event, withEvent } from "./snapshot-events";
import { createDraft, draftOf, holdEntityData } from "./snapshots.service";

// Amended filings (docs/api.md#amendments): a day inside a filed quarter was restated, so the
// analyst prepares an amendment of that quarter's snapshot. It is a snapshot of its own — same
// four-eyes flow, its own seal in the entity's chain, its own filing — that names the filed
// snapshot it amends and freezes, when prepared, the before and after of every figure that changed.
// The filed snapshot, its filing and its pack are never touched.

const refuse = (status: number, code: string, message: string, details?: unknown) =>
  new AppError(status, code, message, details);

/** The amendment's frozen record: the filed snapshot it amends, and what changed against it (computed now). */
async function amendmentRecord(
  original: SnapshotModel,
  figures: SnapshotFigures,
  transaction: Transaction,
): Promise<AmendmentRecord> {
  const filing = await FilingModel.findOne({ where: { snapshotId: original.id }, order: [["id", "ASC"]], transaction });
  const filer = filing ? await UserModel.findByPk(filing.sentBy, { attributes: ["name"], transaction }) : null;
  const before = JSON.parse(original.figuresJson) as SnapshotFigures;
  return {
    amends: original.id,
    original: {
      snapshotId: original.id,
      hash: original.hash!,
      approvedAt: original.approvedAt ? original.approvedAt.toISOString() : null,
      filingId: filing?.id ?? null,
      filedAt: filing?.sentAt ? filing.sentAt.toISOString() : null,
      filedBy: filer?.name ?? null,
      packSha256: filing?.packSha256 ?? null,
    },
    reason: original.restatementDetail ?? "",
    ...amendmentChanges(before, figures, original.quarterEnd),
  };
}

/**
 * An amendment's figures changed while it is a draft (the analyst's return values): its before and
 * after is computed again against the filed snapshot, in the same transaction.
 */
export async function recomputeAmendment(
  row: SnapshotModel,
  figures: SnapshotFigures,
  transaction: Transaction,
): Promise<string | null> {
  if (row.amendsId === null) return row.amendmentJson;
  const original = (await SnapshotModel.findByPk(row.amendsId, { transaction }))!;
  return JSON.stringify(await amendmentRecord(original, figures, transaction));
}

/**
 * The analyst prepares an amendment of a filed snapshot whose quarter carries a restatement flag
 * (or prepares an open draft or returned amendment again): the figures are recomputed on the
 * current data and their before/after against the filed snapshot is frozen with them.
 */
export async function prepareAmendment(
  body: CreateSnapshotBody & { amends: number },
  actor: SignedIn,
): Promise<{ created: boolean; snapshot: Snapshot }> {
  const entity = await entityByCode(body.entity);
  return sequelize.transaction(async (transaction) => {
    await holdEntityData(entity.id, transaction);
    const original = await SnapshotModel.findByPk(body.amends, { transaction, lock: transaction.LOCK.UPDATE });
    if (!original)
      throw refuse(422, "validation_failed", `There is no snapshot #${body.amends} to amend.`, {
        fields: { amends: "No such snapshot" },
      });
    if (original.entityId !== entity.id || original.quarterEnd !== body.quarterEnd)
      throw refuse(
        422,
        "validation_failed",
        `Snapshot #${original.id} is not ${entity.code}'s ${quarterLabel(body.quarterEnd)}: an amendment amends the snapshot of its own entity and quarter.`,
        { fields: { amends: "Not a snapshot of this entity and quarter" } },
      );
    if (original.status !== "filed")
      throw refuse(
        409,
        "not_filed",
        `Snapshot #${original.id} is ${original.status}, not filed: only a filed snapshot is amended. ${original.status === "approved" ? "File it, or return" : "Prepare"} the quarter's figures through the usual sign-off instead.`,
        { snapshotId: original.id },
      );
    const open = await findLocked(SnapshotModel, { amendsId: original.id }, transaction);
    if (open && open.status !== "draft" && open.status !== "returned")
      throw refuse(
        409,
        open.status === "filed" ? "already_amended" : "amendment_open",
        open.status === "filed"
          ? `Snapshot #${original.id} was already amended by #${open.id}, which is filed. A further correction amends #${open.id}.`
          : `Snapshot #${original.id} already has an amendment in sign-off (#${open.id}, ${open.status}); finish or return that one first.`,
        { snapshotId: open.id },
      );
    if (original.restatedAt === null)
      throw refuse(
        409,
        "not_restated",
        `Nothing inside ${entity.code} ${quarterLabel(original.quarterEnd)} changed since snapshot #${original.id} was signed off, so there is nothing to amend.`,
        { snapshotId: original.id },
      );

    // The analyst's return values carry over: from the open amendment, else from the filed snapshot.
    const draft = draftOf(await quarterFigures(entity, body.quarterEnd), open ?? original, actor);
    const record = await amendmentRecord(original, draft.figures, transaction);
    const values = { ...draft.values, amendmentJson: JSON.stringify(record) };
    const summary = {
      amends: original.id,
      changes: record.changes.length,
      exceptions: record.exceptions.length,
      capitalImpact: record.capitalImpact.change,
    };
    let row: SnapshotModel;
    if (open) {
      await open.update(
        { ...values, historyJson: withEvent(open, event(actor, "recomputed")), version: open.version + 1 },
        { transaction },
      );
      row = open;
    } else {
      row = await createDraft(
        {
          ...values,
          entityId: entity.id,
          quarterEnd: body.quarterEnd,
          amendsId: original.id,
          historyJson: JSON.stringify([event(actor, "prepared", `Amends snapshot #${original.id}.`)]),
        },
        `Someone else prepared an amendment of snapshot #${original.id} a moment ago. Look at it again.`,
        transaction,
      );
    }
    await recordAudit(
      actor,
      "snapshot.prepare_amendment",
      `snapshot #${row.id}`,
      { after: { ...summary, status: "draft", inputsSha256: row.inputsSha256, multiplier: row.multiplier } },
      transaction,
    );
    return { created: !open, snapshot: await snapshotDto(row, entity) };
  });
}
