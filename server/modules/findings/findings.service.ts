import { Op, type Transaction, type WhereOptions } from "sequelize";
import { sequelize } from "../../db/sequelize";
import { DataFindingModel } from "../../models/data-finding";
import { PortfolioModel } from "../../models/portfolio";
import { EntityModel } from "../../models/entity";
import { HolidayModel } from "../../models/holiday";
import { NotFoundError } from "../../errors";
import { recordAudit } from "../audit/audit.service";
import { loadQualitySeries } from "../observations/observations.repository";
import { type QualityDay } from "../../../shared/ingest/row-plan";
import { findDataQualityIssues, type QualityFinding } from "../../../shared/ingest/data-quality";
import type { SignedIn } from "../../kit/actor";
import type { CloseFindingBody, Finding } from "../../../shared/schemas/finding";
import { checkVersion } from "../../kit/stale";
import { emailsById } from "../../kit/lookups";

/** What a commit already holds in memory: each portfolio's current days inside the span it wrote. */
export interface KnownSpan {
  from: string;
  to: string;
  days: ReadonlyMap<number, QualityDay[]>;
}

/** What the checks of one portfolio read from the database: its calendar and its stored days. */
export interface FindingInputs {
  portfolioId: number;
  holidays: ReadonlySet<string>;
  /** The current days, or with a span given only those outside it (the caller holds the rest). */
  stored: QualityDay[];
}

/** Reads what the checks need; with `outside`, the days inside that span are left to the caller. */
export async function loadFindingInputs(
  portfolioIds: number[],
  options: { transaction?: Transaction; outside?: { from: string; to: string } } = {},
): Promise<FindingInputs[]> {
  const { transaction, outside } = options;
  const portfolios = await PortfolioModel.findAll({ where: { id: portfolioIds }, transaction });
  const holidays = await HolidayModel.findAll({
    where: { entityId: [...new Set(portfolios.map((p) => p.entityId))] },
    transaction,
  });
  const series = await loadQualitySeries(
    portfolios.map((p) => p.id),
    outside,
    transaction,
  );
  return portfolios.map((p) => ({
    portfolioId: p.id,
    holidays: new Set(holidays.filter((h) => h.entityId === p.entityId).map((h) => h.date)),
    stored: series.get(p.id) ?? [],
  }));
}

export interface PortfolioFindings {
  portfolioId: number;
  found: QualityFinding[];
}

const byDate = (a: QualityDay, b: QualityDay) => (a.date < b.date ? -1 : a.date > b.date ? 1 : 0);

/** Runs the data-quality checks of one portfolio (no database): on its stored days, plus the days inside the span when a commit holds them. */
export function checkFindings(
  { portfolioId, holidays, stored }: FindingInputs,
  inside?: ReadonlyMap<number, QualityDay[]>,
): PortfolioFindings {
  const held = inside?.get(portfolioId);
  const series = held ? [...stored, ...held].sort(byDate) : stored;
  return { portfolioId, found: findDataQualityIssues(series, holidays) };
}

/**
 * Brings the stored findings in line with what the checks found: new problems open, problems
 * the data no longer shows are resolved by it, and what a person resolved or explained keeps
 * their note.
 */
export async function applyFindings(results: readonly PortfolioFindings[], transaction: Transaction): Promise<void> {
  if (results.length === 0) return;
  // One locking read for all the portfolios, not one per portfolio.
  const all = await DataFindingModel.findAll({
    where: { portfolioId: results.map((r) => r.portfolioId) },
    order: [["id", "ASC"]],
    transaction,
    lock: transaction.LOCK.UPDATE,
  });
  for (const { portfolioId, found } of results) {
    const existing = all.filter((f) => f.portfolioId === portfolioId);
    const byKey = new Map(existing.map((f) => [`${f.kind}|${f.dateFrom}`, f]));
    const seen = new Set<string>();
    const fresh = [];
    for (const f of found) {
      const key = `${f.kind}|${f.from}`;
      seen.add(key);
      const stored = byKey.get(key);
      if (!stored) {
        fresh.push({
          portfolioId,
          kind: f.kind,
          dateFrom: f.from,
          dateTo: f.to,
          detail: f.detail.slice(0, 500),
          note: null,
          closedBy: null,
          closedAt: null,
        });
      } else if (stored.status === "resolved" && stored.closedBy === null) {
        // The data had cleared it and now shows it again: open once more.
        await stored.update(
          {
            status: "open",
            note: null,
            closedAt: null,
            dateTo: f.to,
            detail: f.detail.slice(0, 500),
            version: stored.version + 1,
          },
          { transaction },
        );
      } else if (stored.dateTo !== f.to || stored.detail !== f.detail) {
        await stored.update(
          { dateTo: f.to, detail: f.detail.slice(0, 500), version: stored.version + 1 },
          { transaction },
        );
      }
    }
    if (fresh.length) await DataFindingModel.bulkCreate(fresh, { transaction });
    for (const stored of existing) {
      if (!seen.has(`${stored.kind}|${stored.dateFrom}`) && stored.status === "open") {
        await stored.update(
          { status: "resolved", note: "Cleared by later data.", closedAt: new Date(), version: stored.version + 1 },
          { transaction },
        );
      }
    }
  }
}

