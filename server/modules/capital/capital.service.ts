import { AppError, NotFoundError } from "../../errors";
import { EntityModel } from "../../models/entity";
import { PortfolioModel } from "../../models/portfolio";
import { SnapshotModel } from "../../models/snapshot";
import { backtestAt } from "../../../shared/backtest/exceptions";
import { forecastAt } from "../../../shared/backtest/forecast";
import { whatIf } from "../../../shared/backtest/what-if";
import { marginalCostOfNextException } from "../../../shared/backtest/capital";
import { EngineInputError } from "../../../shared/backtest/errors";
import { loadPortfolioContext, type PortfolioContext } from "../backtest/portfolio-context";
import type { ForecastResponse, WhatIfResponse, whatIfBodySchema } from "../../../shared/schemas/capital";
import { SIGNED_OFF, type SnapshotFigures } from "../../../shared/schemas/snapshot";
import { quarterEndOf } from "../../../shared/backtest/quarters";
import { type CapitalHistoryItem } from "../../../shared/schemas/capital";
import { readsSignedOffOnly } from "../snapshots/snapshots.read";
import type { SignedIn } from "../../kit/actor";
import type { z } from "zod";

/** The entity's top-of-house portfolio with its current data, calendar and approved exclusions. */
async function topOf(code: string): Promise<{ entity: EntityModel; ctx: PortfolioContext; latest: string }> {
  const entity = await EntityModel.findOne({ where: { code } });
  if (!entity) throw new NotFoundError(`No entity ${code}.`);
  const top = await PortfolioModel.findOne({ where: { entityId: entity.id, level: "top" }, order: [["code", "ASC"]] });
  if (!top) throw new NotFoundError(`${code} has no top-of-house portfolio; an admin adds one under Admin › Entities.`);
  const ctx = await loadPortfolioContext(top.code);
  if (ctx.series.length === 0)
    throw new AppError(404, "no_data", `No daily data for ${top.code} yet. An analyst uploads it under Data.`);
  return { entity, ctx, latest: ctx.series[ctx.series.length - 1].date };
}

/** The current quarter's end, or the next one when the data already reaches it. */
function defaultForecastDate(latest: string): string {
  const end = quarterEndOf(new Date().toISOString().slice(0, 10));
  if (end > latest) return end;
  const next = new Date(`${latest}T00:00:00Z`);
  next.setUTCDate(next.getUTCDate() + 1);
  return quarterEndOf(next.toISOString().slice(0, 10));
}

const orNull = <T>(compute: () => T): T | null => {
  try {
    return compute();
  } catch (err) {
    if (err instanceof EngineInputError) return null;
    throw err;
  }
};

/** Where the entity's count may stand at a future date, and what the next exception would cost today. */
export async function getForecast(code: string, query: { date?: string }): Promise<ForecastResponse> {
  const { entity, ctx, latest } = await topOf(code);
  const opts = {
    regime: entity.regime,
    pnlBasis: entity.pnlBasis,
    asOf: latest,
    excludedDates: ctx.excludedDates,
    qualitativeAddend: entity.qualitativeAddend,
  };
  const date = query.date ?? defaultForecastDate(latest);
  if (date < latest) {
    throw new AppError(
      422,
      "validation_failed",
      `The forecast date ${date} is before the as-of date ${latest}, the last day with data of ${ctx.portfolio.code}.`,
      { fields: { date: `On or after ${latest}` } },
    );
  }
  const forecast = forecastAt(ctx.series, { ...opts, date, holidays: ctx.holidays });
  const today = backtestAt(ctx.series, opts);
  return {
    entity: entity.code,
    portfolio: ctx.portfolio.code,
    regime: entity.regime,
    currency: entity.currency,
    ...forecast,
    nextExceptionCost: orNull(() =>
      marginalCostOfNextException(ctx.series, {
        regime: entity.regime,
        asOf: latest,
        count: today.exceptions.counted,
        qualitativeAddend: entity.qualitativeAddend,
      }),
    ),
    today: {
      counted: today.exceptions.counted,
      zone: today.zone,
      plusFactor: today.plusFactor,
      multiplier: today.multiplier,
      windowComplete: today.window.complete,
    },
  };
}

/** The figures with extra exceptions and VaR / stressed VaR scaled (docs/rules.md#what-if), against today's. */
export async function getWhatIf(code: string, body: z.output<typeof whatIfBodySchema>): Promise<WhatIfResponse> {
  const { entity, ctx, latest } = await topOf(code);
  const asOf = body.asOf ?? latest;
  if (asOf > latest)
    throw new AppError(
      422,
      "validation_failed",
      `The data of ${ctx.portfolio.code} ends on ${latest}; choose that day or an earlier one.`,
      { fields: { asOf: `At most ${latest}` } },
    );
  const result = whatIf(ctx.series, {
    regime: entity.regime,
    pnlBasis: entity.pnlBasis,
    asOf,
    excludedDates: ctx.excludedDates,
    qualitativeAddend: entity.qualitativeAddend,
    extraExceptions: body.extraExceptions,
    varScale: body.varScale,
    svarScale: body.svarScale,
  });
  return { entity: entity.code, portfolio: ctx.portfolio.code, currency: entity.currency, asOf, ...result };
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
