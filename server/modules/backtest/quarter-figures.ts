import { createHash } from "node:crypto";
import { valuesOrNull } from "../../kit/values";
import stableStringify from "fast-json-stable-stringify";
import { NotFoundError } from "../../errors";
import { PortfolioModel } from "../../models/portfolio";
import type { EntityModel } from "../../models/entity";
import { backtestAt } from "../../../shared/backtest/exceptions";
import { capitalInputsAt, requirementFromInputs, type CapitalInputs } from "../../../shared/backtest/capital";
import { capitalUnder, determinationPoint, multipliersFor, settingsOn } from "../../../shared/backtest/determination";
import { getRegime } from "../../../shared/backtest/regimes";
import { ExceptionReviewModel } from "../../models/exception-review";
import { approvedSettings, fallbackSettings } from "../settings/settings.read";
import type { Transaction } from "sequelize";
import { EngineInputError } from "../../../shared/backtest/errors";
import { ENGINE_VERSION } from "../../../shared/backtest/version";
import { PNL_COMPONENTS } from "../../../shared/backtest/pnl-definition";
import { loadSeries } from "../observations/observations.repository";
import { deskResults } from "../figures/stored-figures";
import { frtbFiguresOn } from "../frtb/frtb.store";
import { assertQuarterComplete, loadPortfolioContext } from "../figures/engine-inputs";
import {
  type SnapshotCapitalDetail,
  type SnapshotDay,
  type SnapshotException,
  type SnapshotFigures,
} from "../../../shared/schemas/snapshot";
import type { Observation } from "../../../shared/backtest/types";

export interface QuarterFigures {
  figures: SnapshotFigures;
  /** sha256 of everything the figures were computed from: entity settings, the window's daily data, approved exclusions. */
  inputsSha256: string;
  engineVersion: string;
}

/**
 * The values of a day that feed the figures, in a fixed order (for the inputs hash): the stored
 * values, the actual P&L as supplied. The FRTB charges and the parts of the P&L join only on days
 * that carry one, so days stored before they existed hash as they did.
 */
const dayValues = (o: Observation) => {
  const base = [
    o.date,
    o.suppliedActualPnl ?? o.actualPnl,
    o.hypotheticalPnl,
    o.var99,
    o.var975,
    o.svar99,
    o.var10d,
    o.svar10d,
    o.es975,
    o.ses,
    o.rtpl,
  ];
  const charges = [o.imaDrc, o.sbm, o.rrao, o.saDrc, o.saGa];
  const parts = PNL_COMPONENTS.map((c) => o[c] ?? null);
  const withCharges = charges.some((v) => v != null) ? [...base, ...charges] : base;
  return parts.some((v) => v != null) ? [...withCharges, ...parts] : withCharges;
};

/**
 * An entity's figures at a quarter end, computed by the engine from the current daily data of its
 * top portfolio (and, under FRTB, its desks) and the approved exclusions. Refuses a quarter whose
 * last business day has no data yet: its figures would be a guess.
 */
