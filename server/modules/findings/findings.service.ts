import { Op, type Transaction, type WhereOptions } from "sequelize";
import { sequelize } from "../../db/sequelize";
import { DataFindingModel } from "../../models/data-finding";
import { PortfolioModel } from "../../models/portfolio";
import { EntityModel } from "../../models/entity";
import { HolidayModel } from "../../models/holiday";
import { UserModel } from "../../models/user";
import { ConflictError, NotFoundError } from "../../errors";
import { recordAudit } from "../audit/audit.service";
import { loadQualitySeries, type QualityDay } from "../observations/observations.repository";
import { findDataQualityIssues } from "../../../shared/ingest/data-quality";
import type { Actor } from "../../http/context";
import type { SessionUser } from "../../../shared/schemas/auth";
import type { CloseFindingBody, Finding } from "../../../shared/schemas/upload";

type SignedIn = Actor & { user: SessionUser };

/** What a commit already holds in memory: each portfolio's current days inside the span it wrote. */
export interface KnownSpan {
  from: string;
  to: string;
  days: ReadonlyMap<number, QualityDay[]>;
}

/**
 * Re-runs the data-quality checks on each portfolio's current series and brings the stored
 * findings in line: new problems open, problems the data no longer shows are resolved by it,
 * and what a person resolved or explained keeps their note. A commit passes its transaction (so
 * findings change with the data, atomically) and the days it already holds (read only the rest).
 */
export async function refreshFindings(portfolioIds: number[], options: { transaction?: Transaction; known?: KnownSpan } = {}): Promise<void> {
  const { known } = options;
  for (const portfolioId of portfolioIds) {
    const portfolio = await PortfolioModel.findByPk(portfolioId, { transaction: options.transaction });
    if (!portfolio) continue;
    const holidays = new Set((await HolidayModel.findAll({ where: { entityId: portfolio.entityId }, transaction: options.transaction })).map((h) => h.date));
    const inside = known?.days.get(portfolioId);
    const series = known && inside
      ? [...(await loadQualitySeries(portfolioId, known, options.transaction)), ...inside].sort((a, b) => (a.date < b.date ? -1 : a.date > b.date ? 1 : 0))
      : await loadQualitySeries(portfolioId, undefined, options.transaction);
    const found = findDataQualityIssues(series, holidays);
    const apply = async (transaction: Transaction) => {
      const existing = await DataFindingModel.findAll({ where: { portfolioId }, transaction, lock: transaction.LOCK.UPDATE });
      const byKey = new Map(existing.map((f) => [`${f.kind}|${f.dateFrom}`, f]));
      const seen = new Set<string>();
      const fresh = [];
      for (const f of found) {
        const key = `${f.kind}|${f.from}`;
        seen.add(key);
        const stored = byKey.get(key);
        if (!stored) {
          fresh.push({ portfolioId, kind: f.kind, dateFrom: f.from, dateTo: f.to, detail: f.detail.slice(0, 500), note: null, closedBy: null, closedAt: null });
        } else if (stored.status === "resolved" && stored.closedBy === null) {
          // The data had cleared it and now shows it again: open once more.
          await stored.update({ status: "open", note: null, closedAt: null, dateTo: f.to, detail: f.detail.slice(0, 500), version: stored.version + 1 }, { transaction });
        } else if (stored.dateTo !== f.to || stored.detail !== f.detail) {
          await stored.update({ dateTo: f.to, detail: f.detail.slice(0, 500), version: stored.version + 1 }, { transaction });
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
    };
    await (options.transaction ? apply(options.transaction) : sequelize.transaction(apply));
  }
}

async function toFindings(rows: DataFindingModel[]): Promise<Finding[]> {
  const userIds = [...new Set(rows.map((r) => r.closedBy).filter((v): v is number => v !== null))];
  const users = new Map((await UserModel.findAll({ where: { id: userIds } })).map((u) => [u.id, u.email]));
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

export async function listFindings(query: { entity?: string; portfolio?: string; status?: "open" | "resolved" | "explained" }): Promise<Finding[]> {
  const where: WhereOptions = query.status ? { status: query.status } : {};
  const portfolioWhere: WhereOptions = query.portfolio ? { code: query.portfolio.toUpperCase() } : {};
  const entityWhere: WhereOptions = query.entity ? { code: query.entity.toUpperCase() } : {};
  const rows = await DataFindingModel.findAll({
    where,
    include: [{ model: PortfolioModel, as: "portfolio", where: portfolioWhere, include: [{ model: EntityModel, as: "entity", where: entityWhere }] }],
    order: [["dateFrom", "DESC"], ["id", "DESC"]],
    limit: 1000,
  });
  return toFindings(rows);
}

/** An analyst resolves or explains a finding; the row version stops two people overwriting each other. */
export async function closeFinding(id: number, body: CloseFindingBody, actor: SignedIn): Promise<Finding> {
  return sequelize.transaction(async (transaction) => {
    const row = await DataFindingModel.findByPk(id, { transaction, lock: transaction.LOCK.UPDATE });
    if (!row) throw new NotFoundError(`No finding #${id}.`);
    if (row.version !== body.version) {
      throw new ConflictError(`Finding #${id} was changed by someone else (now version ${row.version}); reload and try again.`, {
        currentVersion: row.version,
      });
    }
    const before = { status: row.status, note: row.note };
    await row.update({ status: body.status, note: body.note, closedBy: actor.user.id, closedAt: new Date(), version: row.version + 1 }, { transaction });
    await recordAudit(actor, `finding.${body.status}`, `finding #${id}`, { before, after: { status: body.status, note: body.note } }, transaction);
    const reloaded = await DataFindingModel.findByPk(id, {
      include: [{ model: PortfolioModel, as: "portfolio", include: [{ model: EntityModel, as: "entity" }] }],
      transaction,
    });
    return (await toFindings([reloaded!]))[0];
  });
}

/** Open findings dated inside a period (used to block a quarter's sign-off). */
export async function countOpenFindings(portfolioIds: number[], from: string, to: string): Promise<number> {
  return DataFindingModel.count({
    where: { portfolioId: portfolioIds, status: "open", dateFrom: { [Op.lte]: to }, dateTo: { [Op.gte]: from } },
  });
}
