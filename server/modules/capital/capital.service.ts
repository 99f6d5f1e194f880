import { AppError } from "../../errors";
import { forecastAt } from "../../../shared/backtest/forecast";
import { whatIfFromCount } from "../../../shared/backtest/what-if";
import { capitalInputsAt } from "../../../shared/backtest/capital";
import { addBusinessDays } from "../../../shared/backtest/calendar";
import { capitalUnder, indicativeAt, multipliersFor, settingsInForce } from "../../../shared/backtest/determination";
import { EngineInputError } from "../../../shared/backtest/errors";
import { zoneFor } from "../../../shared/backtest/regimes";
import { determinationInForce, signedOffDetermination } from "../determinations/determinations.store";
import { bitesFrom } from "../determinations/determinations.service";
import { loadStartingPoint, noHeadlineError } from "../figures/engine-inputs";
import { noDataError, storedStart } from "../figures/stored-figures";
import type { EntityModel } from "../../models/entity";
import type { ForecastResponse, WhatIfResponse } from "../../../shared/schemas/capital";
import type { DeterminationDto } from "../../../shared/schemas/determination";
import type { SessionUser } from "../../../shared/schemas/auth";
import { SIGNED_OFF } from "../../../shared/schemas/snapshot";
import { quarterEndOf, quarterLabel } from "../../../shared/backtest/quarters";
import type { CapitalHistoryItem } from "../../../shared/schemas/capital";
import { SNAPSHOT_HEADLINE_COLUMNS, SnapshotModel } from "../../models/snapshot";
import { sequelize } from "../../db/sequelize";
import { readsSignedOffOnly } from "../snapshots/snapshots.read";
import type { SignedIn } from "../../kit/actor";
import type { z } from "zod";
import { entityByCode } from "../../kit/lookups";
import type { whatIfBodySchema } from "../../../shared/schemas/capital";
import type { DatedSettings } from "../../../shared/backtest/determination";

/** Treasury reads approved figures only: its forecast and what-if start from a signed-off determination. */
const readsApprovedOnly = (viewer: SessionUser) => viewer.role === "treasury";

/**
 * Where the figures start: for the reporting office, the starting point stored with the entity's
 * top-of-house portfolio at its latest day and the settings in force then; for treasury, the
 * latest signed-off determination (its count, its settings, the 250 days up to its as-of date).
 * Either way the read is a few indexed rows and 250 days, whatever the length of the history.
 */
async function startingPoint(code: string, viewer: SessionUser) {
  const entity = await entityByCode(code);
  const { portfolio, start: latestStart } = await storedStart(entity);
  if (!portfolio) throw noHeadlineError(code);
  if (!latestStart) throw noDataError(portfolio.code);
  const latest = latestStart.asOf;
  if (!readsApprovedOnly(viewer)) {
    const indicative = indicativeAt(latestStart.series, latest, latestStart.options);
    return {
      entity,
      portfolio,
      start: latestStart,
      asOf: latest,
      latest,
      counted: indicative.counted,
      windowComplete: indicative.windowComplete,
      settings: settingsInForce(latestStart.options, latest),
      determination: undefined as DeterminationDto | undefined,
      startsFrom: { kind: "current" as const, quarterEnd: null, asOf: latest, status: null },
    };
  }
  const det = await signedOffDetermination(entity);
  if (!det) {
    throw new AppError(
      404,
      "no_approved_determination",
      `No quarter of ${code} is signed off yet, so there is no approved determination: treasury's forecast and what-if start from the latest approved one. They will once the CRO approves a quarter.`,
    );
  }
  return {
    entity,
    portfolio,
    start: det.asOf === latest ? latestStart : await startAt(entity, portfolio, det.asOf),
    asOf: det.asOf,
    latest,
    counted: det.counted,
    windowComplete: det.windowComplete,
    settings: det.settings as DatedSettings,
    determination: det,
    startsFrom: {
      kind: "approved" as const,
      quarterEnd: det.quarterEnd,
      asOf: det.asOf,
      status: det.status === "filed" ? ("filed" as const) : ("approved" as const),
    },
  };
}

