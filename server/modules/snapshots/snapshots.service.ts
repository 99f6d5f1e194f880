import type { Transaction } from "sequelize";
import { sequelize } from "../../db/sequelize";
import { lockPortfolios } from "../../db/portfolio-locks";
import { AppError, ConflictError, ForbiddenError, NotFoundError } from "../../errors";
import { EntityModel } from "../../models/entity";
import { PortfolioModel } from "../../models/portfolio";
import { SnapshotModel } from "../../models/snapshot";
import { UserModel } from "../../models/user";
import { recordAudit } from "../audit/audit.service";
import { countOpenFindings } from "../findings/findings.service";
import { quarterFigures } from "../backtest/quarter-figures";
import { appendLink, verifyChain } from "../snapshot-chain/snapshot-chain";
import {
  SIGNED_OFF,
  quarterLabel,
  quarterStart,
  type CapitalHistoryItem,
  type ChainVerify,
  type CreateSnapshotBody,
  type ReturnSnapshotBody,
  type Snapshot,
  type SnapshotActionBody,
  type SnapshotEvent,
  type SnapshotFigures,
  type SnapshotVerify,
} from "../../../shared/schemas/snapshot";
import type { Actor } from "../../http/context";
import type { SessionUser } from "../../../shared/schemas/auth";

type SignedIn = Actor & { user: SessionUser };

/** Treasury reads signed-off figures only (DESIGN §2). */
const readsSignedOffOnly = (actor: SignedIn) => actor.user.role === "treasury";

const today = () => new Date().toISOString().slice(0, 10);

// ---- reading ---------------------------------------------------------------------------------

async function emailsOf(ids: (number | null)[]): Promise<Map<number, string>> {
  const wanted = [...new Set(ids.filter((v): v is number => v !== null))];
  if (wanted.length === 0) return new Map();
  return new Map(
    (await UserModel.findAll({ where: { id: wanted }, attributes: ["id", "email"] })).map((u) => [u.id, u.email]),
  );
}

async function openFindingsInQuarter(entityId: number, quarterEnd: string, transaction?: Transaction): Promise<number> {
  const portfolios = await PortfolioModel.findAll({ where: { entityId }, attributes: ["id"], transaction });
  return countOpenFindings(
    portfolios.map((p) => p.id),
    quarterStart(quarterEnd),
    quarterEnd,
  );
}

async function toDto(row: SnapshotModel, entity?: EntityModel): Promise<Snapshot> {
  const owner = entity ?? (await EntityModel.findByPk(row.entityId))!;
  const history = JSON.parse(row.historyJson) as SnapshotEvent[];
  const emails = await emailsOf([row.preparedBy, row.submittedBy, row.approvedBy]);
  const figures = JSON.parse(row.figuresJson) as SnapshotFigures;
  return {
    id: row.id,
    entity: owner.code,
    entityName: owner.name,
    quarterEnd: row.quarterEnd,
    status: row.status,
    zone: row.zone,
    counted: row.counted,
    plusFactor: row.plusFactor,
    multiplier: row.multiplier,
    capital: row.capital,
    addOn: row.addOn,
    figures,
    inputsSha256: row.inputsSha256,
    engineVersion: row.engineVersion,
    preparedBy: emails.get(row.preparedBy) ?? "unknown",
    preparedAt: row.preparedAt.toISOString(),
    submittedBy: row.submittedBy ? (emails.get(row.submittedBy) ?? "unknown") : null,
    submittedAt: row.submittedAt ? row.submittedAt.toISOString() : null,
    approvedBy: row.approvedBy ? (emails.get(row.approvedBy) ?? "unknown") : null,
    approvedAt: row.approvedAt ? row.approvedAt.toISOString() : null,
    history,
    prevHash: row.prevHash,
    hash: row.hash,
    restatedAfterSignOff: row.restatedAt
      ? { at: row.restatedAt.toISOString(), detail: row.restatementDetail ?? "" }
      : null,
    openFindings: await openFindingsInQuarter(row.entityId, row.quarterEnd),
    version: row.version,
  };
}

export async function listSnapshots(query: { entity?: string }, actor: SignedIn): Promise<Snapshot[]> {
  const where: Record<string, unknown> = {};
  if (query.entity) {
    const entity = await EntityModel.findOne({ where: { code: query.entity } });
    if (!entity) throw new NotFoundError(`No entity ${query.entity}.`);
    where.entityId = entity.id;
  }
  if (readsSignedOffOnly(actor)) where.status = [...SIGNED_OFF];
  const rows = await SnapshotModel.findAll({
    where,
    order: [
      ["quarterEnd", "DESC"],
      ["entityId", "ASC"],
    ],
  });
  return Promise.all(rows.map((r) => toDto(r)));
}

