import type { RegimeId } from "../schemas/common";
import { EngineInputError } from "./errors";
import { getRegime, plusFactorFor, type RegimeRules } from "./regimes";
import type { Observation } from "./types";
import { assertIsoDate, lastIndexOnOrBefore, validateObservations } from "./window";
import { dayNumber } from "./calendar";

/**
 * Capital requirement at a date (docs/rules.md#capital).
 *
 * Reading of the formulas used here: "t−1" is the last observation dated on or before asOf (the
 * figure in force for the as-of day), and the 60-day averages run over the last 60 observations
 * dated on or before asOf, that one included. Missing values are left out of an average (and
 * reported); if the latest value is missing, the latest value present among those 60 stands in.
 */

export const AVERAGING_DAYS = 60;
const SQRT_10 = Math.sqrt(10);

export interface CapitalOptions {
  regime: RegimeId;
  asOf: string;
  /** Counted exceptions that set the plus factor. */
  count: number;
  qualitativeAddend?: number;
  /** Use this plus factor instead of the one for `count` (0 gives the requirement without the plus factor). */
  plusFactor?: number;
  /** What-if scaling of VaR (FRTB: ES) and stressed VaR (FRTB: SES). */
  varScale?: number;
  svarScale?: number;
  windowSize?: number;
}

export interface CapitalInputs {
  asOf: string;
  /** Date of the observation used as t−1. */
  previousDate: string;
  /** Observations the 60-day averages were taken over (fewer than 60 early in a series). */
  averagedObservations: number;
  /** Capital VaR (10-day): var_10d, or var_99 × √10 when var_10d is absent. */
  varPrev?: number;
  varAvg60?: number;
  svarPrev?: number;
  svarAvg60?: number;
  /** How many of the averaged days used √10 scaling for VaR / sVaR. */
  varScaledFromOneDay?: number;
  svarScaledFromOneDay?: number;
  /**
   * US rule: how many weekly stressed VaR-based measures the sVaR average was taken over (12 CFR
   * 217.204(a)(2)(ii): the most recent weekly measure and the average over the preceding 12 weeks).
   */
  svarWeeks?: number;
  esPrev?: number;
  esAvg60?: number;
  sesPrev?: number;
  sesAvg60?: number;
  warnings: string[];
}

export interface CapitalResult {
  requirement: number;
  /** Basel 2.5 / EU / US: max(VaR_{t−1}, m·avg60 VaR) and max(sVaR_{t−1}, m·avg60 sVaR). */
  varTerm?: number;
  svarTerm?: number;
  /** FRTB: the ES and SES parts of whichever branch of the max binds. */
  esTerm?: number;
  sesTerm?: number;
  /** Which side of the outer max set the figure (FRTB) or the VaR term (others). */
  binding: "previous" | "average";
  multiplier: number;
  plusFactor: number;
  inputs: CapitalInputs;
}

interface Picked {
  prev: number;
  avg: number;
  missing: number;
  scaled: number;
}

/** The value at t−1 and the average over the window, skipping missing values. */
function pick(
  observations: readonly Observation[],
  start: number,
  end: number,
  valueOf: (o: Observation) => number | null,
  scaledFromOneDay?: (o: Observation) => boolean,
): Picked | null {
  let sum = 0;
  let present = 0;
  let scaled = 0;
  let prev: number | null = null;
  for (let i = end; i >= start; i--) {
    const v = valueOf(observations[i]);
    if (v == null) continue;
    if (prev === null) prev = v;
    sum += v;
    present++;
    if (scaledFromOneDay?.(observations[i])) scaled++;
  }
  if (prev === null) return null;
  return { prev, avg: sum / present, missing: end - start + 1 - present, scaled };
}