/** The starting point at an earlier date, read from the database (250 days up to it). */
async function startAt(entity: EntityModel, portfolio: { id: number; code: string }, at: string) {
  const start = await loadStartingPoint(entity, portfolio.id, at);
  if (!start)
    throw new AppError(422, "validation_failed", `${portfolio.code} has no daily data on or before ${at}.`, {
      fields: { asOf: `A day on or after the first day with data of ${portfolio.code}` },
    });
  return start;
}

const summary = (d: DeterminationDto | null) =>
  d
    ? {
        quarterEnd: d.quarterEnd,
        effectiveFrom: d.effectiveFrom,
        counted: d.counted,
        zone: d.zone,
        plusFactor: d.plusFactor,
        multiplier: d.multiplier,
        status: d.status,
      }
    : null;

/** The current quarter's end, or the next one when the data already reaches it. */
function defaultForecastDate(latest: string): string {
  const end = quarterEndOf(new Date().toISOString().slice(0, 10));
  if (end > latest) return end;
  const next = new Date(`${latest}T00:00:00Z`);
  next.setUTCDate(next.getUTCDate() + 1);
  return quarterEndOf(next.toISOString().slice(0, 10));
}

/**
 * Where the entity's count may stand at a future date, what the next exception would cost, and
 * from which determination on either would change the multiplier in force.
 */
export async function getForecast(
  code: string,
  query: { date?: string },
  viewer: SessionUser,
): Promise<ForecastResponse> {
  const start = await startingPoint(code, viewer);
  const { entity, portfolio, asOf, settings } = start;
  const { series, options } = start.start;
  const date = query.date ?? defaultForecastDate(start.latest);
  if (date < asOf) {
    throw new AppError(
      422,
      "validation_failed",
      `The forecast date ${date} is before the as-of date ${asOf}, ${start.startsFrom.kind === "approved" ? `the last business day of the approved ${quarterLabel(start.startsFrom.quarterEnd!)}` : `the last day with data of ${portfolio.code}`}.`,
      { fields: { date: `On or after ${asOf}` } },
    );
  }
  const forecast = forecastAt(series, {
    regime: entity.regime,
    pnlBasis: settings.pnlBasis,
    asOf,
    excludedDates: options.excludedDates,
    qualitativeAddend: settings.qualitativeAddend,
    date,
    holidays: options.holidays,
  });
  const m = multipliersFor(start.counted, entity.regime, settings);
  let nextExceptionCost: number | null = null;
  try {
    const capitalInputs = capitalInputsAt(series, entity.regime, asOf);
    const next = multipliersFor(start.counted + 1, entity.regime, settings);
    nextExceptionCost =
      capitalUnder(capitalInputs, entity.regime, next.plusFactor, settings).requirement -
      capitalUnder(capitalInputs, entity.regime, m.plusFactor, settings).requirement;
  } catch (err) {
    if (!(err instanceof EngineInputError)) throw err;
  }
  const holidays = options.holidays;
  return {
    entity: entity.code,
    portfolio: portfolio.code,
    regime: entity.regime,
    currency: entity.currency,
    ...forecast,
    nextExceptionCost,
    today: {
      counted: start.counted,
      zone: zoneFor(start.counted, entity.regime),
      plusFactor: m.plusFactor,
      multiplier: m.multiplier,
      windowComplete: start.windowComplete,
    },
    startsFrom: start.startsFrom,
    // Treasury's figures start from the latest signed-off determination: that is the one it reads as in force.
    inForce: summary(start.determination ?? (await determinationInForce(entity, asOf))),
    bitesFrom: bitesFrom(date, options, asOf),
    nextExceptionBitesFrom: bitesFrom(addBusinessDays(asOf, 1, holidays), options, asOf),
  };
}

