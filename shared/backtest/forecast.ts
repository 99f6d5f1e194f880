import type { PnlBasis } from "../schemas/common";
import { binomialPmf } from "./binomial";
import { businessDaysBetween, nextBusinessDays } from "./calendar";
import { AVERAGING_DAYS, capitalAddOnFromInputs, capitalInputsAt, type CapitalInputs } from "./capital";
import { EngineInputError } from "./errors";
import { classifyDay, countedFromBasis } from "./exceptions";
import { getRegime, plusFactorFor, zoneFor, type RegimeRules } from "./regimes";
import type { BacktestOptions, Observation, Zone } from "./types";
import { assertIsoDate, lastIndexOnOrBefore, validateObservations, varFieldFor, windowAt } from "./window";

/**
 * Roll-off and forecast (docs/rules.md#forecast). Each exception leaves the window 250 observations after it
 * entered; future observation dates are the entity's business days (weekdays minus holidays) after
 * the last observation in the window. New exceptions are modelled on the counted series as
 * Binomial(h, 1 − confidence) for the h business days still to come; for the `max` basis this adds
 * them to the higher count, a slight overstatement of the chance of leaving the green zone.
 */

/**
 * How many observations up to an as-of date the forecast, the roll-offs, the what-if, the
 * indicative count and capital on that date read: the backtesting window and the days the capital
 * averages (the US stressed VaR's 12 weeks lie inside them). Nothing before them changes a figure.
 */
export const STARTING_POINT_OBSERVATIONS = Math.max(250, AVERAGING_DAYS);

/**
 * The starting point of the forecast and the what-if at `asOf`: the last
 * STARTING_POINT_OBSERVATIONS observations dated on or before it. Every figure of forecastAt,
 * rollOffs, whatIfFromCount and capitalInputsAt at `asOf` (window of 250) is the same on these as
 * on the whole history, so a reader keeps only these (docs/rules.md#forecast).
 */
export function startingSeries<T extends { date: string }>(observations: readonly T[], asOf: string): T[] {
  const end = lastIndexOnOrBefore(observations, asOf);
  return observations.slice(Math.max(0, end - STARTING_POINT_OBSERVATIONS + 1), end + 1);
}

interface ScoredDay {
  index: number;
  date: string;
  actual: boolean;
  hypothetical: boolean;
}

interface Context {
  rules: RegimeRules;
  basis: PnlBasis;
  windowSize: number;
  confidence: number;
  start: number;
  end: number;
  /** Non-excluded exception days in the window, in date order. */
  days: ScoredDay[];
}

function context(observations: readonly Observation[], opts: BacktestOptions): Context {
  validateObservations(observations);
  assertIsoDate(opts.asOf, "asOf");
  const rules = getRegime(opts.regime);
  const basis = opts.pnlBasis ?? rules.defaultPnlBasis;
  const windowSize = opts.windowSize ?? 250;
  const confidence = opts.confidence ?? 0.99;
  const field = varFieldFor(confidence);
  const excluded = new Set(opts.excludedDates ?? []);
  const b = windowAt(observations, opts.asOf, windowSize);
  const days: ScoredDay[] = [];
  for (let i = b.startIndex; i <= b.endIndex; i++) {
    const o = observations[i];
    if (excluded.has(o.date)) continue;
    const d = classifyDay(o.actualPnl, o.hypotheticalPnl, o[field] ?? null, rules.missingCountsAsException);
    const actual = d.actual && basis !== "hypothetical";
    const hypothetical = d.hypothetical && basis !== "actual";
    if (actual || hypothetical) days.push({ index: i, date: o.date, actual, hypothetical });
  }
  return { rules, basis, windowSize, confidence, start: b.startIndex, end: b.endIndex, days };
}

function countOf(days: readonly ScoredDay[], basis: PnlBasis): number {
  let a = 0;
  let h = 0;
  for (const d of days) {
    if (d.actual) a++;
    if (d.hypothetical) h++;
  }
  return countedFromBasis(a, h, basis);
}

export interface RollOff {
  /** Date of the exception. */
  date: string;
  actual: boolean;
  hypothetical: boolean;
  /** First date on which it is no longer inside the window (projected on the business-day calendar). */
  leavesOn: string;
  /** Counted exceptions, zone and plus factor once it has left, if no new exception occurs. */
  countAfter: number;
  zoneAfter: Zone;
  plusFactorAfter: number;
}