/** Gathers the inputs of the formula once; the requirement for any multiplier follows from them. */
export function capitalInputsAt(
  observations: readonly Observation[],
  regime: RegimeId,
  asOf: string,
  scales: { varScale?: number; svarScale?: number } = {},
): CapitalInputs {
  validateObservations(observations);
  assertIsoDate(asOf, "asOf");
  const rules = getRegime(regime);
  const end = lastIndexOnOrBefore(observations, asOf);
  if (end < 0)
    throw new EngineInputError(`No observation on or before ${asOf}, so there is no capital figure`, { date: asOf });
  const start = Math.max(0, end - AVERAGING_DAYS + 1);
  const varScale = scales.varScale ?? 1;
  const svarScale = scales.svarScale ?? 1;
  const warnings: string[] = [];
  const averaged = end - start + 1;
  if (averaged < AVERAGING_DAYS)
    warnings.push(`Only ${averaged} observations on or before ${asOf}; the averages use them all.`);
  const inputs: CapitalInputs = {
    asOf,
    previousDate: observations[end].date,
    averagedObservations: averaged,
    warnings,
  };

  const note = (what: string, p: Picked): void => {
    if (p.missing > 0) warnings.push(`${what} is missing on ${p.missing} of the ${averaged} averaged days.`);
  };

  if (rules.capitalFormula === "es-ses") {
    const es = pick(observations, start, end, (o) => (o.es975 == null ? null : o.es975 * varScale));
    if (!es)
      throw new EngineInputError(
        `No expected shortfall (es_975) on or before ${asOf}, so there is no FRTB capital figure`,
        { date: asOf, field: "es975" },
      );
    note("ES", es);
    const ses = pick(observations, start, end, (o) => (o.ses == null ? null : o.ses * svarScale));
    if (ses) note("SES", ses);
    else warnings.push("No SES supplied; the SES term is taken as 0.");
    Object.assign(inputs, { esPrev: es.prev, esAvg60: es.avg, sesPrev: ses?.prev ?? 0, sesAvg60: ses?.avg ?? 0 });
    return inputs;
  }

  // CRR Art. 365: 10-day VaR for capital; without var_10d the 1-day figure × √10.
  const capitalVar = (
    tenDay: number | null | undefined,
    oneDay: number | null | undefined,
    scale: number,
  ): number | null => (tenDay != null ? tenDay * scale : oneDay != null ? oneDay * SQRT_10 * scale : null);
  /** VaR or stressed VaR for capital at t−1 and on average: the 10-day figure, else the one-day one × √10. */
  const pickCapital = (tenDay: "var10d" | "svar10d", oneDay: "var99" | "svar99", scale: number) =>
    pick(
      observations,
      start,
      end,
      (o) => capitalVar(o[tenDay], o[oneDay], scale),
      (o) => o[tenDay] == null,
    );
  const v = pickCapital("var10d", "var99", varScale);
  if (!v)
    throw new EngineInputError(`No VaR on or before ${asOf}, so there is no capital figure`, {
      date: asOf,
      field: "var99",
    });
  note("VaR", v);
  const s = pickCapital("svar10d", "svar99", svarScale);
  if (rules.id === "us" && s) {
    // 12 CFR 217.204(a)(2)(ii) with 217.206(a), (b)(2): the stressed VaR-based measure is calculated
    // at least weekly; the requirement takes the most recent one and the average over 12 weeks.
    const weekly = weeklyMeasures(observations, end, (o) => capitalVar(o.svar10d, o.svar99, svarScale));
    if (weekly.length < US_SVAR_WEEKS)
      warnings.push(`Only ${weekly.length} weekly stressed VaR measures on or before ${asOf}; the average uses them.`);
    s.prev = weekly[0];
    s.avg = weekly.reduce((a, b) => a + b, 0) / weekly.length;
    inputs.svarWeeks = weekly.length;
  } else if (s) note("Stressed VaR", s);
  if (!s) warnings.push("No stressed VaR supplied; the stressed VaR term is taken as 0.");
  Object.assign(inputs, {
    varPrev: v.prev,
    varAvg60: v.avg,
    svarPrev: s?.prev ?? 0,
    svarAvg60: s?.avg ?? 0,
    varScaledFromOneDay: v.scaled,
    svarScaledFromOneDay: s?.scaled ?? 0,
  });
  return inputs;
}

export const US_SVAR_WEEKS = 12;

/**
 * The weekly measures of the 12 calendar weeks (Monday to Sunday) that end with the week of the
 * observation at `end`, newest first: each week's measure is the last value reported in it.
 * Weeks with no value are left out.
 */
function weeklyMeasures(
  observations: readonly Observation[],
  end: number,
  valueOf: (o: Observation) => number | null,
): number[] {
  const weekOf = (date: string) => {
    const d = dayNumber(date);
    return d - ((((d + 4) % 7) + 7 + 6) % 7); // the Monday of the week (1970-01-01 was a Thursday)
  };
  const lastWeek = weekOf(observations[end].date);
  const firstWeek = lastWeek - 7 * (US_SVAR_WEEKS - 1);
  const out: number[] = [];
  let current = Number.NaN;
  for (let i = end; i >= 0; i--) {
    const week = weekOf(observations[i].date);
    if (week < firstWeek) break;
    if (week === current) continue;
    const v = valueOf(observations[i]);
    if (v == null) continue;
    out.push(v);
    current = week;
  }
  return out;
}

