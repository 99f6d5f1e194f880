import { UniqueConstraintError, type CreationAttributes, type Transaction } from "sequelize";
import { notifySnapshotEvent } from "../notifications/notices";
import { sequelize } from "../../db/sequelize";
import { lockPortfolios } from "../../db/portfolio-locks";
import { AppError, ConflictError, ForbiddenError, NotFoundError } from "../../errors";
import { EntityModel } from "../../models/entity";
import { PortfolioModel } from "../../models/portfolio";
import { SnapshotModel } from "../../models/snapshot";
import { recordAudit } from "../audit/audit.service";
import { quarterFigures, type QuarterFigures } from "../backtest/quarter-figures";
import { quarterLabel } from "../../../shared/backtest/quarters";
import {
  type CreateSnapshotBody,
  type ReturnSnapshotBody,
  type Snapshot,
  type SnapshotActionBody,
  type SnapshotFigures,
} from "../../../shared/schemas/snapshot";
import { openFindingsInQuarter, snapshotDto } from "./snapshots.read";
import { snapshotEvent as event, withEvent } from "./snapshot-events";
import { appendLink } from "../snapshot-chain/snapshot-chain";
import type { SignedIn } from "../../kit/actor";
import { checkVersion } from "../../kit/stale";
import { entityByCode, findLocked } from "../../kit/lookups";
import { refreshDeterminations } from "../determinations/determinations.store";
import { DeterminationModel } from "../../models/determination";

// The sign-off: an analyst prepares and submits a past quarter, a CRO approves (sealing it into the
// entity's hash chain) or returns it; filing then locks and marks it.

const today = () => new Date().toISOString().slice(0, 10);

/**
 * A new draft: its columns, not yet approved, sealed in the chain or restated. `taken` is the 409
 * message when someone else created the same snapshot a moment ago (a unique key lets one in).
 */
export async function createDraft(
  columns: Omit<CreationAttributes<SnapshotModel>, keyof typeof NOT_SIGNED_OFF>,
  taken: string,
  transaction: Transaction,
): Promise<SnapshotModel> {
  try {
    return await SnapshotModel.create({ ...columns, ...NOT_SIGNED_OFF }, { transaction });
  } catch (err) {
    if (err instanceof UniqueConstraintError) throw new ConflictError(taken);
    throw err;
  }
}

const NOT_SIGNED_OFF = {
  approvedBy: null,
  approvedAt: null,
  prevHash: null,
  hash: null,
  restatedAt: null,
  restatementDetail: null,
} as const;

/**
 * The columns of a freshly prepared draft: the engine's figures, with the analyst's return values
 * carried over from `keptFrom` (the quarter prepared before, or the snapshot an amendment amends).
 */
export function draftOf(
  computed: QuarterFigures,
  keptFrom: Pick<SnapshotModel, "figuresJson"> | null | undefined,
  actor: SignedIn,
) {
  const kept = keptFrom ? (JSON.parse(keptFrom.figuresJson) as SnapshotFigures).analystInputs : undefined;
  const figures: SnapshotFigures = kept ? { ...computed.figures, analystInputs: kept } : computed.figures;
  const values = {
    status: "draft" as const,
    zone: figures.zone,
    counted: figures.exceptions.counted,
    plusFactor: figures.plusFactor,
    multiplier: figures.multiplier,
    capital: figures.capital,
    addOn: figures.addOn,
    windowStart: figures.window.start,
    asOf: figures.asOf,
    figuresJson: JSON.stringify(figures),
    inputsSha256: computed.inputsSha256,
    engineVersion: computed.engineVersion,
    preparedBy: actor.user.id,
    preparedAt: new Date(),
    submittedBy: null,
    submittedAt: null,
  };
  return { figures, values };
}

/** Locks the entity's portfolios for share: an upload committing to them finishes first, and none starts until we are done. */
export async function holdEntityData(entityId: number, transaction: Transaction): Promise<void> {
  const ids = (await PortfolioModel.findAll({ where: { entityId }, attributes: ["id"], transaction })).map((p) => p.id);
  await lockPortfolios(ids, "share", transaction);
}

/**
 * Locks a snapshot for a change. With `holdData`, the entity's portfolios are held first: locks
 * are always taken portfolios → entity → snapshot, the order an upload commit uses too.
 */
