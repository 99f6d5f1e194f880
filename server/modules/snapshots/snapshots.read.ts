import type { Transaction } from "sequelize";
import { NotFoundError } from "../../errors";
import { EntityModel } from "../../models/entity";
import { PortfolioModel } from "../../models/portfolio";
import { SnapshotModel } from "../../models/snapshot";
import { renderSnapshotPack, snapshotPackFileName } from "../../pdf/snapshot-pack";
import { countOpenFindings } from "../findings/findings.service";
import { SIGNED_OFF, type Snapshot, type SnapshotEvent, type SnapshotFigures } from "../../../shared/schemas/snapshot";
import { quarterStart } from "../../../shared/backtest/quarters";
import type { SignedIn } from "../../kit/actor";
import { emailsById, entityByCode } from "../../kit/lookups";

/** Treasury reads signed-off figures only (docs/architecture.md#roles). */
export const readsSignedOffOnly = (actor: SignedIn) => actor.user.role === "treasury";

export async function openFindingsInQuarter(
  entityId: number,
  quarterEnd: string,
  transaction?: Transaction,
): Promise<number> {
  const portfolios = await PortfolioModel.findAll({ where: { entityId }, attributes: ["id"], transaction });
  return countOpenFindings(
    portfolios.map((p) => p.id),
    quarterStart(quarterEnd),
    quarterEnd,
  );
}

export async function snapshotDto(row: SnapshotModel, entity?: EntityModel): Promise<Snapshot> {
  const owner = entity ?? (await EntityModel.findByPk(row.entityId))!;
  const history = JSON.parse(row.historyJson) as SnapshotEvent[];
  const emails = await emailsById([row.preparedBy, row.submittedBy, row.approvedBy]);
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
    where.entityId = (await entityByCode(query.entity)).id;
  }
  if (readsSignedOffOnly(actor)) where.status = [...SIGNED_OFF];
  const rows = await SnapshotModel.findAll({
    where,
    order: [
      ["quarterEnd", "DESC"],
      ["entityId", "ASC"],
    ],
  });
  return Promise.all(rows.map((r) => snapshotDto(r)));
}

/** The snapshot row the actor may read, or 404 (treasury does not see one that is not signed off). */
export async function visibleSnapshotRow(id: number, actor: SignedIn): Promise<SnapshotModel> {
  const row = await SnapshotModel.findByPk(id);
  if (!row || (readsSignedOffOnly(actor) && !SIGNED_OFF.has(row.status)))
    throw new NotFoundError(`No snapshot #${id}.`);
  return row;
}

export async function getSnapshot(id: number, actor: SignedIn): Promise<Snapshot> {
  return snapshotDto(await visibleSnapshotRow(id, actor));
}

/** The pack of any snapshot, for the reporting office to read before filing (drafts say so on the page). */
export async function snapshotPack(id: number, actor: SignedIn): Promise<{ fileName: string; bytes: Buffer }> {
  const snapshot = await getSnapshot(id, actor);
  return { fileName: snapshotPackFileName(snapshot), bytes: await renderSnapshotPack(snapshot) };
}
