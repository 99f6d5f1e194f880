/**
 * The engine's results, stored per portfolio (table portfolio_figures) and refreshed inside the
 * transaction of every write that changes them: an upload commit, an exception review or exclusion
 * decision, a holiday added or removed, an entity's settings or a portfolio's name changed, a
 * supervisory settings record approved. Each figure uses the settings record in force on its own
 * day (engine-inputs.ts, settingsAt), never the entity's current columns. A
 * reader reads the stored row and never sees figures that disagree with the data it could read
 * at the same moment, because the row and the data are committed together. Reads cost the same
 * whatever the length of the history.
 *
 * A portfolio without a row, or with one from another engine version, is computed on its first
 * read, in a transaction that holds its entity's portfolios like a writer does.
 */
import { QueryTypes, type Transaction } from "sequelize";
import { sequelize } from "../../db/sequelize";
import { lockPortfolios } from "../../db/portfolio-locks";
import type { EntityModel } from "../../models/entity";
import type { PortfolioModel } from "../../models/portfolio";
import { AppError, NotFoundError } from "../../errors";
import { backtestAt, rollingBacktest } from "../../../shared/backtest/exceptions";
import { rollOffs } from "../../../shared/backtest/forecast";
import { deskBacktest } from "../../../shared/backtest/frtb-desk";
import { deskPla } from "../../../shared/backtest/pla";
import { capitalInputsAt } from "../../../shared/backtest/capital";
import { capitalUnder, multipliersFor } from "../../../shared/backtest/determination";
import { plusFactorFor } from "../../../shared/backtest/regimes";
import type { PnlBasis } from "../../../shared/schemas/common";
import { EngineInputError } from "../../../shared/backtest/errors";
import { ENGINE_VERSION } from "../../../shared/backtest/version";
import { withMissingBusinessDays } from "../../../shared/backtest/window";
import { loadSeries } from "../observations/observations.repository";
import { refreshDeterminations } from "../determinations/determinations.store";
import type { BacktestResponse, DeskResult, OverviewItem, RollingRowDto } from "../../../shared/schemas/backtest";
import type { Observation } from "../../../shared/backtest/types";
import {
  approvedExclusions,
  contextOf,
  engineOptions,
  entityWithPortfolios,
  headlinePortfolio,
  settingsAt,
  startingPointFromStored,
  startingPointOf,
  storedStartingPoint,
  type PortfolioContext,
  type ReadIn,
  type StartingPoint,
  type StoredStartingPoint,
} from "./engine-inputs";

/** The engine-computed part of an entity's Overview line (the rest is read live: snapshots, findings). */
export type StoredOverview = Pick<
  OverviewItem,
  | "asOf"
  | "complete"
  | "zone"
  | "zoneLabel"
  | "counted"
  | "plusFactor"
  | "multiplier"
  | "addOn"
  | "nextRollOff"
  | "openReviews"
> & { windowStart: string | null };

export interface PortfolioFigures {
  asOf: string | null;
  /** The backtest at the latest day, without the reviews (they are attached on read). */
  backtest: BacktestResponse | null;
  rolling: RollingRowDto[];
  overview: StoredOverview | null;
  /** The headline book only: what the forecast and the what-if start from at the latest day. */
  start: StoredStartingPoint | null;
}

const orNull = <T>(compute: () => T): T | null => {
  try {
    return compute();
  } catch (err) {
    if (err instanceof EngineInputError) return null;
    throw err;
  }
};

/** FRTB: desk-level backtesting and the P&L attribution test over the last 250 days (MAR32). */
export async function deskResults(
  ctx: PortfolioContext,
  asOf: string,
  desks: readonly PortfolioModel[],
  read: ReadIn = {},
): Promise<DeskResult[]> {
  if (ctx.entity.regime !== "frtb" || ctx.portfolio.level !== "top") return [];
  const results: DeskResult[] = [];
  const deskList = [...desks].filter((d) => d.level === "desk").sort((a, b) => a.code.localeCompare(b.code));
  const exclusions = await approvedExclusions(
    deskList.map((d) => d.id),
    read,
  );
  for (const desk of deskList) {
    // MAR32.5(2): a desk's unreported business day counts as an exception too.
    const series = withMissingBusinessDays(
      (await loadSeries(desk.id, ctx.entity.regime, undefined, asOf, read.transaction)) as Observation[],
      ctx.holidays,
    );
    if (series.length === 0) continue;
    const pla = deskPla(series, asOf);
    results.push({
      portfolio: desk.code,
      name: desk.name,
      backtest: deskBacktest(series, asOf, exclusions.get(desk.id)),
      pla,
      plaUnavailable: pla ? null : "No risk-theoretical P&L (rtpl) reported for this desk.",
    });
  }
  return results;
}

