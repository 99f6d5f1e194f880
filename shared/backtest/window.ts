import { EngineInputError } from "./errors";
import { dayNumber, fromDayNumber } from "./calendar";
import type { Observation } from "./types";
import { PNL_COMPONENTS } from "./pnl-definition";
import { RISK_MEASURES } from "../schemas/common";

/** Digits at positions [from, from + length) of s as a number, or −1 if any is not a digit. */
function digits(s: string, from: number, length: number): number {
  let v = 0;
  for (let i = from; i < from + length; i++) {
    const c = s.charCodeAt(i) - 48;
    if (c < 0 || c > 9) return -1;
    v = v * 10 + c;
  }
  return v;
}

const DAYS_IN_MONTH = [31, 28, 31, 30, 31, 30, 31, 31, 30, 31, 30, 31];

/** True for a real calendar date written YYYY-MM-DD (checked by hand: this runs once per observation). */
export function isIsoDate(value: unknown): value is string {
  if (typeof value !== "string" || value.length !== 10) return false;
  if (value.charCodeAt(4) !== 45 || value.charCodeAt(7) !== 45) return false;
  const y = digits(value, 0, 4);
  const m = digits(value, 5, 2);
  const d = digits(value, 8, 2);
  if (y < 0 || m < 1 || m > 12 || d < 1) return false;
  const leap = (y % 4 === 0 && y % 100 !== 0) || y % 400 === 0;
  return d <= (m === 2 && leap ? 29 : DAYS_IN_MONTH[m - 1]);
}

const NUMERIC_FIELDS = ["actualPnl", "hypotheticalPnl", ...RISK_MEASURES, ...PNL_COMPONENTS] as const;

/**
 * Checks what the engine relies on: real ISO dates, strictly increasing (so no duplicates), and
 * every amount either null/absent or a finite number. Throws EngineInputError naming the date.
 */
export function validateObservations(observations: readonly Observation[]): void {
  let previous = "";
  for (let i = 0; i < observations.length; i++) {
    const o = observations[i];
    if (!isIsoDate(o.date)) {
      throw new EngineInputError(
        `Observation ${i + 1} has date "${String(o.date)}"; use a real date written YYYY-MM-DD`,
        {
          date: String(o.date),
          field: "date",
        },
      );
    }
    if (o.date === previous) {
      throw new EngineInputError(`Duplicate observation for ${o.date}: each business date may appear once`, {
        date: o.date,
        field: "date",
      });
    }
    if (o.date < previous) {
      throw new EngineInputError(`Observations are not in date order: ${o.date} comes after ${previous}`, {
        date: o.date,
        field: "date",
      });
    }
    for (const field of NUMERIC_FIELDS) {
      const v = o[field];
      if (v !== null && v !== undefined && !(typeof v === "number" && Number.isFinite(v))) {
        throw new EngineInputError(
          `Observation for ${o.date} has ${field} = ${String(v)}; expected a finite number or empty`,
          {
            date: o.date,
            field,
          },
        );
      }
    }
    previous = o.date;
  }
}

export function assertIsoDate(value: string, what: string): void {
  if (!isIsoDate(value))
    throw new EngineInputError(`${what} "${String(value)}" is not a real date written YYYY-MM-DD`, { field: what });
}

/** Index of the last observation dated on or before `asOf`, or −1 (dates sorted). */
export function lastIndexOnOrBefore(observations: readonly { date: string }[], asOf: string): number {
  let lo = 0;
  let hi = observations.length - 1;
  let found = -1;
  while (lo <= hi) {
    const mid = (lo + hi) >> 1;
    if (observations[mid].date <= asOf) {
      found = mid;
      lo = mid + 1;
    } else hi = mid - 1;
  }
  return found;
}

export interface WindowBounds {
  /** Index of the first observation in the window (inclusive); startIndex > endIndex when empty. */
  startIndex: number;
  /** Index of the last observation in the window (inclusive), −1 when none is on or before asOf. */
  endIndex: number;
  observations: number;
  complete: boolean;
}

/** docs/rules.md#window: the last `windowSize` observations dated on or before `asOf`. */
export function windowAt(observations: readonly { date: string }[], asOf: string, windowSize = 250): WindowBounds {
  if (!Number.isInteger(windowSize) || windowSize < 1)
    throw new EngineInputError(`windowSize must be a positive integer, got ${windowSize}`);
  const endIndex = lastIndexOnOrBefore(observations, asOf);
  const startIndex = Math.max(0, endIndex - windowSize + 1);
  const count = endIndex < 0 ? 0 : endIndex - startIndex + 1;
  return { startIndex: endIndex < 0 ? 0 : startIndex, endIndex, observations: count, complete: count >= windowSize };
}

/** Which VaR column backs a confidence level. */
export function varFieldFor(confidence: number): "var99" | "var975" {
  if (confidence === 0.99) return "var99";
  if (confidence === 0.975) return "var975";
  throw new EngineInputError(`Confidence ${confidence} is not supported; use 0.99 (var_99) or 0.975 (var_975)`, {
    field: "confidence",
  });
}

/**
 * Column-oriented copy of a portfolio's series for the hot paths: missing values become NaN,
 * so `-pnl > var` is simply false for them.
 */
export interface ObservationSeries {
  dates: string[];
  actual: Float64Array;
  hypothetical: Float64Array;
  /** The VaR at the confidence level the series was built for. */
  var: Float64Array;
  /** True when any of the three columns has a missing value. */
  hasMissing: boolean;
}

export function toSeries(observations: readonly Observation[], confidence = 0.99): ObservationSeries {
  validateObservations(observations);
  const field = varFieldFor(confidence);
  const n = observations.length;
  const dates = new Array<string>(n);
  const actual = new Float64Array(n);
  const hypothetical = new Float64Array(n);
  const v = new Float64Array(n);
  let hasMissing = false;
  for (let i = 0; i < n; i++) {
    const o = observations[i];
    dates[i] = o.date;
    const a = o.actualPnl;
    const h = o.hypotheticalPnl;
    const r = o[field];
    if (a == null || h == null || r == null) hasMissing = true;
    actual[i] = a == null ? NaN : a;
    hypothetical[i] = h == null ? NaN : h;
    v[i] = r == null ? NaN : r;
  }
  return { dates, actual, hypothetical, var: v, hasMissing };
}

/**
 * The series with a placeholder (every value null) for each business day between its first and
 * last date that has no row at all. Under FRTB such a day counts as an exception like any day with
 * P&L or VaR missing (MAR32.5(2)); the caller applies it where the rule set says so.
 */
export function withMissingBusinessDays(
  observations: readonly Observation[],
  holidays: ReadonlySet<string>,
): Observation[] {
  if (observations.length < 2) return [...observations];
  const out: Observation[] = [];
  let previous = dayNumber(observations[0].date);
  out.push(observations[0]);
  for (let i = 1; i < observations.length; i++) {
    const current = dayNumber(observations[i].date);
    for (let d = previous + 1; d < current; d++) {
      const weekday = (((d + 4) % 7) + 7) % 7;
      if (weekday === 0 || weekday === 6) continue;
      const date = fromDayNumber(d);
      if (!holidays.has(date)) out.push({ date, actualPnl: null, hypotheticalPnl: null, var99: null });
    }
    out.push(observations[i]);
    previous = current;
  }
  return out;
}
