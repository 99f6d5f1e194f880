import type { PnlBasis, RegimeId } from "../schemas/common";
import { binomialCdf } from "./binomial";
import { EngineInputError } from "./errors";
import { pnlMakeUp, type PnlMakeUp } from "./pnl-definition";
import { getRegime, multiplierFor, plusFactorFor, zoneBoundariesFor, zoneFor, type RegimeRules } from "./regimes";
import { plusFactorAt, rollingArrays, zoneAt } from "./rolling";
import { christoffersenIndependence, conditionalCoverage, kupiecPof } from "./statistics";
import type { BacktestOptions, Observation, PnlSeriesName, TestOutcome, Zone } from "./types";
import { assertIsoDate, toSeries, validateObservations, varFieldFor, windowAt } from "./window";

/** How one day scores on each P&L series. */
export interface DayClassification {
  actual: boolean;
  hypothetical: boolean;
  /** P&L (either series) or VaR missing. */
  missing: boolean;
}

/**
 * docs/rules.md#exception: an exception when −pnl > var, strictly, on raw values. Under FRTB a missing P&L or
 * VaR counts as an exception on the series concerned (MAR32.5(2)); elsewhere it is not an exception.
 */
export function classifyDay(
  pnlActual: number | null | undefined,
  pnlHypothetical: number | null | undefined,
  varValue: number | null | undefined,
  missingCountsAsException: boolean,
): DayClassification {
  const varMissing = varValue == null;
  const aMissing = pnlActual == null;
  const hMissing = pnlHypothetical == null;
  const actual = !aMissing && !varMissing ? -pnlActual > varValue : missingCountsAsException;
  const hypothetical = !hMissing && !varMissing ? -pnlHypothetical > varValue : missingCountsAsException;
  return { actual, hypothetical, missing: aMissing || hMissing || varMissing };
}

export interface ExceptionDay {
  date: string;
  actualPnl: number | null;
  hypotheticalPnl: number | null;
  var99: number | null;
  actual: boolean;
  hypothetical: boolean;
  excluded: boolean;
  missing: boolean;
  /** Loss beyond VaR (−pnl − var), null when a value is missing. */
  excessActual: number | null;
  excessHypothetical: number | null;
  /** How the actual P&L was made up under the rule set; absent for a day without parts (P&L as supplied). */
  actualMakeUp?: PnlMakeUp;
}

function withMakeUp(o: Observation, regime: RegimeId): { actualMakeUp?: PnlMakeUp } {
  const makeUp = pnlMakeUp(o, regime);
  return makeUp ? { actualMakeUp: makeUp } : {};
}

export interface SeriesTests {
  kupiec: TestOutcome;
  independence: TestOutcome;
  conditionalCoverage: TestOutcome;
}

export interface BacktestResult {
  asOf: string;
  regime: RegimeId;
  pnlBasis: PnlBasis;
  confidence: number;
  windowSize: number;
  window: { start: string | null; end: string | null; observations: number; complete: boolean };
  /**
   * actual / hypothetical: exceptions in the window before exclusions. counted: after the basis and
   * approved exclusions. excluded: how many the exclusions removed from the counted figure, so
   * counted + excluded is the count without exclusions.
   */
  exceptions: { actual: number; hypothetical: number; counted: number; excluded: number };
  zone: Zone;
  zoneLabel: string;
  plusFactor: number;
  multiplier: number;
  /** Exceptions expected in the window if the model is right: observations × (1 − confidence). */
  expected: number;
  tests: { cumulativeProbability: number } & SeriesTests;
  /** The same tests on each P&L series. */
  testsBySeries: Record<PnlSeriesName, SeriesTests>;
  exceptionDays: ExceptionDay[];
  /** Dates in the window with P&L or VaR missing (not FRTB, where such a day is an exception). */
  dataGaps: string[];
  testedSeries: PnlSeriesName;
  /** Zone boundaries derived by the binomial rule for a window other than 250 observations. */
  provisionalBoundaries: boolean;
}

/** Counted exceptions from the two series' counts: the basis picks one, or the higher of the two. */
export function countedFromBasis(actual: number, hypothetical: number, basis: PnlBasis): number {
  if (basis === "actual") return actual;
  if (basis === "hypothetical") return hypothetical;
  return Math.max(actual, hypothetical);
}

function excessOf(pnl: number | null, v: number | null): number | null {
  return pnl == null || v == null ? null : -pnl - v;
}

function runTests(hits: boolean[], p: number): SeriesTests {
  let x = 0;
  for (const h of hits) if (h) x++;
  return {
    kupiec: kupiecPof(x, hits.length, p),
    independence: christoffersenIndependence(hits),
    conditionalCoverage: conditionalCoverage(hits, p),
  };
}

function resolveOptions(opts: BacktestOptions): {
  rules: RegimeRules;
  basis: PnlBasis;
  windowSize: number;
  confidence: number;
  excluded: Set<string>;
} {
  const rules = getRegime(opts.regime);
  assertIsoDate(opts.asOf, "asOf");
  const windowSize = opts.windowSize ?? 250;
  const confidence = opts.confidence ?? 0.99;
  if (opts.pnlBasis !== undefined && !["actual", "hypothetical", "max"].includes(opts.pnlBasis)) {
    throw new EngineInputError(`Unknown P&L basis "${String(opts.pnlBasis)}"; use actual, hypothetical or max`, {
      field: "pnlBasis",
    });
  }
  return {
    rules,
    basis: opts.pnlBasis ?? rules.defaultPnlBasis,
    windowSize,
    confidence,
    excluded:
      opts.excludedDates instanceof Set ? (opts.excludedDates as Set<string>) : new Set(opts.excludedDates ?? []),
  };
}

