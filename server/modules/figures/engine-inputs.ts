/**
 * The one step from the database to the engine and back: which portfolio heads an entity, what
 * the engine is given for a portfolio (its current days, calendar and approved exclusions), the
 * engine's options from the entity's settings, a quarter's last business day and whether its data
 * reaches it, and rounding to cents. Every figure the server stores or shows goes through here.
 */
import { QueryTypes, type Transaction } from "sequelize";
import { sequelize } from "../../db/sequelize";
import { PortfolioModel } from "../../models/portfolio";
import { EntityModel } from "../../models/entity";
import { AppError, NotFoundError } from "../../errors";
import { loadSeries, loadSeriesTail } from "../observations/observations.repository";
import type { Observation } from "../../../shared/backtest/types";
import type { BacktestOptions } from "../../../shared/backtest/types";
import { getRegime } from "../../../shared/backtest/regimes";
import { withMissingBusinessDays } from "../../../shared/backtest/window";
import { addBusinessDays, isBusinessDay } from "../../../shared/backtest/calendar";
import { quarterLabel } from "../../../shared/backtest/quarters";
import { settingsOn, type DatedSettings, type DeterminationOptions } from "../../../shared/backtest/determination";
import { startingSeries, STARTING_POINT_OBSERVATIONS } from "../../../shared/backtest/forecast";
import { approvedSettings, fallbackSettings } from "../settings/settings.read";

export interface PortfolioContext {
  portfolio: PortfolioModel;
  entity: EntityModel;
  holidays: Set<string>;
  series: Observation[];
  /** Dates whose exception the supervisor agreed to disregard. */
  excludedDates: Set<string>;
  /** The entity's approved settings records, oldest first: a figure for a date uses the one in force that day. */
  settings: DatedSettings[];
  /** Stands in before the first record (the entity's own columns). */
  fallback: DatedSettings;
}

/**
 * How a read inside a writing transaction sees the data: through that transaction, with locking
 * reads (the newest committed rows and this transaction's own, whatever its snapshot saw first).
 */
export interface ReadIn {
  transaction?: Transaction;
}

const lockOf = (t?: Transaction) => (t ? { transaction: t, lock: t.LOCK.SHARE } : {});

export async function findPortfolio(code: string): Promise<{ portfolio: PortfolioModel; entity: EntityModel }> {
  const portfolio = await PortfolioModel.findOne({ where: { code }, include: [{ model: EntityModel, as: "entity" }] });
  if (!portfolio) throw new NotFoundError(`No portfolio ${code}.`);
  return { portfolio, entity: (portfolio as unknown as { entity: EntityModel }).entity };
}

/** The portfolio whose figures are the entity's headline: its top-of-house book (the first by code if several). */
export function headlinePortfolio<P extends { level: string; code: string }>(portfolios: readonly P[]): P | null {
  return [...portfolios].filter((p) => p.level === "top").sort((a, b) => a.code.localeCompare(b.code))[0] ?? null;
}

export function noHeadlineError(entityCode: string): NotFoundError {
  return new NotFoundError(`${entityCode} has no top-of-house portfolio; an admin adds one under Admin › Entities.`);
}

/** Everything the engine needs for one portfolio: its current data, its calendar and its approved exclusions. */
export async function loadPortfolioContext(code: string): Promise<PortfolioContext> {
  const { portfolio, entity } = await findPortfolio(code);
  return contextOf(portfolio, entity);
}

export async function contextOf(
  portfolio: PortfolioModel,
  entity: EntityModel,
  read: ReadIn & { from?: string; to?: string } = {},
): Promise<PortfolioContext> {
  const [holidays, series, excluded, settings] = await Promise.all([
    holidaysOf(entity.id, read),
    loadSeries(portfolio.id, entity.regime, read.from, read.to, read.transaction),
    sequelize.query<{ d: string }>(
      `SELECT DATE_FORMAT(business_date, '%Y-%m-%d') AS d FROM exception_reviews
        WHERE portfolio_id = :pid AND exclusion_status = 'approved'${read.transaction ? " LOCK IN SHARE MODE" : ""}`,
      { replacements: { pid: portfolio.id }, type: QueryTypes.SELECT, transaction: read.transaction },
    ),
    approvedSettings(entity.id, read.transaction),
  ]);
  return {
    portfolio,
    entity,
    holidays,
    // FRTB: a business day never reported counts as an exception (MAR32.5(2)), so it must be in the window.
    series: getRegime(entity.regime).missingCountsAsException ? withMissingBusinessDays(series, holidays) : series,
    excludedDates: new Set(excluded.map((r) => r.d)),
    settings,
    fallback: fallbackSettings(entity),
  };
}

