import { AppError } from "../../errors";
import { EntityModel } from "../../models/entity";
import { PortfolioModel } from "../../models/portfolio";
import { SnapshotModel } from "../../models/snapshot";
import { backtestAt, rollingBacktest } from "../../../shared/backtest/exceptions";
import { rollOffs } from "../../../shared/backtest/forecast";
import { deskBacktest } from "../../../shared/backtest/frtb-desk";
import { deskPla } from "../../../shared/backtest/pla";
import { capitalAddOn } from "../../../shared/backtest/capital";
import { ENGINE_VERSION } from "../../../shared/backtest/version";
import { withMissingBusinessDays } from "../../../shared/backtest/window";
import { countOpenFindings } from "../findings/findings.service";
import { loadSeries } from "../observations/observations.repository";
import { loadPortfolioContext, type PortfolioContext } from "./portfolio-context";
import { reviewsByDate } from "../reviews/reviews.read";
import { EngineInputError } from "../../../shared/backtest/errors";
import type { Observation } from "../../../shared/backtest/types";
import type { BacktestResponse, DeskResult, OverviewItem, RollingRowDto } from "../../../shared/schemas/backtest";

function latestDateOf(ctx: PortfolioContext): string {
  if (ctx.series.length === 0) {
    throw new AppError(
      404,
      "no_data",
      `No daily data for ${ctx.portfolio.code} yet. An analyst uploads it under Data.`,
    );
  }
  return ctx.series[ctx.series.length - 1].date;
}

/** FRTB: desk-level backtesting and the P&L attribution test over the last 250 days (MAR32). */
export async function deskResults(ctx: PortfolioContext, asOf: string): Promise<DeskResult[]> {
  if (ctx.entity.regime !== "frtb" || ctx.portfolio.level !== "top") return [];
  const desks = await PortfolioModel.findAll({
    where: { entityId: ctx.entity.id, level: "desk" },
    order: [["code", "ASC"]],
  });
  const results: DeskResult[] = [];
  for (const desk of desks) {
    // MAR32.5(2): a desk's unreported business day counts as an exception too.
    const series = withMissingBusinessDays((await loadSeries(desk.id, undefined, asOf)) as Observation[], ctx.holidays);
    if (series.length === 0) continue;
    const bt = deskBacktest(series, asOf);
    const pla = deskPla(series, asOf);
    results.push({
      portfolio: desk.code,
      name: desk.name,
      backtest: bt,
      pla,
      plaUnavailable: pla ? null : "No risk-theoretical P&L (rtpl) reported for this desk.",
    });
  }
  return results;
}

/** The backtest of one portfolio at an as-of date (default: its latest day), from current data and approved exclusions. */
export async function getBacktest(code: string, asOf?: string): Promise<BacktestResponse> {
  const ctx = await loadPortfolioContext(code);
  const latestDate = latestDateOf(ctx);
  const at = asOf ?? latestDate;
  const opts = {
    regime: ctx.entity.regime,
    pnlBasis: ctx.entity.pnlBasis,
    asOf: at,
    excludedDates: ctx.excludedDates,
    qualitativeAddend: ctx.entity.qualitativeAddend,
  };
  const result = backtestAt(ctx.series, opts);
  const reviews = await reviewsByDate(
    ctx.portfolio.id,
    result.exceptionDays.map((d) => d.date),
  );
  return {
    ...result,
    portfolio: { code: ctx.portfolio.code, name: ctx.portfolio.name, level: ctx.portfolio.level },
    entity: { code: ctx.entity.code, name: ctx.entity.name, currency: ctx.entity.currency },
    latestDate,
    exceptionDays: result.exceptionDays.map((d) => ({ ...d, review: reviews.get(d.date) ?? null })),
    rollOffs: rollOffs(ctx.series, opts, ctx.holidays),
    desks: await deskResults(ctx, at),
    engineVersion: ENGINE_VERSION,
  };
}