/**
 * The backtest at one as-of date (docs/rules.md#exception, docs/api.md#backtest): window,
 * exceptions per series, counted figure, zone, plus factor, multiplier, statistical tests and the
 * exception days.
 */
export function backtestAt(observations: readonly Observation[], opts: BacktestOptions): BacktestResult {
  validateObservations(observations);
  const { rules, basis, windowSize, confidence, excluded } = resolveOptions(opts);
  const varField = varFieldFor(confidence);
  const bounds = windowAt(observations, opts.asOf, windowSize);
  const p = 1 - confidence;

  let actual = 0;
  let hypothetical = 0;
  let excludedActual = 0;
  let excludedHypothetical = 0;
  const hitsActual: boolean[] = [];
  const hitsHypothetical: boolean[] = [];
  const exceptionDays: ExceptionDay[] = [];
  const dataGaps: string[] = [];

  for (let i = bounds.startIndex; i <= bounds.endIndex; i++) {
    const o = observations[i];
    const v = o[varField] ?? null;
    const day = classifyDay(o.actualPnl, o.hypotheticalPnl, v, rules.missingCountsAsException);
    const isExcluded = excluded.has(o.date);
    if (day.actual) actual++;
    if (day.hypothetical) hypothetical++;
    if (isExcluded && day.actual) excludedActual++;
    if (isExcluded && day.hypothetical) excludedHypothetical++;
    // Approved exclusions do not count, so they do not enter the tests either.
    hitsActual.push(day.actual && !isExcluded);
    hitsHypothetical.push(day.hypothetical && !isExcluded);
    if (day.missing && !rules.missingCountsAsException) dataGaps.push(o.date);
    if (day.actual || day.hypothetical) {
      exceptionDays.push({
        date: o.date,
        actualPnl: o.actualPnl,
        hypotheticalPnl: o.hypotheticalPnl,
        var99: v,
        actual: day.actual,
        hypothetical: day.hypothetical,
        excluded: isExcluded,
        missing: day.missing,
        excessActual: excessOf(o.actualPnl, v),
        excessHypothetical: excessOf(o.hypotheticalPnl, v),
        ...withMakeUp(o, opts.regime),
      });
    }
  }

  const netActual = actual - excludedActual;
  const netHypothetical = hypothetical - excludedHypothetical;
  const counted = countedFromBasis(netActual, netHypothetical, basis);
  const gross = countedFromBasis(actual, hypothetical, basis);
  // For `max` the tests run on the series with more counted exceptions (ties: actual).
  const testedSeries: PnlSeriesName =
    basis === "max" ? (netHypothetical > netActual ? "hypothetical" : "actual") : basis;
  const testsBySeries = { actual: runTests(hitsActual, p), hypothetical: runTests(hitsHypothetical, p) };
  const n = bounds.observations;
  // A short (provisional) window is zoned with the full window's table and flagged complete: false.
  const zone = zoneFor(counted, rules, windowSize);

  return {
    asOf: opts.asOf,
    regime: rules.id,
    pnlBasis: basis,
    confidence,
    windowSize,
    window: {
      start: n > 0 ? observations[bounds.startIndex].date : null,
      end: n > 0 ? observations[bounds.endIndex].date : null,
      observations: n,
      complete: bounds.complete,
    },
    exceptions: { actual, hypothetical, counted, excluded: gross - counted },
    zone,
    zoneLabel: zone === "yellow" ? rules.middleZoneName : zone,
    plusFactor: plusFactorFor(counted, rules, windowSize),
    multiplier: multiplierFor(counted, rules, opts.qualitativeAddend ?? 0, windowSize),
    expected: n * p,
    tests: { cumulativeProbability: binomialCdf(counted, n, p), ...testsBySeries[testedSeries] },
    testsBySeries,
    exceptionDays,
    dataGaps,
    testedSeries,
    provisionalBoundaries: zoneBoundariesFor(rules, windowSize).provisional,
  };
}

export interface RollingOptions {
  regime: RegimeId;
  pnlBasis?: PnlBasis;
  excludedDates?: Iterable<string>;
  windowSize?: number;
  confidence?: number;
  /** Only rows dated on or after / on or before these dates are returned (the window still looks back). */
  from?: string;
  to?: string;
}

export interface RollingRow {
  date: string;
  actual: number;
  hypothetical: number;
  counted: number;
  zone: Zone;
  plusFactor: number;
  /** False while fewer than windowSize observations lie behind the date. */
  complete: boolean;
}

/** The count, zone and plus factor at every date of the series, in one O(n) pass. */
export function rollingBacktest(observations: readonly Observation[], opts: RollingOptions): RollingRow[] {
  const windowSize = opts.windowSize ?? 250;
  if (!Number.isInteger(windowSize) || windowSize < 1)
    throw new EngineInputError(`windowSize must be a positive integer, got ${windowSize}`);
  if (opts.from !== undefined) assertIsoDate(opts.from, "from");
  if (opts.to !== undefined) assertIsoDate(opts.to, "to");
  const series = toSeries(observations, opts.confidence ?? 0.99);
  const result = rollingArrays(
    series,
    [{ regime: opts.regime, pnlBasis: opts.pnlBasis, excludedDates: opts.excludedDates }],
    windowSize,
  );
  const r = result.regimes[0];
  const rows: RollingRow[] = [];
  for (let i = 0; i < series.dates.length; i++) {
    const date = series.dates[i];
    if (opts.from !== undefined && date < opts.from) continue;
    if (opts.to !== undefined && date > opts.to) break;
    rows.push({
      date,
      actual: r.actual[i],
      hypothetical: r.hypothetical[i],
      counted: r.counted[i],
      zone: zoneAt(r, i),
      plusFactor: plusFactorAt(r, i),
      complete: i + 1 >= windowSize,
    });
  }
  return rows;
}