/**
 * Re-runs the data-quality checks on each portfolio's current series and brings the stored
 * findings in line (for calendar changes; a commit runs the three steps itself, so that the
 * checks run while its rows are written).
 */
export async function refreshFindings(
  portfolioIds: number[],
  options: { transaction?: Transaction } = {},
): Promise<void> {
  const run = async (transaction: Transaction) =>
    applyFindings(
      (await loadFindingInputs(portfolioIds, { transaction })).map((input) => checkFindings(input)),
      transaction,
    );
  await (options.transaction ? run(options.transaction) : sequelize.transaction(run));
}

async function toFindings(rows: DataFindingModel[]): Promise<Finding[]> {
  const users = await emailsById(rows.map((r) => r.closedBy));
  return rows.map((r) => {
    const portfolio = (r as unknown as { portfolio: PortfolioModel & { entity: EntityModel } }).portfolio;
    return {
      id: r.id,
      entity: portfolio.entity.code,
      portfolio: portfolio.code,
      kind: r.kind,
      from: r.dateFrom,
      to: r.dateTo,
      detail: r.detail,
      status: r.status,
      note: r.note,
      closedBy: r.closedBy ? (users.get(r.closedBy) ?? null) : null,
      closedAt: r.closedAt ? r.closedAt.toISOString() : null,
      version: r.version,
    };
  });
}

export async function listFindings(query: {
  entity?: string;
  portfolio?: string;
  status?: "open" | "resolved" | "explained";
}): Promise<Finding[]> {
  const where: WhereOptions = query.status ? { status: query.status } : {};
  const portfolioWhere: WhereOptions = query.portfolio ? { code: query.portfolio.toUpperCase() } : {};
  const entityWhere: WhereOptions = query.entity ? { code: query.entity.toUpperCase() } : {};
  const rows = await DataFindingModel.findAll({
    where,
    include: [
      {
        model: PortfolioModel,
        as: "portfolio",
        where: portfolioWhere,
        include: [{ model: EntityModel, as: "entity", where: entityWhere }],
      },
    ],
    order: [
      ["dateFrom", "DESC"],
      ["id", "DESC"],
    ],
    limit: 1000,
  });
  return toFindings(rows);
}

/** One finding as the API gives it, read inside the caller's transaction. */
async function findingDto(id: number, transaction: Transaction): Promise<Finding> {
  const row = await DataFindingModel.findByPk(id, {
    include: [{ model: PortfolioModel, as: "portfolio", include: [{ model: EntityModel, as: "entity" }] }],
    transaction,
  });
  return (await toFindings([row!]))[0];
}

/** An analyst resolves or explains a finding; the row version stops two people overwriting each other. */
export async function closeFinding(id: number, body: CloseFindingBody, actor: SignedIn): Promise<Finding> {
  return sequelize.transaction(async (transaction) => {
    const row = await DataFindingModel.findByPk(id, { transaction, lock: transaction.LOCK.UPDATE });
    if (!row) throw new NotFoundError(`No finding #${id}.`);
    await checkVersion(row.version, body.version, async () => ({
      message: `Finding #${id} was changed by someone else (now version ${row.version}); reload and try again.`,
      current: await findingDto(id, transaction),
    }));
    const before = { status: row.status, note: row.note };
    await row.update(
      { status: body.status, note: body.note, closedBy: actor.user.id, closedAt: new Date(), version: row.version + 1 },
      { transaction },
    );
    await recordAudit(
      actor,
      `finding.${body.status}`,
      `finding #${id}`,
      { before, after: { status: body.status, note: body.note } },
      transaction,
    );
    return findingDto(id, transaction);
  });
}

/** Open findings dated inside a period (used to block a quarter's sign-off). */
export async function countOpenFindings(portfolioIds: number[], from: string, to: string): Promise<number> {
  return DataFindingModel.count({
    where: { portfolioId: portfolioIds, status: "open", dateFrom: { [Op.lte]: to }, dateTo: { [Op.gte]: from } },
  });
}
