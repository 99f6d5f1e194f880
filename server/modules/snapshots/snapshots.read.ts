import type { Transaction } from "sequelize";
import { NotFoundError } from "../../errors";
import { EntityModel } from "../../models/entity";
import { PortfolioModel } from "../../models/portfolio";
import { SnapshotModel } from "../../models/snapshot";
import { renderSnapshotPack, snapshotPackFileName, type Signatory } from "../../pdf/snapshot-pack";
import { UserModel } from "../../models/user";
import type { Role } from "../../../shared/schemas/common";
import { countOpenFindings } from "../findings/findings.service";
import {
  SIGNED_OFF,
  type AmendmentRecord,
  type Snapshot,
  type SnapshotEvent,
  type SnapshotFigures,
} from "../../../shared/schemas/snapshot";
import { FilingModel } from "../../models/filing";
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

/**
 * The snapshot that amends this one, if any, and — once that amendment is filed — when: a filed
 * amendment resolves the restatement flag of the quarter (docs/api.md#amendments).
 */
export async function amendedByOf(
  snapshotId: number,
  transaction?: Transaction,
): Promise<{ id: number; status: SnapshotModel["status"]; filedAt: string | null } | null> {
  const by = await SnapshotModel.findOne({
    where: { amendsId: snapshotId },
    attributes: ["id", "status"],
    transaction,
  });
  if (!by) return null;
  const filing =
    by.status === "filed"
      ? await FilingModel.findOne({ where: { snapshotId: by.id }, attributes: ["id", "sentAt"], transaction })
      : null;
  return { id: by.id, status: by.status, filedAt: filing?.sentAt ? filing.sentAt.toISOString() : null };
}

export async function snapshotDto(row: SnapshotModel, entity?: EntityModel): Promise<Snapshot> {
  const owner = entity ?? (await EntityModel.findByPk(row.entityId))!;
  const amendedBy = await amendedByOf(row.id);
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
      ? {
          at: row.restatedAt.toISOString(),
          detail: row.restatementDetail ?? "",
          resolvedBy: amendedBy?.status === "filed" ? { snapshotId: amendedBy.id, filedAt: amendedBy.filedAt } : null,
        }
      : null,
    amends: row.amendsId,
    amendedBy: amendedBy?.id ?? null,
    amendment: row.amendmentJson ? (JSON.parse(row.amendmentJson) as AmendmentRecord) : null,
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

/** How the pack titles a signatory: by the role they sign in. */
const SIGNING_TITLES: Record<Role, string> = {
  analyst: "Market risk analyst",
  cro: "Chief Risk Officer",
  treasury: "Treasury",
  regulator: "Regulator",
  admin: "Administrator",
};

/** Who prepared, submitted and approved a snapshot, by name and title, with the dates they did. */
export async function signatoriesOf(row: SnapshotModel): Promise<Signatory[]> {
  const acts: [string, number | null, Date | null][] = [
    ["Prepared by", row.preparedBy, row.preparedAt],
    ["Submitted by", row.submittedBy, row.submittedAt],
    ["Approved by", row.approvedBy, row.approvedAt],
  ];
  const ids = acts.map(([, id]) => id).filter((id): id is number => id !== null);
  const users = new Map((await UserModel.findAll({ where: { id: ids } })).map((u) => [u.id, u]));
  return acts.flatMap(([act, id, at]) => {
    const u = id === null ? undefined : users.get(id);
    return u
      ? [{ act, name: u.name, title: SIGNING_TITLES[u.role], email: u.email, at: at ? at.toISOString() : null }]
      : [];
  });
}

/** The pack of any snapshot, for the reporting office to read before filing (drafts say so on every page). */
export async function snapshotPack(id: number, actor: SignedIn): Promise<{ fileName: string; bytes: Buffer }> {
  const row = await visibleSnapshotRow(id, actor);
  const snapshot = await snapshotDto(row);
  return {
    fileName: snapshotPackFileName(snapshot),
    bytes: await renderSnapshotPack(snapshot, { signatories: await signatoriesOf(row) }),
  };
}