async function lockSnapshot(
  id: number,
  transaction: Transaction,
  expectedVersion: number | undefined,
  options: { holdData: boolean },
): Promise<{ row: SnapshotModel; entity: EntityModel }> {
  const peek = await SnapshotModel.findByPk(id, { attributes: ["id", "entityId"], transaction });
  if (!peek) throw new NotFoundError(`No snapshot #${id}.`);
  if (options.holdData) await holdEntityData(peek.entityId, transaction);
  const row = await SnapshotModel.findByPk(id, { transaction, lock: transaction.LOCK.UPDATE });
  if (!row) throw new NotFoundError(`No snapshot #${id}.`);
  await checkVersion(row.version, expectedVersion, async () => ({
    message: `Snapshot #${id} changed since you opened it (now version ${row.version}). Look at it again before acting.`,
    current: await snapshotDto(row),
  }));
  // A locking read: the entity as it is now, not as this transaction's first read saw it.
  const entity = (await EntityModel.findByPk(row.entityId, { transaction, lock: transaction.LOCK.SHARE }))!;
  return { row, entity };
}

async function refuseOpenFindings(row: SnapshotModel, entity: EntityModel, transaction: Transaction): Promise<void> {
  const open = await openFindingsInQuarter(row.entityId, row.quarterEnd, transaction);
  if (open > 0) {
    throw new AppError(
      409,
      "open_findings",
      `${open} open data-quality finding${open === 1 ? "" : "s"} inside ${quarterLabel(row.quarterEnd)} block${open === 1 ? "s" : ""} sign-off for ${entity.code}. Resolve or explain ${open === 1 ? "it" : "them"} on the Data screen first.`,
      { openFindings: open },
    );
  }
}

/** The figures must still follow from today's data; otherwise the snapshot no longer says what it shows. */
async function refuseChangedInputs(row: SnapshotModel, entity: EntityModel, what: string): Promise<void> {
  const now = await quarterFigures(entity, row.quarterEnd);
  if (now.inputsSha256 !== row.inputsSha256) {
    throw new AppError(
      409,
      "inputs_changed",
      `The daily data or approved exclusions behind ${entity.code} ${quarterLabel(row.quarterEnd)} changed since it was prepared, so it cannot be ${what}. ${what === "approved" ? "Return it" : "Prepare it again"} so the figures are recomputed.`,
    );
  }
}

/**
 * An analyst prepares (or, for a draft or returned snapshot, prepares again) an entity's figures
 * at a quarter end that has passed. A submitted or signed-off quarter cannot be prepared again.
 */
export async function prepareSnapshot(
  body: CreateSnapshotBody,
  actor: SignedIn,
): Promise<{ created: boolean; snapshot: Snapshot }> {
  if (body.quarterEnd >= today()) {
    throw new AppError(
      422,
      "quarter_not_ended",
      `${quarterLabel(body.quarterEnd)} has not ended yet: its snapshot can be prepared from ${body.quarterEnd} on, once the last day's data is in.`,
    );
  }
  const entity = await entityByCode(body.entity);
  return sequelize.transaction(async (transaction) => {
    await holdEntityData(entity.id, transaction);
    const existing = await findLocked(
      SnapshotModel,
      { entityId: entity.id, quarterEnd: body.quarterEnd, amendsId: null },
      transaction,
    );
    if (existing && existing.status !== "draft" && existing.status !== "returned") {
      throw new ConflictError(
        `${entity.code} ${quarterLabel(body.quarterEnd)} is already ${existing.status}: it cannot be prepared again.${existing.status === "filed" && existing.restatedAt ? ` A day inside it was restated since: prepare an amendment of snapshot #${existing.id} instead.` : ""}`,
        { snapshotId: existing.id },
      );
    }
    // The analyst's return values stay with the quarter when it is prepared again.
    const { values } = draftOf(await quarterFigures(entity, body.quarterEnd), existing, actor);
    let row: SnapshotModel;
    if (existing) {
      const before = { status: existing.status, inputsSha256: existing.inputsSha256, multiplier: existing.multiplier };
      await existing.update(
        { ...values, historyJson: withEvent(existing, event(actor, "recomputed")), version: existing.version + 1 },
        { transaction },
      );
      row = existing;
      await recordAudit(
        actor,
        "snapshot.prepare",
        `snapshot #${row.id}`,
        { before, after: { status: "draft", inputsSha256: row.inputsSha256, multiplier: row.multiplier } },
        transaction,
      );
    } else {
      // Two first preparations of one quarter at once: the unique (entity, quarter) lets one in.
      row = await createDraft(
        {
          ...values,
          entityId: entity.id,
          quarterEnd: body.quarterEnd,
          amendsId: null,
          amendmentJson: null,
          historyJson: JSON.stringify([event(actor, "prepared")]),
        },
        `${entity.code} ${quarterLabel(body.quarterEnd)} was prepared by someone else a moment ago. Look at it again.`,
        transaction,
      );
      await recordAudit(
        actor,
        "snapshot.prepare",
        `snapshot #${row.id}`,
        {
          after: {
            entity: entity.code,
            quarterEnd: body.quarterEnd,
            status: "draft",
            inputsSha256: row.inputsSha256,
            multiplier: row.multiplier,
          },
        },
        transaction,
      );
    }
    return { created: !existing, snapshot: await snapshotDto(row, entity) };
  });
}