/** The backtest response at a date (reviews left out: the caller attaches them). */
export async function backtestResponse(
  ctx: PortfolioContext,
  at: string,
  portfolios: readonly PortfolioModel[],
  read: ReadIn = {},
): Promise<BacktestResponse> {
  const latestDate = ctx.series[ctx.series.length - 1].date;
  const opts = engineOptions(ctx, at);
  const result = backtestAt(ctx.series, opts);
  // The multiplier under the settings in force that day: its addend and the supervisor's floor.
  const { multiplier } = multipliersFor(
    result.exceptions.counted,
    ctx.entity.regime,
    settingsAt(ctx, at),
    result.windowSize,
    result.plusFactor,
  );
  return {
    ...result,
    multiplier,
    portfolio: { code: ctx.portfolio.code, name: ctx.portfolio.name, level: ctx.portfolio.level },
    entity: { code: ctx.entity.code, name: ctx.entity.name, currency: ctx.entity.currency },
    latestDate,
    exceptionDays: result.exceptionDays.map((d) => ({ ...d, review: null })),
    rollOffs: rollOffs(ctx.series, opts, ctx.holidays),
    desks: await deskResults(ctx, at, portfolios, read),
    engineVersion: ENGINE_VERSION,
  };
}

/**
 * The rolling count of every date, each counted on the P&L basis in force that day: a basis change
 * from a date on changes the rows from that date and none before it.
 */
export function rollingUnderSettings(ctx: PortfolioContext): RollingRowDto[] {
  const basisOn = ctx.series.map((o) => settingsAt(ctx, o.date).pnlBasis);
  const byBasis = new Map<PnlBasis, RollingRowDto[]>();
  for (const basis of new Set(basisOn)) {
    byBasis.set(
      basis,
      rollingBacktest(ctx.series, { regime: ctx.entity.regime, pnlBasis: basis, excludedDates: ctx.excludedDates }),
    );
  }
  const [first] = byBasis.values();
  if (byBasis.size <= 1) return first ?? [];
  // Every basis's rows have the same dates, in the same order.
  return first.map((row, i) => byBasis.get(settingsAt(ctx, row.date).pnlBasis)![i]);
}

/** A fresh computation of everything stored for one portfolio (the property test compares it with the row). */
export async function computePortfolioFigures(
  portfolio: PortfolioModel,
  entity: EntityModel,
  portfolios: readonly PortfolioModel[],
  read: ReadIn = {},
): Promise<PortfolioFigures> {
  const ctx = await contextOf(portfolio, entity, read);
  if (ctx.series.length === 0) return { asOf: null, backtest: null, rolling: [], overview: null, start: null };
  const asOf = ctx.series[ctx.series.length - 1].date;
  const backtest = await backtestResponse(ctx, asOf, portfolios, read);
  const rolling = rollingUnderSettings(ctx);
  if (headlinePortfolio(portfolios)?.id !== portfolio.id)
    return { asOf, backtest, rolling, overview: null, start: null };
  const start = startingPointOf(ctx, asOf);

  // An exception is open while nobody reviewed it or its exclusion request waits for the CRO.
  const counted = backtest.exceptionDays.filter((d) => d.actual || d.hypothetical).map((d) => d.date);
  const settled = counted.length
    ? await sequelize.query<{ d: string }>(
        `SELECT DATE_FORMAT(business_date, '%Y-%m-%d') AS d FROM exception_reviews
          WHERE portfolio_id = :pid AND business_date IN (:dates) AND exclusion_status <> 'requested'${read.transaction ? " LOCK IN SHARE MODE" : ""}`,
        { replacements: { pid: portfolio.id, dates: counted }, type: QueryTypes.SELECT, transaction: read.transaction },
      )
    : [];
  return {
    asOf,
    backtest,
    rolling,
    overview: {
      asOf,
      windowStart: backtest.window.start,
      complete: backtest.window.complete,
      zone: backtest.zone,
      zoneLabel: backtest.zoneLabel,
      counted: backtest.exceptions.counted,
      plusFactor: backtest.plusFactor,
      multiplier: backtest.multiplier,
      // The add-on the plus factor causes under the settings in force on the day (addends and floor).
      addOn: orNull(
        () =>
          capitalUnder(
            capitalInputsAt(ctx.series, entity.regime, asOf),
            entity.regime,
            plusFactorFor(backtest.exceptions.counted, entity.regime),
            settingsAt(ctx, asOf),
          ).addOn,
      ),
      nextRollOff: backtest.rollOffs[0] ?? null,
      openReviews: counted.length - settled.length,
    },
    start: start ? storedStartingPoint(start) : null,
  };
}