export async function getSnapshot(id: number, actor: SignedIn): Promise<Snapshot> {
  const row = await SnapshotModel.findByPk(id);
  if (!row || (readsSignedOffOnly(actor) && !SIGNED_OFF.has(row.status)))
    throw new NotFoundError(`No snapshot #${id}.`);
  return toDto(row);
}

/** The entity's quarters as their snapshots hold them, oldest first (treasury: signed off only). */
export async function capitalHistory(code: string, actor: SignedIn): Promise<CapitalHistoryItem[]> {
  const entity = await EntityModel.findOne({ where: { code } });
  if (!entity) throw new NotFoundError(`No entity ${code}.`);
  const rows = await SnapshotModel.findAll({
    where: { entityId: entity.id, ...(readsSignedOffOnly(actor) ? { status: [...SIGNED_OFF] } : {}) },
    order: [["quarterEnd", "ASC"]],
  });
  return rows.map((r) => ({
    quarterEnd: r.quarterEnd,
    status: r.status,
    zone: r.zone,
    counted: r.counted,
    plusFactor: r.plusFactor,
    multiplier: r.multiplier,
    capital: r.capital,
    addOn: r.addOn,
    snapshotId: r.id,
    restatedAfterSignOff: r.restatedAt !== null,
    windowComplete: (JSON.parse(r.figuresJson) as SnapshotFigures).window.complete,
  }));
}

// ---- the sign-off ----------------------------------------------------------------------------

function event(actor: SignedIn, action: SnapshotEvent["action"], comment?: string | null): SnapshotEvent {
  return {
    at: new Date().toISOString(),
    by: actor.user.email,
    action,
    comment: comment?.trim() ? comment.trim() : null,
  };
}

function withEvent(row: SnapshotModel, e: SnapshotEvent): string {
  return JSON.stringify([...(JSON.parse(row.historyJson) as SnapshotEvent[]), e]);
}