/**
 * The formula of the rule set for a given multiplier: m_c on VaR and m_s on stressed VaR (equal
 * unless the supervisor sets separate addends, CRR Art. 366).
 */
export function requirementFromInputs(
  inputs: CapitalInputs,
  rules: RegimeRules,
  multiplier: number,
  multiplierSvar: number = multiplier,
): Omit<CapitalResult, "plusFactor" | "inputs"> {
  if (rules.capitalFormula === "es-ses") {
    // MAR33.41: max(IMCC_{t−1} + SES_{t−1}, m_c·IMCC_avg + SES_avg); m_c applies to IMCC only.
    const previous = (inputs.esPrev ?? 0) + (inputs.sesPrev ?? 0);
    const average = multiplier * (inputs.esAvg60 ?? 0) + (inputs.sesAvg60 ?? 0);
    const averageBinds = average >= previous;
    return {
      requirement: Math.max(previous, average),
      esTerm: averageBinds ? multiplier * (inputs.esAvg60 ?? 0) : (inputs.esPrev ?? 0),
      sesTerm: averageBinds ? (inputs.sesAvg60 ?? 0) : (inputs.sesPrev ?? 0),
      binding: averageBinds ? "average" : "previous",
      multiplier,
    };
  }
  // CRR Art. 364(1) / BCBS 2009 para 718(Lxxvi) / 12 CFR 217.204(a)(2)(i).
  const varAverage = multiplier * (inputs.varAvg60 ?? 0);
  const varTerm = Math.max(inputs.varPrev ?? 0, varAverage);
  const svarTerm = Math.max(inputs.svarPrev ?? 0, multiplierSvar * (inputs.svarAvg60 ?? 0));
  return {
    requirement: varTerm + svarTerm,
    varTerm,
    svarTerm,
    binding: varAverage >= (inputs.varPrev ?? 0) ? "average" : "previous",
    multiplier,
  };
}

function checkCount(count: number): void {
  if (!Number.isInteger(count) || count < 0)
    throw new EngineInputError(`The exception count must be a non-negative whole number, got ${count}`, {
      field: "count",
    });
}

/** Capital requirement for a count of exceptions (docs/rules.md#capital). */
export function capitalRequirement(observations: readonly Observation[], opts: CapitalOptions): CapitalResult {
  checkCount(opts.count);
  const rules = getRegime(opts.regime);
  const inputs = capitalInputsAt(observations, opts.regime, opts.asOf, opts);
  const plusFactor = opts.plusFactor ?? plusFactorFor(opts.count, rules, opts.windowSize);
  const multiplier = rules.baseMultiplier + plusFactor + (opts.qualitativeAddend ?? 0);
  return { ...requirementFromInputs(inputs, rules, multiplier), plusFactor, inputs };
}

/** The part of the requirement caused by the plus factor: with it − without it; never negative. */
export function capitalAddOnFromInputs(
  inputs: CapitalInputs,
  regime: RegimeId,
  plusFactor: number,
  qualitativeAddend = 0,
): number {
  const rules = getRegime(regime);
  const base = rules.baseMultiplier + qualitativeAddend;
  const withPlus = requirementFromInputs(inputs, rules, base + plusFactor).requirement;
  const without = requirementFromInputs(inputs, rules, base).requirement;
  return Math.max(0, withPlus - without);
}

export function capitalAddOn(observations: readonly Observation[], opts: CapitalOptions): number {
  checkCount(opts.count);
  const inputs = capitalInputsAt(observations, opts.regime, opts.asOf, opts);
  const plusFactor = opts.plusFactor ?? plusFactorFor(opts.count, opts.regime, opts.windowSize);
  return capitalAddOnFromInputs(inputs, opts.regime, plusFactor, opts.qualitativeAddend ?? 0);
}

/** What one more exception would cost: requirement(count + 1) − requirement(count). */
export function marginalCostOfNextException(observations: readonly Observation[], opts: CapitalOptions): number {
  checkCount(opts.count);
  const rules = getRegime(opts.regime);
  const inputs = capitalInputsAt(observations, opts.regime, opts.asOf, opts);
  const base = rules.baseMultiplier + (opts.qualitativeAddend ?? 0);
  const now = requirementFromInputs(
    inputs,
    rules,
    base + plusFactorFor(opts.count, rules, opts.windowSize),
  ).requirement;
  const next = requirementFromInputs(
    inputs,
    rules,
    base + plusFactorFor(opts.count + 1, rules, opts.windowSize),
  ).requirement;
  return next - now;
}
