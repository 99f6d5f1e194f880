import { QueryTypes, type Transaction } from "sequelize";
import { sequelize } from "../../db/sequelize";
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
  SNAPSHOT_HEADLINE_KEYS,
  type Snapshot,
  type SnapshotEvent,
  type SnapshotFigures,
  type SnapshotHeadlineFigures,
  type SnapshotListItem,
  type AmendmentRecord,
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
export async function amendedByOf(snapshotId: number, transaction?: Transaction): Promise<AmendedBy | null> {
  return (await amendedByOfMany([snapshotId], transaction)).get(snapshotId) ?? null;
}

type AmendedBy = { id: number; status: SnapshotModel["status"]; filedAt: string | null };

/** amendedByOf for many snapshots at once (two queries whatever their number). */
async function amendedByOfMany(snapshotIds: number[], transaction?: Transaction): Promise<Map<number, AmendedBy>> {
  const out = new Map<number, AmendedBy>();
  if (snapshotIds.length === 0) return out;
  const by = await SnapshotModel.findAll({
    where: { amendsId: snapshotIds },
    attributes: ["id", "status", "amendsId"],
    transaction,
  });
  if (by.length === 0) return out;
  const filedIds = by.filter((b) => b.status === "filed").map((b) => b.id);
  const filings = filedIds.length
    ? await FilingModel.findAll({
        where: { snapshotId: filedIds },
        attributes: ["id", "snapshotId", "sentAt"],
        transaction,
      })
    : [];
  const sentAt = new Map(filings.map((f) => [f.snapshotId, f.sentAt]));
  for (const b of [...by].sort((x, y) => x.id - y.id)) {
    if (out.has(b.amendsId!)) continue;
    const at = b.status === "filed" ? sentAt.get(b.id) : null;
    out.set(b.amendsId!, { id: b.id, status: b.status, filedAt: at ? at.toISOString() : null });
  }
  return out;
}

/** What a snapshot and a list item share: everything but the figures, the history and the open findings. */
function dtoFields(
  row: SnapshotModel,
  owner: Pick<EntityModel, "code" | "name">,
  emails: Map<number, string>,
  amendedBy: AmendedBy | null,
): Omit<SnapshotListItem, "figures" | "openFindings"> {
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
    inputsSha256: row.inputsSha256,
    engineVersion: row.engineVersion,
    preparedBy: emails.get(row.preparedBy) ?? "unknown",
    preparedAt: row.preparedAt.toISOString(),
    submittedBy: row.submittedBy ? (emails.get(row.submittedBy) ?? "unknown") : null,
    submittedAt: row.submittedAt ? row.submittedAt.toISOString() : null,
    approvedBy: row.approvedBy ? (emails.get(row.approvedBy) ?? "unknown") : null,
    approvedAt: row.approvedAt ? row.approvedAt.toISOString() : null,
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
    version: row.version,
  };
}

/** One snapshot with everything it froze (GET /api/snapshots/:id and every write's answer). */
export async function snapshotDto(row: SnapshotModel, entity?: EntityModel): Promise<Snapshot> {
  const owner = entity ?? (await EntityModel.findByPk(row.entityId))!;
  const amendedBy = await amendedByOf(row.id);
  const emails = await emailsById([row.preparedBy, row.submittedBy, row.approvedBy]);
  return {
    ...dtoFields(row, owner, emails, amendedBy),
    figures: JSON.parse(row.figuresJson) as SnapshotFigures,
    history: JSON.parse(row.historyJson) as SnapshotEvent[],
    amendment: row.amendmentJson ? (JSON.parse(row.amendmentJson) as AmendmentRecord) : null,
    openFindings: await openFindingsInQuarter(row.entityId, row.quarterEnd),
  };
}

/** A JSON function's result: the driver hands it over parsed, or as text on a connection that does not. */
const jsonObject = (v: unknown): Record<string, unknown> =>
  (typeof v === "string" ? JSON.parse(v) : v) as Record<string, unknown>;

function headlineOf(figures: Record<string, unknown>): SnapshotHeadlineFigures {
  const out: Record<string, unknown> = {};
  for (const k of SNAPSHOT_HEADLINE_KEYS) if (figures[k] !== undefined) out[k] = figures[k];
  return out as SnapshotHeadlineFigures;
}

/**
 * The snapshots, newest quarter first, each without its history and the heavy part of its figures
 * (docs/api.md#snapshots): four queries whatever the number of rows, and about a kilobyte a row.
 */
export async function listSnapshots(query: { entity?: string }, actor: SignedIn): Promise<SnapshotListItem[]> {
  const where: Record<string, unknown> = {};
  if (query.entity) {
    where.entityId = (await entityByCode(query.entity)).id;
  }
  if (readsSignedOffOnly(actor)) where.status = [...SIGNED_OFF];
  const rows = await SnapshotModel.findAll({
    where,
    attributes: {
      exclude: ["figuresJson", "historyJson", "amendmentJson"],
      // The headline MariaDB keeps beside the figures (migration 20261202-33-02): the rest is picked below.
      include: [[sequelize.col("figures_headline"), "headlineJson"]],
    },
    order: [
      ["quarterEnd", "DESC"],
      ["entityId", "ASC"],
      ["id", "DESC"], // an amendment before what it amends
    ],
  });
  if (rows.length === 0) return [];
  const entityIds = [...new Set(rows.map((r) => r.entityId))];
  const [entities, emails, findings, amended] = await Promise.all([
    EntityModel.findAll({ where: { id: entityIds }, attributes: ["id", "code", "name"] }),
    emailsById(rows.flatMap((r) => [r.preparedBy, r.submittedBy, r.approvedBy])),
    openFindingSpans(entityIds),
    amendedByOfMany(rows.map((r) => r.id)),
  ]);
  const entityOf = new Map(entities.map((e) => [e.id, e]));
  return rows.map((row) => {
    const owner = entityOf.get(row.entityId)!;
    const from = quarterStart(row.quarterEnd);
    return {
      ...dtoFields(row, owner, emails, amended.get(row.id) ?? null),
      figures: headlineOf(jsonObject(row.get("headlineJson"))),
      openFindings: findings.filter(
        (f) => f.entityId === row.entityId && f.dateFrom <= row.quarterEnd && f.dateTo >= from,
      ).length,
    };
  });
}

/** The open findings of these entities' portfolios with their spans (few: one is open until someone settles it). */
async function openFindingSpans(
  entityIds: number[],
): Promise<{ entityId: number; dateFrom: string; dateTo: string }[]> {
  const rows = await sequelize.query<{ e: number; f: string; t: string }>(
    `SELECT p.entity_id AS e, DATE_FORMAT(f.date_from, '%Y-%m-%d') AS f, DATE_FORMAT(f.date_to, '%Y-%m-%d') AS t
       FROM data_findings f JOIN portfolios p ON p.id = f.portfolio_id
      WHERE f.status = 'open' AND p.entity_id IN (:ids)`,
    { replacements: { ids: entityIds }, type: QueryTypes.SELECT },
  );
  return rows.map((r) => ({ entityId: Number(r.e), dateFrom: r.f, dateTo: r.t }));
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