/**
 * A step of the sign-off that only moves the row: its new status with the event in its history
 * and a new version (plus `also`, who and when), audited from the status it left.
 */
async function moveSnapshot(
  row: SnapshotModel,
  actor: SignedIn,
  action: string,
  step: { to: "submitted" | "returned"; comment: string | undefined; also?: Partial<SnapshotModel> },
  transaction: Transaction,
): Promise<void> {
  const from = row.status;
  await row.update(
    {
      status: step.to,
      ...step.also,
      historyJson: withEvent(row, event(actor, step.to, step.comment)),
      version: row.version + 1,
    },
    { transaction },
  );
  await recordAudit(
    actor,
    action,
    `snapshot #${row.id}`,
    { before: { status: from }, after: { status: step.to, comment: step.comment ?? null } },
    transaction,
  );
}

export async function submitSnapshot(id: number, body: SnapshotActionBody, actor: SignedIn): Promise<Snapshot> {
  const snapshot = await sequelize.transaction(async (transaction) => {
    const { row, entity } = await lockSnapshot(id, transaction, body.version, { holdData: true });
    if (row.status !== "draft")
      throw new ConflictError(`Snapshot #${id} is ${row.status}; only a draft can be submitted.`);
    await refuseOpenFindings(row, entity, transaction);
    await refuseChangedInputs(row, entity, "submitted");
    await moveSnapshot(
      row,
      actor,
      "snapshot.submit",
      { to: "submitted", comment: body.comment, also: { submittedBy: actor.user.id, submittedAt: new Date() } },
      transaction,
    );
    return snapshotDto(row, entity);
  });
  void notifySnapshotEvent("snapshot_submitted", snapshot, actor.user.name, body.comment);
  return snapshot;
}

/**
 * The CRO signs a submitted snapshot off. Four eyes: not one they prepared or submitted. The
 * figures must still follow from today's data, no finding inside the quarter may be open, and
 * the approval extends the entity's hash chain.
 */