export async function quarterFigures(
  entity: EntityModel,
  quarterEnd: string,
  transaction?: Transaction,
): Promise<QuarterFigures> {
  const portfolios = await PortfolioModel.findAll({ where: { entityId: entity.id }, order: [["code", "ASC"]] });
  const top = portfolios.find((p) => p.level === "top");
  if (!top)
    throw new NotFoundError(`${entity.code} has no top-of-house portfolio; an admin adds one under Admin › Entities.`);
  const ctx = await loadPortfolioContext(top.code);
  const series = ctx.series.filter((o) => o.date <= quarterEnd);
  // Complete on its last business day, or refused (one rule, with the stored figures' own).
  const asOf = assertQuarterComplete(ctx, quarterEnd);
  // The settings in force on the quarter's last business day (a later change never reaches back).
  const settings = settingsOn(await approvedSettings(entity.id, transaction), asOf) ?? fallbackSettings(entity);
  const opts = {
    regime: entity.regime,
    pnlBasis: settings.pnlBasis,
    asOf,
    excludedDates: ctx.excludedDates,
    qualitativeAddend: settings.qualitativeAddend,
  };
  const bt = backtestAt(series, opts);
  const multipliers = multipliersFor(bt.exceptions.counted, entity.regime, settings, bt.windowSize);

  let capital: number | null = null;
  let addOn: number | null = null;
  let capitalNote: string | null = null;
  let capitalDetail: SnapshotCapitalDetail | null = null;
  try {
    const inputs = capitalInputsAt(series, entity.regime, asOf);
    const c = capitalUnder(inputs, entity.regime, multipliers.plusFactor, settings);
    capital = Math.round(c.requirement * 100) / 100;
    addOn = Math.round(c.addOn * 100) / 100;
    capitalDetail = capitalDetailOf(inputs, entity.regime, multipliers.multiplier, multipliers.multiplierSvar);
  } catch (err) {
    if (!(err instanceof EngineInputError)) throw err;
    capitalNote = `No capital figure: ${err.message}`;
  }

  const desks = await deskResults(ctx, asOf, portfolios);
  // FRTB: the MAR33 aggregation with the desks' statuses of this quarter's determination (docs/rules.md#frtb-aggregation).
  let frtb: SnapshotFigures["frtb"] = null;
  let frtbNote: string | null = null;
  if (entity.regime === "frtb") {
    try {
      frtb = await frtbFiguresOn(entity, series, asOf, multipliers.multiplier, quarterEnd, ctx.holidays);
    } catch (err) {
      if (!(err instanceof EngineInputError)) throw err;
      frtbNote = `No aggregate capital requirement: ${err.message}`;
    }
  }
  const from = bt.window.start ?? asOf;
  const inWindow = (o: Observation) => o.date >= from && o.date <= asOf;
  const reviews = new Map(
    (
      await ExceptionReviewModel.findAll({
        where: { portfolioId: top.id, businessDate: bt.exceptionDays.map((d) => d.date) },
        transaction,
      })
    ).map((r) => [r.businessDate, r]),
  );
  const exceptionDetail: SnapshotException[] = bt.exceptionDays.map((d) => {
    const r = reviews.get(d.date);
    return {
      date: d.date,
      actualPnl: d.actualPnl,
      hypotheticalPnl: d.hypotheticalPnl,
      var99: d.var99,
      actual: d.actual,
      hypothetical: d.hypothetical,
      excluded: d.excluded,
      excessActual: d.excessActual,
      excessHypothetical: d.excessHypothetical,
      cause: r?.cause ?? null,
      narrative: r?.narrative ?? null,
      exclusionStatus: r?.exclusionStatus ?? "none",
      decisionReference: r?.decisionReference ?? null,
      decisionDate: r?.decisionDate ?? null,
    };
  });
  const days: SnapshotDay[] = series.filter(inWindow).map((o) => ({
    date: o.date,
    actual: o.actualPnl,
    hypothetical: o.hypotheticalPnl,
    var99: o.var99,
    varCapital: tenDay(o.var10d, o.var99),
    svarCapital: tenDay(o.svar10d, o.svar99),
    es: o.es975 ?? null,
  }));
  const figures: SnapshotFigures = {
    portfolio: top.code,
    regime: entity.regime,
    pnlBasis: settings.pnlBasis,
    currency: entity.currency,
    asOf,
    window: bt.window,
    exceptions: bt.exceptions,
    exceptionDates: bt.exceptionDays.map((d) => d.date),
    zone: bt.zone,
    zoneLabel: bt.zoneLabel,
    plusFactor: multipliers.plusFactor,
    qualitativeAddend: settings.qualitativeAddend,
    multiplier: multipliers.multiplier,
    multiplierSvar: multipliers.multiplierSvar,
    settings,
    expected: bt.expected,
    cumulativeProbability: bt.tests.cumulativeProbability,
    capital,
    addOn,
    capitalNote,
    determination: {
      baseMultiplier: getRegime(entity.regime).baseMultiplier,
      effectiveFrom: determinationPoint(quarterEnd, ctx.holidays).effectiveFrom,
    },
    tests: {
      series: bt.testedSeries,
      kupiec: bt.tests.kupiec,
      independence: bt.tests.independence,
      conditionalCoverage: bt.tests.conditionalCoverage,
    },
    capitalDetail,
    exceptionDetail,
    days,
    desks: desks.map((d) => ({
      portfolio: d.portfolio,
      exceptions99: d.backtest.at99.count,
      exceptions975: d.backtest.at975.count,
      passes: d.backtest.passes,
      plaZone: d.pla?.zone ?? null,
    })),
    ...(entity.regime === "frtb" ? { frtb, frtbNote } : {}),
  };

  // The inputs: what a second computation would need to give the same figures.
  const deskSeries = [];
  for (const desk of portfolios.filter((p) => p.level === "desk")) {
    deskSeries.push([desk.code, (await loadSeries(desk.id, "as supplied", from, asOf)).map((o) => dayValues(o))]);
  }
  const inputs = {
    entity: {
      code: entity.code,
      regime: entity.regime,
      pnlBasis: settings.pnlBasis,
      qualitativeAddend: settings.qualitativeAddend,
    },
    // Settings beyond the entity's first ones enter the hash only when set, so the inputs of
    // snapshots made before settings were governed hash as they did.
    ...(settings.qualitativeAddendSvar !== null ||
    settings.multiplierFloor !== null ||
    settings.determinationFrequency !== "quarterly"
      ? {
          settings: {
            qualitativeAddendSvar: settings.qualitativeAddendSvar,
            multiplierFloor: settings.multiplierFloor,
            determinationFrequency: settings.determinationFrequency,
          },
        }
      : {}),
    asOf,
    portfolio: top.code,
    days: series.filter(inWindow).map(dayValues),
    excluded: [...ctx.excludedDates].filter((d) => d >= from && d <= asOf).sort(),
    desks: deskSeries,
  };
  return {
    figures,
    inputsSha256: createHash("sha256").update(stableStringify(inputs)).digest("hex"),
    engineVersion: ENGINE_VERSION,
  };
}

/** The capital VaR of a day: the 10-day figure, or the one-day figure × √10 (CRR Art. 365(1)). */
function tenDay(tenDayValue: number | null | undefined, oneDay: number | null | undefined): number | null {
  if (tenDayValue != null) return tenDayValue;
  return oneDay != null ? oneDay * Math.sqrt(10) : null;
}

/** The inputs and terms of the capital formula with the multipliers of the determination. */
function capitalDetailOf(
  inputs: CapitalInputs,
  regime: EntityModel["regime"],
  multiplier: number,
  multiplierSvar: number,
): SnapshotCapitalDetail {
  const rules = getRegime(regime);
  const r = requirementFromInputs(inputs, rules, multiplier, multiplierSvar);
  return {
    formula: rules.capitalFormula === "es-ses" ? "es-ses" : "var-svar",
    previousDate: inputs.previousDate,
    averagedObservations: inputs.averagedObservations,
    ...valuesOrNull(inputs, [
      "varPrev",
      "varAvg60",
      "svarPrev",
      "svarAvg60",
      "svarWeeks",
      "esPrev",
      "esAvg60",
      "sesPrev",
      "sesAvg60",
    ]),
    ...valuesOrNull(r, ["varTerm", "svarTerm", "esTerm", "sesTerm"]),
    binding: r.binding,
    warnings: inputs.warnings,
  };
}