/**
 * Recomputes and stores the figures of every portfolio of these entities, and the entities'
 * quarterly determinations, inside the caller's transaction (which holds their portfolio rows, so
 * writers take turns). Call it from every write that changes what the engine is given.
 */
export async function refreshEntityFigures(entityIds: Iterable<number>, transaction: Transaction): Promise<void> {
  for (const entityId of [...new Set(entityIds)].sort((a, b) => a - b)) {
    const { entity, portfolios } = await entityWithPortfolios(entityId, { transaction });
    await lockPortfolios(
      portfolios.map((p) => p.id),
      "update",
      transaction,
    );
    for (const portfolio of portfolios) {
      const figures = await computePortfolioFigures(portfolio, entity, portfolios, { transaction });
      await sequelize.query(
        `INSERT INTO portfolio_figures
           (portfolio_id, entity_id, engine_version, as_of, backtest_json, rolling_json, overview_json, start_json,
            refreshed_at)
         VALUES (:pid, :eid, :engine, :asOf, :backtest, :rolling, :overview, :start, NOW(3))
         ON DUPLICATE KEY UPDATE entity_id = VALUES(entity_id), engine_version = VALUES(engine_version),
           as_of = VALUES(as_of), backtest_json = VALUES(backtest_json), rolling_json = VALUES(rolling_json),
           overview_json = VALUES(overview_json), start_json = VALUES(start_json), refreshed_at = NOW(3)`,
        {
          replacements: {
            pid: portfolio.id,
            eid: entity.id,
            engine: ENGINE_VERSION,
            asOf: figures.asOf,
            backtest: figures.backtest ? JSON.stringify(figures.backtest) : null,
            rolling: JSON.stringify(figures.rolling),
            overview: figures.overview ? JSON.stringify(figures.overview) : null,
            start: figures.start ? JSON.stringify(figures.start) : null,
          },
          transaction,
        },
      );
    }
    // The determinations of the multiplier in force (server/modules/determinations), in the same transaction.
    await refreshDeterminations(entityId, transaction);
  }
}

/** The entities these portfolios belong to. */
export async function entitiesOfPortfolios(
  portfolioIds: readonly number[],
  transaction?: Transaction,
): Promise<number[]> {
  if (portfolioIds.length === 0) return [];
  const rows = await sequelize.query<{ e: number }>(
    "SELECT DISTINCT entity_id AS e FROM portfolios WHERE id IN (:ids)",
    { replacements: { ids: [...portfolioIds] }, type: QueryTypes.SELECT, transaction },
  );
  return rows.map((r) => Number(r.e));
}

// ---- reads ------------------------------------------------------------------------------------

interface StoredRow {
  portfolio_id: number;
  entity_id: number;
  engine_version: string | null;
  as_of: string | null;
  backtest_json: string | null;
  rolling_json: string | null;
  overview_json: string | null;
}

type Column = "backtest_json" | "rolling_json" | "overview_json";