/** Locks the entity's portfolios for share: an upload committing to them finishes first, and none starts until we are done. */
async function holdEntityData(entityId: number, transaction: Transaction): Promise<void> {
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
  if (expectedVersion !== undefined && expectedVersion !== row.version) {
    throw new AppError(
      409,
      "stale",
      `Snapshot #${id} changed since you opened it (now version ${row.version}). Look at it again before acting.`,
      {
        current: await toDto(row),
      },
    );
  }
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
  const entity = await EntityModel.findOne({ where: { code: body.entity } });
  if (!entity) throw new NotFoundError(`No entity ${body.entity}.`);
  return sequelize.transaction(async (transaction) => {
    await holdEntityData(entity.id, transaction);
    const existing = await SnapshotModel.findOne({
      where: { entityId: entity.id, quarterEnd: body.quarterEnd },
      transaction,
      lock: transaction.LOCK.UPDATE,
    });
    if (existing && existing.status !== "draft" && existing.status !== "returned") {
      throw new ConflictError(
        `${entity.code} ${quarterLabel(body.quarterEnd)} is already ${existing.status}: it cannot be prepared again.`,
        { snapshotId: existing.id },
      );
    }
    const computed = await quarterFigures(entity, body.quarterEnd);
    const { figures } = computed;
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
      row = await SnapshotModel.create(
        {
          ...values,
          entityId: entity.id,
          quarterEnd: body.quarterEnd,
          approvedBy: null,
          approvedAt: null,
          prevHash: null,
          hash: null,
          restatedAt: null,
          restatementDetail: null,
          historyJson: JSON.stringify([event(actor, "prepared")]),
        },
        { transaction },
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
    return { created: !existing, snapshot: await toDto(row, entity) };
  });
}

export async function submitSnapshot(id: number, body: SnapshotActionBody, actor: SignedIn): Promise<Snapshot> {
  return sequelize.transaction(async (transaction) => {
    const { row, entity } = await lockSnapshot(id, transaction, body.version, { holdData: true });
    if (row.status !== "draft")
      throw new ConflictError(`Snapshot #${id} is ${row.status}; only a draft can be submitted.`);
    await refuseOpenFindings(row, entity, transaction);
    await refuseChangedInputs(row, entity, "submitted");
    await row.update(
      {
        status: "submitted",
        submittedBy: actor.user.id,
        submittedAt: new Date(),
        historyJson: withEvent(row, event(actor, "submitted", body.comment)),
        version: row.version + 1,
      },
      { transaction },
    );
    await recordAudit(
      actor,
      "snapshot.submit",
      `snapshot #${id}`,
      { before: { status: "draft" }, after: { status: "submitted", comment: body.comment ?? null } },
      transaction,
    );
    return toDto(row, entity);
  });
}

/**
 * The CRO signs a submitted snapshot off. Four eyes: not one they prepared or submitted. The
 * figures must still follow from today's data, no finding inside the quarter may be open, and
 * the approval extends the entity's hash chain.
 */
export async function approveSnapshot(id: number, body: SnapshotActionBody, actor: SignedIn): Promise<Snapshot> {
  return sequelize.transaction(async (transaction) => {
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
    return toDto(row, entity);
  });
}

export async function returnSnapshot(id: number, body: ReturnSnapshotBody, actor: SignedIn): Promise<Snapshot> {
  return sequelize.transaction(async (transaction) => {
    const { row, entity } = await lockSnapshot(id, transaction, body.version, { holdData: false });
    if (row.status !== "submitted")
      throw new ConflictError(`Snapshot #${id} is ${row.status}; only a submitted snapshot can be returned.`);
    await row.update(
      {
        status: "returned",
        historyJson: withEvent(row, event(actor, "returned", body.comment)),
        version: row.version + 1,
      },
      { transaction },
    );
    await recordAudit(
      actor,
      "snapshot.return",
      `snapshot #${id}`,
      { before: { status: "submitted" }, after: { status: "returned", comment: body.comment } },
      transaction,
    );
    return toDto(row, entity);
  });
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
  const dto = await toDto(row, entity);
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
  await appendLink(row, "filed", transaction, filed);
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

/**
 * Checks the snapshot against the entity's signed chain: the chain must be whole (every link
 * signed, numbered without gaps, ending at the signed head), and the snapshot must stand as its
 * newest link says — figures, inputs hash, status, restatement and history.
 */
export async function verifySnapshot(id: number, actor: SignedIn): Promise<SnapshotVerify> {
  const row = await SnapshotModel.findByPk(id);
  if (!row || (readsSignedOffOnly(actor) && !SIGNED_OFF.has(row.status)))
    throw new NotFoundError(`No snapshot #${id}.`);
  const chain = await verifyChain(row.entityId);
  const own = chain.problems.filter((p) => p.snapshotId === row.id);
  const result = (valid: boolean, detail: string) => ({ valid, hash: row.hash, prevHash: row.prevHash, detail });
  if (own.length) return result(false, own.map((p) => p.detail).join(" "));
  const signed = chain.bodies.filter((b) => b.snapshotId === row.id);
  if (!row.hash && signed.length === 0) return result(false, "Not signed off yet: there is no seal to verify.");
  if (!chain.valid)
    return result(
      false,
      `The snapshot stands as signed, but the entity's chain does not verify: ${chain.problems.map((p) => p.detail).join(" ")}`,
    );
  const newest = signed.at(-1)!;
  return result(
    true,
    `The stored figures, inputs hash, status, restatement and history match what link ${newest.seq} of ${chain.links} signed (${newest.kind}), with the server's key; the entity's chain is whole up to its signed head.`,
  );
}

/** GET /api/entities/:code/chain/verify: the entity's whole chain, in words. */
export async function verifyEntityChain(code: string): Promise<ChainVerify> {
  const entity = await EntityModel.findOne({ where: { code } });
  if (!entity) throw new NotFoundError(`No entity ${code}.`);
  const chain = await verifyChain(entity.id);
  const detail = chain.valid
    ? chain.links
      ? `${code}: all ${chain.links} links carry the server's signature, follow each other without a gap up to the signed head, and every signed-off snapshot stands as its newest link says.`
      : `${code}: nothing is signed off yet, so the chain is empty.`
    : `${code}: ${chain.problems[0].detail}${chain.problems.length > 1 ? ` (and ${chain.problems.length - 1} more problem${chain.problems.length > 2 ? "s" : ""})` : ""}`;
  return { entity: code, valid: chain.valid, links: chain.links, problems: chain.problems, detail };
}

// ---- restatements after sign-off ---------------------------------------------------------------

/** A day an upload writes: version 1 is a day stored for the first time, a higher one restates a stored day. */
export interface WrittenDay {
  portfolioId: number;
  version: number;
  row: { date: string };
}

type Change = { portfolioId: number; date: string; kind: "restated" | "added" | "exclusion decided" };

const CHANGE_WORDS: Record<Change["kind"], string> = {
  restated: "restated",
  added: "added where there was no data",
  "exclusion decided": "with an exclusion decided",
};

/** The signed-off snapshots of the entities these portfolios belong to, locked, with each portfolio's entity and code. */
async function signedOffOf(portfolioIds: number[], transaction: Transaction) {
  const portfolios = await PortfolioModel.findAll({
    where: { id: portfolioIds },
    attributes: ["id", "entityId", "code"],
    transaction,
  });
  const entityIds = [...new Set(portfolios.map((p) => p.entityId))];
  const snapshots = entityIds.length
    ? await SnapshotModel.findAll({
        where: { entityId: entityIds, status: [...SIGNED_OFF] },
        transaction,
        lock: transaction.LOCK.UPDATE,
      })
    : [];
  return {
    snapshots,
    entityOf: new Map(portfolios.map((p) => [p.id, p.entityId])),
    codeOf: new Map(portfolios.map((p) => [p.id, p.code])),
  };
}

/**
 * Flags every signed-off snapshot whose window holds one of the changed days (in the caller's
 * transaction). Its figures stay as approved; the flag says which days changed, how and by what.
 */
async function flagSignedOff(
  found: Awaited<ReturnType<typeof signedOffOf>>,
  changes: readonly Change[],
  source: string,
  actor: SignedIn,
  transaction: Transaction,
): Promise<number> {
  let flagged = 0;
  for (const snapshot of found.snapshots) {
    // A short window reaches back to the first day there is: a day added before it would join it.
    const complete = (JSON.parse(snapshot.figuresJson) as SnapshotFigures).window.complete;
    const from = complete ? (snapshot.windowStart ?? snapshot.asOf) : "0000-01-01";
    const days = changes.filter(
      (k) => k.date >= from && k.date <= snapshot.quarterEnd && found.entityOf.get(k.portfolioId) === snapshot.entityId,
    );
    if (days.length === 0) continue;
    const counts = (Object.keys(CHANGE_WORDS) as Change["kind"][])
      .map((kind) => [kind, days.filter((d) => d.kind === kind).length] as const)
      .filter(([, n]) => n > 0);
    const what = counts.map(([kind, n]) => `${n} ${CHANGE_WORDS[kind]}`).join(", ");
    const listed = days
      .slice(0, 5)
      .map((k) => `${found.codeOf.get(k.portfolioId)} ${k.date}`)
      .join(", ");
    const line = `${days.length} day${days.length === 1 ? "" : "s"} inside this snapshot's window changed by ${source}: ${what} (${listed}${days.length > 5 ? ", …" : ""}).`;
    await snapshot.update(
      {
        restatedAt: new Date(),
        restatementDetail: snapshot.restatementDetail ? `${snapshot.restatementDetail}\n${line}` : line,
        historyJson: withEvent(snapshot, { ...event(actor, "restated"), comment: line }),
        version: snapshot.version + 1,
      },
      { transaction },
    );
    await appendLink(snapshot, "restated", transaction);
    await recordAudit(
      actor,
      "snapshot.restated",
      `snapshot #${snapshot.id}`,
      { after: { source, ...Object.fromEntries(counts) } },
      transaction,
    );
    flagged++;
  }
  return flagged;
}

/** An upload wrote days — restated them, or filled days that had no data: flags the signed-off snapshots whose window holds them. */
export async function flagChangedSnapshots(
  written: readonly WrittenDay[],
  uploadId: number,
  actor: SignedIn,
  transaction: Transaction,
): Promise<number> {
  if (written.length === 0) return 0;
  const found = await signedOffOf([...new Set(written.map((k) => k.portfolioId))], transaction);
  if (found.snapshots.length === 0) return 0;
  const changes = written.map((k): Change => ({
    portfolioId: k.portfolioId,
    date: k.row.date,
    kind: k.version > 1 ? "restated" : "added",
  }));
  return flagSignedOff(found, changes, `upload #${uploadId}`, actor, transaction);
}

/** The CRO recorded the supervisor's decision on an exclusion: the signed-off snapshots whose window holds that day are flagged. */
export async function flagExclusionDecision(
  portfolioId: number,
  date: string,
  actor: SignedIn,
  transaction: Transaction,
): Promise<number> {
  const found = await signedOffOf([portfolioId], transaction);
  return flagSignedOff(
    found,
    [{ portfolioId, date, kind: "exclusion decided" }],
    `the exclusion decision recorded for ${date}`,
    actor,
    transaction,
  );
}