/** Each portfolio's approved exclusions (dates whose exception the supervisor agreed to disregard). */
export async function approvedExclusions(
  portfolioIds: readonly number[],
  read: ReadIn = {},
): Promise<Map<number, Set<string>>> {
  const out = new Map<number, Set<string>>(portfolioIds.map((id) => [id, new Set<string>()]));
  if (portfolioIds.length === 0) return out;
  const rows = await sequelize.query<{ pid: number; d: string }>(
    `SELECT portfolio_id AS pid, DATE_FORMAT(business_date, '%Y-%m-%d') AS d FROM exception_reviews
      WHERE portfolio_id IN (:ids) AND exclusion_status = 'approved'${read.transaction ? " LOCK IN SHARE MODE" : ""}`,
    { replacements: { ids: portfolioIds }, type: QueryTypes.SELECT, transaction: read.transaction },
  );
  for (const r of rows) out.get(Number(r.pid))?.add(r.d);
  return out;
}

/** The settings record in force on a date (never the entity's current columns once records exist). */
export function settingsAt(ctx: Pick<PortfolioContext, "settings" | "fallback">, date: string): DatedSettings {
  return settingsOn(ctx.settings, date) ?? ctx.fallback;
}

export async function holidaysOf(entityId: number, read: ReadIn = {}): Promise<Set<string>> {
  const rows = await sequelize.query<{ d: string }>(
    `SELECT DATE_FORMAT(date, '%Y-%m-%d') AS d FROM holidays WHERE entity_id = :id${read.transaction ? " LOCK IN SHARE MODE" : ""}`,
    { replacements: { id: entityId }, type: QueryTypes.SELECT, transaction: read.transaction },
  );
  return new Set(rows.map((r) => r.d));
}

/** The entity and its portfolios (by code), read inside the caller's transaction when given. */
export async function entityWithPortfolios(
  entityId: number,
  read: ReadIn = {},
): Promise<{ entity: EntityModel; portfolios: PortfolioModel[] }> {
  const entity = await EntityModel.findByPk(entityId, lockOf(read.transaction));
  if (!entity) throw new NotFoundError(`No entity #${entityId}.`);
  const portfolios = await PortfolioModel.findAll({
    where: { entityId },
    order: [["code", "ASC"]],
    ...lockOf(read.transaction),
  });
  return { entity, portfolios };
}

/** The engine's options for a portfolio at a date, from the settings in force that day. */
export function engineOptions(ctx: PortfolioContext, asOf: string): BacktestOptions & { qualitativeAddend: number } {
  const settings = settingsAt(ctx, asOf);
  return {
    regime: ctx.entity.regime,
    pnlBasis: settings.pnlBasis,
    asOf,
    excludedDates: ctx.excludedDates,
    qualitativeAddend: settings.qualitativeAddend,
  };
}

/** An amount rounded to the cent, as every stored and shown capital figure is. */
export function cents(amount: number): number {
  return Math.round(amount * 100) / 100;
}

/** The last business day of a quarter (its end, or the business day before it). */
export function quarterLastBusinessDay(quarterEnd: string, holidays: ReadonlySet<string>): string {
  return isBusinessDay(quarterEnd, holidays as Set<string>)
    ? quarterEnd
    : addBusinessDays(quarterEnd, -1, holidays as Set<string>);
}

/**
 * A quarter's data is complete when the portfolio reported on its last business day (or later).
 * Refuses with 422 otherwise: figures for it would be a guess.
 */
export function assertQuarterComplete(ctx: PortfolioContext, quarterEnd: string): string {
  const lastBusinessDay = quarterLastBusinessDay(quarterEnd, ctx.holidays);
  const reported = [...ctx.series]
    .filter((o) => o.date <= quarterEnd)
    .reverse()
    .find((o) => o.actualPnl !== null || o.hypotheticalPnl !== null || o.var99 !== null);
  if (!reported || reported.date < lastBusinessDay) {
    throw new AppError(
      422,
      "quarter_data_incomplete",
      `${ctx.portfolio.code} has no daily data for ${lastBusinessDay}, the last business day of ${quarterLabel(quarterEnd)}${reported ? ` (its data ends on ${reported.date})` : ""}. Upload it under Data first.`,
    );
  }
  return lastBusinessDay;
}

/**
 * What the forecast, the what-if and capital on a date read at a date (docs/rules.md#forecast):
 * the last 250 observations on or before it (`startingSeries`), and of the calendar and the
 * exclusions only what can touch them; the settings records are all kept (a handful per entity).
 */
export interface StartingPoint {
  /** The last day with data on or before the date asked for. */
  asOf: string;
  series: Observation[];
  options: DeterminationOptions;
}