/** Stored columns of one portfolio by code; computes and stores them first when missing or from another engine. */
export async function storedByCode(
  code: string,
  columns: Column[],
): Promise<{ portfolioId: number; entityId: number; asOf: string | null } & Partial<Record<Column, string | null>>> {
  const read = () =>
    sequelize.query<StoredRow & { pid: number; eid: number }>(
      `SELECT p.id AS pid, p.entity_id AS eid, f.engine_version, DATE_FORMAT(f.as_of, '%Y-%m-%d') AS as_of, ${columns.map((c) => `f.${c}`).join(", ")}
         FROM portfolios p LEFT JOIN portfolio_figures f ON f.portfolio_id = p.id
        WHERE p.code = :code`,
      { replacements: { code }, type: QueryTypes.SELECT },
    );
  let [row] = await read();
  if (!row) throw new NotFoundError(`No portfolio ${code}.`);
  if (row.engine_version !== ENGINE_VERSION) {
    await fillMissing([Number(row.eid)]);
    [row] = await read();
  }
  const out: { portfolioId: number; entityId: number; asOf: string | null } & Partial<Record<Column, string | null>> = {
    portfolioId: Number(row.pid),
    entityId: Number(row.eid),
    asOf: row.as_of,
  };
  for (const c of columns) out[c] = row[c];
  return out;
}

/** Computes the figures of entities whose rows are missing (a first read after the upgrade, or a new portfolio). */
export async function fillMissing(entityIds: number[]): Promise<void> {
  await sequelize.transaction((transaction) => refreshEntityFigures(entityIds, transaction));
}

/** The headline row of every entity, with what the Overview reads live beside it. */
export async function storedOverviewRows(): Promise<
  {
    entityId: number;
    code: string;
    name: string;
    regime: OverviewItem["regime"];
    currency: string;
    portfolioId: number | null;
    portfolio: string | null;
    overview: StoredOverview | null;
    stale: boolean;
  }[]
> {
  const rows = await sequelize.query<{
    eid: number;
    code: string;
    name: string;
    regime: OverviewItem["regime"];
    currency: string;
    pid: number | null;
    pcode: string | null;
    engine_version: string | null;
    overview_json: string | null;
  }>(
    `SELECT e.id AS eid, e.code, e.name, e.regime, e.currency, p.id AS pid, p.code AS pcode, f.engine_version, f.overview_json
       FROM entities e
       LEFT JOIN portfolios p ON p.id = (SELECT t.id FROM portfolios t WHERE t.entity_id = e.id AND t.level = 'top' ORDER BY t.code LIMIT 1)
       LEFT JOIN portfolio_figures f ON f.portfolio_id = p.id
      ORDER BY e.code`,
    { type: QueryTypes.SELECT },
  );
  return rows.map((r) => ({
    entityId: Number(r.eid),
    code: r.code,
    name: r.name,
    regime: r.regime,
    currency: r.currency,
    portfolioId: r.pid === null ? null : Number(r.pid),
    portfolio: r.pcode,
    overview: r.overview_json ? (JSON.parse(r.overview_json) as StoredOverview) : null,
    stale: r.pid !== null && r.engine_version !== ENGINE_VERSION,
  }));
}

/**
 * The entity's headline book and the starting point stored for it at its latest day (computed and
 * stored first when missing or from another engine): one indexed read, whatever the history.
 */
export async function storedStart(
  entity: EntityModel,
): Promise<{ portfolio: { id: number; code: string } | null; start: StartingPoint | null }> {
  const read = () =>
    sequelize.query<{
      pid: number;
      pcode: string;
      engine_version: string | null;
      as_of: string | null;
      start_json: string | null;
    }>(
      `SELECT p.id AS pid, p.code AS pcode, f.engine_version, DATE_FORMAT(f.as_of, '%Y-%m-%d') AS as_of, f.start_json
         FROM portfolios p LEFT JOIN portfolio_figures f ON f.portfolio_id = p.id
        WHERE p.entity_id = :eid AND p.level = 'top'
        ORDER BY p.code LIMIT 1`,
      { replacements: { eid: entity.id }, type: QueryTypes.SELECT },
    );
  let [row] = await read();
  if (!row) return { portfolio: null, start: null };
  if (row.engine_version !== ENGINE_VERSION || (row.as_of !== null && row.start_json === null)) {
    await fillMissing([entity.id]);
    [row] = await read();
  }
  return {
    portfolio: { id: Number(row.pid), code: row.pcode },
    start: row.start_json
      ? startingPointFromStored(JSON.parse(row.start_json) as StoredStartingPoint, entity.regime)
      : null,
  };
}

export function noDataError(code: string): AppError {
  return new AppError(404, "no_data", `No daily data for ${code} yet. An analyst uploads it under Data.`);
}