export async function approveSnapshot(id: number, body: SnapshotActionBody, actor: SignedIn): Promise<Snapshot> {
  const snapshot = await sequelize.transaction(async (transaction) => {
    // Approvals of one entity take turns (the entity row); the chain is then read with a locking
    // read, which sees the approval committed just before, so the chain never forks.
    const peek = await SnapshotModel.findByPk(id, { attributes: ["id", "entityId"], transaction });
    if (!peek) throw new NotFoundError(`No snapshot #${id}.`);
    await holdEntityData(peek.entityId, transaction);
    await EntityModel.findByPk(peek.entityId, { transaction, lock: transaction.LOCK.UPDATE });
    const { row, entity } = await lockSnapshot(id, transaction, body.version, { holdData: false });
    if (row.status !== "submitted")
      throw new ConflictError(`Snapshot #${id} is ${row.status}; only a submitted snapshot can be approved.`);
    if (row.preparedBy === actor.user.id || row.submittedBy === actor.user.id) {
      throw new ForbiddenError(
        "Four eyes: you prepared or submitted this snapshot, so someone else must approve it.",
        "four_eyes",
      );
    }
    await refuseOpenFindings(row, entity, transaction);
    await refuseChangedInputs(row, entity, "approved");
    row.status = "approved";
    row.approvedBy = actor.user.id;
    row.approvedAt = new Date(); // milliseconds, as DATETIME(3) keeps them: the signature is checked against the stored value
    row.historyJson = withEvent(row, event(actor, "approved", body.comment));
    row.version = row.version + 1;
    // The seal: a signed link of the entity's chain over everything the snapshot now holds.
    const link = await appendLink(row, "sealed", transaction);
    row.hash = link.mac;
    row.prevHash = link.prevMac;
    await row.save({ transaction });
    // The quarter's determination is frozen with the snapshot: approved, never recomputed.
    await refreshDeterminations(entity.id, transaction);
    await recordAudit(
      actor,
      "snapshot.approve",
      `snapshot #${id}`,
      {
        before: { status: "submitted" },
        after: { status: "approved", hash: row.hash, prevHash: row.prevHash, comment: body.comment ?? null },
      },
      transaction,
    );
    return snapshotDto(row, entity);
  });
  void notifySnapshotEvent("snapshot_approved", snapshot, actor.user.name, null);
  return snapshot;
}

export async function returnSnapshot(id: number, body: ReturnSnapshotBody, actor: SignedIn): Promise<Snapshot> {
  const snapshot = await sequelize.transaction(async (transaction) => {
    const { row, entity } = await lockSnapshot(id, transaction, body.version, { holdData: false });
    if (row.status !== "submitted")
      throw new ConflictError(`Snapshot #${id} is ${row.status}; only a submitted snapshot can be returned.`);
    await moveSnapshot(row, actor, "snapshot.return", { to: "returned", comment: body.comment }, transaction);
    return snapshotDto(row, entity);
  });
  void notifySnapshotEvent("snapshot_returned", snapshot, actor.user.name, body.comment);
  return snapshot;
}

/**
 * Filing, step one: the approved snapshot, locked for the filing's transaction, with its DTO as
 * the pack will show it (status filed). Refuses one that is not approved (or already filed).
 */
export async function lockForFiling(
  id: number,
  transaction: Transaction,
): Promise<{ row: SnapshotModel; entity: EntityModel; asFiled: Snapshot }> {
  const { row, entity } = await lockSnapshot(id, transaction, undefined, { holdData: false });
  if (row.status === "filed") throw new ConflictError(`Snapshot #${id} is already filed.`);
  if (row.status !== "approved")
    throw new ConflictError(`Snapshot #${id} is ${row.status}; only an approved snapshot can be filed.`);
  const dto = await snapshotDto(row, entity);
  return { row, entity, asFiled: { ...dto, status: "filed" } };
}

/**
 * Filing, once the pack reached the supervisor: the snapshot is filed (its figures and seal do not
 * change) and the chain signs it, with the pack's sha256 and Message-ID.
 */
export async function recordFiled(
  row: SnapshotModel,
  detail: string,
  actor: SignedIn,
  transaction: Transaction,
  filed: { filingId: number; packSha256: string; messageId: string | null },
): Promise<void> {
  await row.update(
    { status: "filed", historyJson: withEvent(row, event(actor, "filed", detail)), version: row.version + 1 },
    { transaction },
  );
  // Its determination is filed too (only the status moves; the entity is not locked here, as the
  // snapshot already is and the lock order puts the entity first).
  await DeterminationModel.update({ status: "filed" }, { where: { snapshotId: row.id }, transaction });
  // An amendment's filing resolves the restatement flag of what it amends: the chain says which.
  await appendLink(row, "filed", transaction, row.amendsId ? { ...filed, amends: row.amendsId } : filed);
}

/** The supervisor acknowledged a filing: the chain signs which pack they acknowledged (the snapshot does not change). */
export async function recordAcknowledged(
  snapshotId: number,
  acknowledged: { filingId: number; packSha256: string; by: string },
  transaction: Transaction,
): Promise<void> {
  const row = (await SnapshotModel.findByPk(snapshotId, { transaction, lock: transaction.LOCK.SHARE }))!;
  await appendLink(row, "acknowledged", transaction, acknowledged);
}