/** A starting point as portfolio_figures.start_json keeps it (amounts that are null are left out). */
export interface StoredStartingPoint {
  asOf: string;
  series: Partial<Observation>[];
  holidays: string[];
  excludedDates: string[];
  settings: DatedSettings[];
  fallback: DatedSettings;
}

function startingPointFrom(
  series: readonly Observation[],
  at: string,
  regime: EntityModel["regime"],
  holidays: ReadonlySet<string>,
  excludedDates: ReadonlySet<string>,
  settings: DatedSettings[],
  fallback: DatedSettings,
): StartingPoint | null {
  const kept = startingSeries(series, at);
  if (kept.length === 0) return null;
  const first = kept[0].date;
  const last = kept[kept.length - 1].date;
  return {
    asOf: last,
    series: kept,
    options: {
      regime,
      // Only days from the first kept one on: the projection runs forward from the last day.
      holidays: new Set([...holidays].filter((d) => d >= first).sort()),
      excludedDates: new Set([...excludedDates].filter((d) => d >= first && d <= last).sort()),
      settings,
      fallback,
    },
  };
}

/** The starting point at `at` from a portfolio's whole context (a write computes it with the stored figures). */
export function startingPointOf(ctx: PortfolioContext, at: string): StartingPoint | null {
  return startingPointFrom(
    ctx.series,
    at,
    ctx.entity.regime,
    ctx.holidays,
    ctx.excludedDates,
    ctx.settings,
    ctx.fallback,
  );
}

/**
 * The starting point at any date, read from the database: the last 250 days on or before it (one
 * backwards range read of the index), the entity's calendar from the first of them on, the
 * approved exclusions among them, the settings records. The read does not grow with the history.
 */
export async function loadStartingPoint(
  entity: EntityModel,
  portfolioId: number,
  at: string,
): Promise<StartingPoint | null> {
  const tail = await loadSeriesTail(portfolioId, entity.regime, at, STARTING_POINT_OBSERVATIONS);
  if (tail.length === 0) return null;
  const first = tail[0].date;
  const [holidays, excluded, settings] = await Promise.all([
    sequelize.query<{ d: string }>(
      "SELECT DATE_FORMAT(date, '%Y-%m-%d') AS d FROM holidays WHERE entity_id = :id AND date >= :first",
      { replacements: { id: entity.id, first }, type: QueryTypes.SELECT },
    ),
    sequelize.query<{ d: string }>(
      `SELECT DATE_FORMAT(business_date, '%Y-%m-%d') AS d FROM exception_reviews
        WHERE portfolio_id = :pid AND exclusion_status = 'approved' AND business_date BETWEEN :first AND :at`,
      { replacements: { pid: portfolioId, first, at }, type: QueryTypes.SELECT },
    ),
    approvedSettings(entity.id),
  ]);
  const holidaySet = new Set(holidays.map((r) => r.d));
  // FRTB: a business day never reported counts as an exception (MAR32.5(2)); the 250 stored days
  // with the missing ones between them always hold the window.
  const series = getRegime(entity.regime).missingCountsAsException ? withMissingBusinessDays(tail, holidaySet) : tail;
  return startingPointFrom(
    series,
    at,
    entity.regime,
    holidaySet,
    new Set(excluded.map((r) => r.d)),
    settings,
    fallbackSettings(entity),
  );
}

/** The stored form: plain arrays, and only the amounts a day has. */
export function storedStartingPoint(p: StartingPoint): StoredStartingPoint {
  return {
    asOf: p.asOf,
    series: p.series.map((o) => {
      const out: Partial<Observation> = {};
      for (const [k, v] of Object.entries(o) as [keyof Observation, unknown][])
        if (k !== ("version" as keyof Observation) && v !== null && v !== undefined)
          (out as Record<string, unknown>)[k] = v;
      return out;
    }),
    holidays: [...p.options.holidays],
    excludedDates: [...(p.options.excludedDates ?? [])],
    settings: [...p.options.settings],
    fallback: p.options.fallback,
  };
}

export function startingPointFromStored(s: StoredStartingPoint, regime: EntityModel["regime"]): StartingPoint {
  return {
    asOf: s.asOf,
    series: s.series.map((o) => ({
      ...o,
      date: o.date!,
      actualPnl: o.actualPnl ?? null,
      hypotheticalPnl: o.hypotheticalPnl ?? null,
      var99: o.var99 ?? null,
    })),
    options: {
      regime,
      holidays: new Set(s.holidays),
      excludedDates: new Set(s.excludedDates),
      settings: s.settings,
      fallback: s.fallback,
    },
  };
}