export async function getRolling(code: string, range: { from?: string; to?: string }): Promise<RollingRowDto[]> {
  const ctx = await loadPortfolioContext(code);
  if (ctx.series.length === 0) return [];
  return rollingBacktest(ctx.series, {
    regime: ctx.entity.regime,
    pnlBasis: ctx.entity.pnlBasis,
    excludedDates: ctx.excludedDates,
    from: range.from,
    to: range.to,
  });
}

/** The capital add-on, or null when the data holds no capital input (e.g. no ES for FRTB). */
function addOnOrNull(series: Observation[], opts: Parameters<typeof capitalAddOn>[1]): number | null {
  try {
    return capitalAddOn(series, opts);
  } catch (err) {
    if (err instanceof EngineInputError) return null;
    throw err;
  }
}

/** The entity's newest quarter snapshot, for the Overview's quarter-close column. */
async function newestSnapshotOf(entityId: number): Promise<OverviewItem["quarterClose"]> {
  const s = await SnapshotModel.findOne({
    where: { entityId },
    order: [["quarterEnd", "DESC"]],
    attributes: ["id", "quarterEnd", "status"],
  });
  return s ? { snapshotId: s.id, quarterEnd: s.quarterEnd, status: s.status } : null;
}

/** Where each entity stands today: zone, count, multiplier, add-on, next roll-off, open work. */
export async function getOverview(): Promise<OverviewItem[]> {
  const entities = await EntityModel.findAll({ order: [["code", "ASC"]] });
  const items: OverviewItem[] = [];
  for (const entity of entities) {
    const portfolios = await PortfolioModel.findAll({ where: { entityId: entity.id } });
    const top = portfolios.find((p) => p.level === "top") ?? portfolios[0];
    const base: OverviewItem = {
      entity: entity.code,
      name: entity.name,
      regime: entity.regime,
      currency: entity.currency,
      portfolio: top?.code ?? null,
      asOf: null,
      complete: false,
      zone: null,
      zoneLabel: null,
      counted: null,
      plusFactor: null,
      multiplier: null,
      addOn: null,
      nextRollOff: null,
      openReviews: 0,
      openFindings: 0,
      quarterClose: await newestSnapshotOf(entity.id),
    };
    if (!top) {
      items.push(base);
      continue;
    }
    const ctx = await loadPortfolioContext(top.code);
    if (ctx.series.length === 0) {
      items.push(base);
      continue;
    }
    const asOf = ctx.series[ctx.series.length - 1].date;
    const opts = {
      regime: entity.regime,
      pnlBasis: entity.pnlBasis,
      asOf,
      excludedDates: ctx.excludedDates,
      qualitativeAddend: entity.qualitativeAddend,
    };
    const bt = backtestAt(ctx.series, opts);
    const reviews = await reviewsByDate(
      top.id,
      bt.exceptionDays.map((d) => d.date),
    );
    const counted = bt.exceptionDays.filter((d) => d.actual || d.hypothetical);
    const openReviews = counted.filter((d) => {
      const r = reviews.get(d.date);
      return !r || r.exclusionStatus === "requested";
    }).length;
    const offs = rollOffs(ctx.series, opts, ctx.holidays);
    const window = bt.window;
    items.push({
      ...base,
      asOf,
      complete: window.complete,
      zone: bt.zone,
      zoneLabel: bt.zoneLabel,
      counted: bt.exceptions.counted,
      plusFactor: bt.plusFactor,
      multiplier: bt.multiplier,
      addOn: addOnOrNull(ctx.series, {
        regime: entity.regime,
        asOf,
        count: bt.exceptions.counted,
        qualitativeAddend: entity.qualitativeAddend,
      }),
      nextRollOff: offs[0] ?? null,
      openReviews,
      openFindings: await countOpenFindings(
        portfolios.map((p) => p.id),
        window.start ?? asOf,
        asOf,
      ),
    });
  }
  return items;
}
