import { rollingRowsBetween } from "../figures/rolling-slice";
import { QueryTypes } from "sequelize";
import { sequelize } from "../../db/sequelize";
import { PortfolioModel } from "../../models/portfolio";
import { AppError } from "../../errors";
import { reviewsByDate } from "../reviews/reviews.read";
import { loadPortfolioContext } from "../figures/engine-inputs";
import {
  backtestResponse,
  fillMissing,
  noDataError,
  storedByCode,
  storedOverviewRows,
} from "../figures/stored-figures";
import { inForceOnDate } from "../determinations/determinations.service";
import type { BacktestResponse, OverviewItem, RollingRowDto } from "../../../shared/schemas/backtest";

/** The exception days with their reviews, read now (a review's text is not a figure). */
async function withReviews(portfolioId: number, response: BacktestResponse): Promise<BacktestResponse> {
  const reviews = await reviewsByDate(
    portfolioId,
    response.exceptionDays.map((d) => d.date),
  );
  return {
    ...response,
    exceptionDays: response.exceptionDays.map((d) => ({ ...d, review: reviews.get(d.date) ?? null })),
  };
}

/**
 * The backtest of one portfolio at an as-of date (default: its latest day). The latest day's is
 * the stored one; another date is computed from the current data and approved exclusions.
 */
export async function getBacktest(code: string, asOf?: string): Promise<BacktestResponse> {
  const stored = await storedByCode(code, ["backtest_json"]);
  if (!stored.backtest_json) throw noDataError(code);
  if (!asOf || asOf === stored.asOf)
    return withReviews(stored.portfolioId, JSON.parse(stored.backtest_json) as BacktestResponse);
  const ctx = await loadPortfolioContext(code);
  const first = ctx.series[0]?.date;
  // Before the first stored day there is nothing to count: no zone from an empty window.
  if (!first || asOf < first)
    throw new AppError(
      404,
      "no_data_before",
      `No daily data for ${code} on or before ${asOf}: its first stored day is ${first ?? "not there yet"}. ` +
        "Choose a later as-of date.",
    );
  const portfolios = await PortfolioModel.findAll({ where: { entityId: ctx.entity.id } });
  return withReviews(ctx.portfolio.id, await backtestResponse(ctx, asOf, portfolios));
}

/** The rolling series as stored JSON (the whole history), or the rows between two dates cut from its text. */
export async function getRollingJson(code: string, range: { from?: string; to?: string }): Promise<string> {
  const stored = await storedByCode(code, ["rolling_json"]);
  const json = stored.rolling_json ?? "[]";
  if (!range.from && !range.to) return json;
  return rollingRowsBetween(json, range.from || undefined, range.to || undefined);
}

export async function getRolling(code: string, range: { from?: string; to?: string }): Promise<RollingRowDto[]> {
  return JSON.parse(await getRollingJson(code, range)) as RollingRowDto[];
}

/** Where each entity stands today: the stored figures of its headline book, its open work and its newest quarter. */
export async function getOverview(): Promise<OverviewItem[]> {
  let rows = await storedOverviewRows();
  const stale = rows.filter((r) => r.stale).map((r) => r.entityId);
  if (stale.length) {
    await fillMissing(stale);
    rows = await storedOverviewRows();
  }
  const [snapshots, findings, inForce] = await Promise.all([
    sequelize.query<{ entity_id: number; id: number; quarter_end: string; status: string }>(
      `SELECT s.entity_id, s.id, DATE_FORMAT(s.quarter_end, '%Y-%m-%d') AS quarter_end, s.status
         FROM snapshots s
         JOIN (SELECT entity_id, MAX(quarter_end) AS q FROM snapshots GROUP BY entity_id) m
           ON m.entity_id = s.entity_id AND m.q = s.quarter_end`,
      { type: QueryTypes.SELECT },
    ),
    sequelize.query<{ entity_id: number; date_from: string; date_to: string }>(
      `SELECT p.entity_id, DATE_FORMAT(f.date_from, '%Y-%m-%d') AS date_from, DATE_FORMAT(f.date_to, '%Y-%m-%d') AS date_to
         FROM data_findings f JOIN portfolios p ON p.id = f.portfolio_id
        WHERE f.status = 'open'`,
      { type: QueryTypes.SELECT },
    ),
    inForceOnDate(rows.map((r) => ({ id: r.entityId, regime: r.regime }))),
  ]);
  const newest = new Map(snapshots.map((s) => [Number(s.entity_id), s]));
  return rows.map((r) => {
    const s = newest.get(r.entityId);
    const o = r.overview;
    const from = o?.windowStart ?? o?.asOf ?? null;
    return {
      entity: r.code,
      name: r.name,
      regime: r.regime,
      currency: r.currency,
      portfolio: r.portfolio,
      asOf: o?.asOf ?? null,
      complete: o?.complete ?? false,
      zone: o?.zone ?? null,
      zoneLabel: o?.zoneLabel ?? null,
      counted: o?.counted ?? null,
      plusFactor: o?.plusFactor ?? null,
      multiplier: o?.multiplier ?? null,
      addOn: o?.addOn ?? null,
      inForce: inForce.get(r.entityId) ?? null,
      nextRollOff: o?.nextRollOff ?? null,
      openReviews: o?.openReviews ?? 0,
      // Open data-quality findings of any of the entity's books that touch the current window.
      openFindings:
        o && from
          ? findings.filter((f) => Number(f.entity_id) === r.entityId && f.date_from <= o.asOf! && f.date_to >= from)
              .length
          : 0,
      quarterClose: s ? { snapshotId: Number(s.id), quarterEnd: s.quarter_end, status: s.status as "draft" } : null,
    };
  });
}