function rollOffsOf(observations: readonly Observation[], c: Context, holidays: ReadonlySet<string>): RollOff[] {
  if (c.end < 0) return [];
  const last = observations[c.end].date;
  // It leaves with the (index + windowSize − end)-th future observation; project those dates once.
  const furthest = c.days.length ? c.days[c.days.length - 1].index + c.windowSize - c.end : 0;
  const future = nextBusinessDays(last, furthest, holidays);
  return c.days.map((d, k) => {
    const ahead = d.index + c.windowSize - c.end;
    const leavesOn = future[ahead - 1];
    const countAfter = countOf(c.days.slice(k + 1), c.basis);
    return {
      date: d.date,
      actual: d.actual,
      hypothetical: d.hypothetical,
      leavesOn,
      countAfter,
      zoneAfter: zoneFor(countAfter, c.rules, c.windowSize),
      plusFactorAfter: plusFactorFor(countAfter, c.rules, c.windowSize),
    };
  });
}

/** For each counted exception inside the current window: the date it leaves, and the count after. */
export function rollOffs(
  observations: readonly Observation[],
  opts: BacktestOptions,
  holidays: ReadonlySet<string> = new Set(),
): RollOff[] {
  return rollOffsOf(observations, context(observations, opts), holidays);
}

export interface ForecastOptions extends BacktestOptions {
  /** The future date D. */
  date: string;
  holidays?: ReadonlySet<string>;
}

export interface ForecastResult {
  asOf: string;
  date: string;
  /** Counted exceptions still inside the window at D. */
  knownRemaining: number;
  /** Business days after the last observation up to and including D (at most the window). */
  newDays: number;
  /** P(counted = k at D) for k = knownRemaining … knownRemaining + newDays. */
  distribution: { exceptions: number; probability: number }[];
  zones: Record<Zone, number>;
  /** If no new exception occurs. */
  ifNoNewException: { counted: number; zone: Zone; plusFactor: number; addOn: number | null };
  /** Σ P(k) × add-on(k) with today's VaR / sVaR figures; null when there is no capital input. */
  expectedAddOn: number | null;
  rollOffs: RollOff[];
}

export function forecastAt(observations: readonly Observation[], opts: ForecastOptions): ForecastResult {
  assertIsoDate(opts.date, "date");
  if (opts.date < opts.asOf)
    throw new EngineInputError(`The forecast date ${opts.date} is before the as-of date ${opts.asOf}`, {
      date: opts.date,
    });
  const holidays = opts.holidays ?? new Set<string>();
  const c = context(observations, opts);
  const last = c.end >= 0 ? observations[c.end].date : opts.asOf;
  const h = Math.max(0, businessDaysBetween(last, opts.date, holidays));
  const newDays = Math.min(h, c.windowSize);
  // The window at D keeps the last (windowSize − h) observations we already have.
  const firstKept = c.end - (c.windowSize - newDays) + 1;
  const knownRemaining = countOf(
    c.days.filter((d) => d.index >= firstKept),
    c.basis,
  );

  let inputs: CapitalInputs | null = null;
  try {
    inputs = capitalInputsAt(observations, opts.regime, opts.asOf);
  } catch (e) {
    if (!(e instanceof EngineInputError)) throw e;
  }
  const addOnByPlus = new Map<number, number>();
  const addOnFor = (count: number): number | null => {
    if (!inputs) return null;
    const pf = plusFactorFor(count, c.rules, c.windowSize);
    let v = addOnByPlus.get(pf);
    if (v === undefined) {
      v = capitalAddOnFromInputs(inputs, opts.regime, pf, opts.qualitativeAddend ?? 0);
      addOnByPlus.set(pf, v);
    }
    return v;
  };

  const p = 1 - c.confidence;
  const distribution: { exceptions: number; probability: number }[] = [];
  const zones: Record<Zone, number> = { green: 0, yellow: 0, red: 0 };
  let expectedAddOn: number | null = inputs ? 0 : null;
  for (let x = 0; x <= newDays; x++) {
    const probability = binomialPmf(x, newDays, p);
    const exceptions = knownRemaining + x;
    distribution.push({ exceptions, probability });
    zones[zoneFor(exceptions, c.rules, c.windowSize)] += probability;
    if (expectedAddOn !== null) expectedAddOn += probability * (addOnFor(exceptions) ?? 0);
  }

  return {
    asOf: opts.asOf,
    date: opts.date,
    knownRemaining,
    newDays,
    distribution,
    zones,
    ifNoNewException: {
      counted: knownRemaining,
      zone: zoneFor(knownRemaining, c.rules, c.windowSize),
      plusFactor: plusFactorFor(knownRemaining, c.rules, c.windowSize),
      addOn: addOnFor(knownRemaining),
    },
    expectedAddOn,
    rollOffs: rollOffsOf(observations, c, holidays),
  };
}
