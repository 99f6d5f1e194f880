import { AppError, NotFoundError } from "../../errors";
import { EntityModel } from "../../models/entity";
import { PortfolioModel } from "../../models/portfolio";
import { whatIf } from "../../../shared/backtest/what-if";
import {
  contextOf,
  engineOptions,
  headlinePortfolio,
  noHeadlineError,
  type PortfolioContext,
} from "../figures/engine-inputs";
import {
  defaultForecastDate,
  forecastResponse,
  noDataError,
  storedByCode,
  type StoredForecast,
} from "../figures/stored-figures";
import type { ForecastResponse, WhatIfResponse, whatIfBodySchema } from "../../../shared/schemas/capital";
import { SnapshotModel } from "../../models/snapshot";
import { SIGNED_OFF, type SnapshotFigures } from "../../../shared/schemas/snapshot";
import { type CapitalHistoryItem } from "../../../shared/schemas/capital";
import { readsSignedOffOnly } from "../snapshots/snapshots.read";
import type { SignedIn } from "../../kit/actor";
import type { z } from "zod";

/** The entity's headline portfolio. */
async function headlineOf(code: string): Promise<{ entity: EntityModel; top: PortfolioModel }> {
  const entity = await EntityModel.findOne({ where: { code } });
  if (!entity) throw new NotFoundError(`No entity ${code}.`);
  const top = headlinePortfolio(await PortfolioModel.findAll({ where: { entityId: entity.id, level: "top" } }));
  if (!top) throw noHeadlineError(code);
  return { entity, top };
}

/** The headline portfolio with its current data, calendar and approved exclusions. */
async function headlineContext(code: string): Promise<{ ctx: PortfolioContext; latest: string }> {
  const { entity, top } = await headlineOf(code);
  const ctx = await contextOf(top, entity);
  if (ctx.series.length === 0) throw noDataError(top.code);
  return { ctx, latest: ctx.series[ctx.series.length - 1].date };
}

function refuseBeforeLatest(date: string, latest: string, portfolio: string): void {
  if (date < latest) {
    throw new AppError(
      422,
      "validation_failed",
      `The forecast date ${date} is before the as-of date ${latest}, the last day with data of ${portfolio}.`,
      { fields: { date: `On or after ${latest}` } },
    );
  }
}

/**
 * Where the entity's count may stand at a future date, and what the next exception would cost
 * today. The default date's forecast is the stored one; another date is computed.
 */
export async function getForecast(code: string, query: { date?: string }): Promise<ForecastResponse> {
  const { top } = await headlineOf(code);
  const stored = await storedByCode(top.code, ["forecast_json"]);
  if (!stored.asOf || !stored.forecast_json) throw noDataError(top.code);
  const forecast = JSON.parse(stored.forecast_json) as StoredForecast;
  const date = query.date ?? defaultForecastDate(stored.asOf);
  refuseBeforeLatest(date, stored.asOf, top.code);
  if (date === forecast.date) return forecast.response;
  const { ctx } = await headlineContext(code);
  return forecastResponse(ctx, date);
}

/** The figures with extra exceptions and VaR / stressed VaR scaled, against today's. */
export async function getWhatIf(code: string, body: z.output<typeof whatIfBodySchema>): Promise<WhatIfResponse> {
  const { ctx, latest } = await headlineContext(code);
  const asOf = body.asOf ?? latest;
  if (asOf > latest)
    throw new AppError(
      422,
      "validation_failed",
      `The data of ${ctx.portfolio.code} ends on ${latest}; choose that day or an earlier one.`,
      { fields: { asOf: `At most ${latest}` } },
    );
  const result = whatIf(ctx.series, {
    ...engineOptions(ctx.entity, asOf, ctx.excludedDates),
    extraExceptions: body.extraExceptions,
    varScale: body.varScale,
    svarScale: body.svarScale,
  });
  return { entity: ctx.entity.code, portfolio: ctx.portfolio.code, currency: ctx.entity.currency, asOf, ...result };
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