/** The figures with extra exceptions and VaR / stressed VaR scaled, against the starting point's. */
export async function getWhatIf(
  code: string,
  body: z.output<typeof whatIfBodySchema>,
  viewer: SessionUser,
): Promise<WhatIfResponse> {
  const start = await startingPoint(code, viewer);
  const { entity, portfolio } = start;
  const asOf = body.asOf ?? start.asOf;
  let counted = start.counted;
  let settings = start.settings;
  let from = start.start;
  let startsFrom: WhatIfResponse["startsFrom"];
  if (start.startsFrom.kind === "approved") {
    // Treasury: the as-of date must be a signed-off determination's; its count and settings are the base.
    const chosen = asOf === start.asOf ? start.determination : await signedOffDetermination(entity, asOf);
    if (!chosen) {
      throw new AppError(
        422,
        "validation_failed",
        `Treasury's what-if starts from an approved determination; ${asOf} is not the as-of date of one. The latest approved is ${quarterLabel(start.startsFrom.quarterEnd!)} (as of ${start.startsFrom.asOf}).`,
        { fields: { asOf: `The as-of date of an approved quarter, such as ${start.startsFrom.asOf}` } },
      );
    }
    counted = chosen.counted;
    settings = chosen.settings as DatedSettings;
    if (asOf !== start.asOf) from = await startAt(entity, portfolio, asOf);
    startsFrom = {
      kind: "approved",
      quarterEnd: chosen.quarterEnd,
      asOf: chosen.asOf,
      status: chosen.status === "filed" ? "filed" : "approved",
    };
  } else {
    if (asOf > start.latest)
      throw new AppError(
        422,
        "validation_failed",
        `The data of ${portfolio.code} ends on ${start.latest}; choose that day or an earlier one.`,
        { fields: { asOf: `At most ${start.latest}` } },
      );
    if (asOf !== start.asOf) {
      from = await startAt(entity, portfolio, asOf);
      counted = indicativeAt(from.series, asOf, from.options).counted;
      settings = settingsInForce(from.options, asOf);
    }
    startsFrom = { kind: "current", quarterEnd: null, asOf, status: null };
  }
  const result = whatIfFromCount(from.series, {
    regime: entity.regime,
    asOf,
    counted,
    settings,
    extraExceptions: body.extraExceptions,
    varScale: body.varScale,
    svarScale: body.svarScale,
  });
  return {
    entity: entity.code,
    portfolio: portfolio.code,
    currency: entity.currency,
    asOf,
    ...result,
    startsFrom,
    bitesFrom: bitesFrom(addBusinessDays(asOf, 1, from.options.holidays), from.options, asOf),
  };
}

const HISTORY_COLUMNS = ["id", "quarterEnd", "status", ...SNAPSHOT_HEADLINE_COLUMNS, "restatedAt", "amendsId"] as const;

/** The entity's quarters as their snapshots hold them, oldest first (treasury: signed off only). */
export async function capitalHistory(code: string, actor: SignedIn): Promise<CapitalHistoryItem[]> {
  const entity = await entityByCode(code);
  const rows = await SnapshotModel.findAll({
    where: { entityId: entity.id, ...(readsSignedOffOnly(actor) ? { status: [...SIGNED_OFF] } : {}) },
    // The headline columns and the window's completeness, not the frozen figures and history.
    attributes: [
      ...HISTORY_COLUMNS,
      // MariaDB gives a JSON true as '1' (MySQL as 'true').
      [sequelize.literal("JSON_VALUE(figures_json, '$.window.complete') IN ('1', 'true')"), "windowComplete"],
    ],
    order: [
      ["quarterEnd", "ASC"],
      ["id", "ASC"],
    ],
  });
  // One row per quarter: the figures that stand. A signed-off amendment replaces what it amends; an
  // amendment still in sign-off is not yet the quarter's figures (docs/api.md#amendments).
  const superseded = new Set(rows.filter((r) => r.amendsId && SIGNED_OFF.has(r.status)).map((r) => r.amendsId));
  const standing = rows.filter((r) => !superseded.has(r.id) && !(r.amendsId && !SIGNED_OFF.has(r.status)));
  return standing.map((r) => ({
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
    windowComplete: Number(r.get("windowComplete")) === 1,
  }));
}
