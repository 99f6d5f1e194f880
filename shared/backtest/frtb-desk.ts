import { classifyDay } from "./exceptions";
import type { Observation } from "./types";
import { assertIsoDate, validateObservations, windowAt } from "./window";

/**
 * FRTB desk-level backtesting (Basel Framework MAR32.18–32.19): over the last 250 observations,
 * the greater of actual and hypothetical exceptions at 99% and at 97.5%; a desk fails with more
 * than 12 at 99% or more than 30 at 97.5%. A missing P&L or VaR counts as an exception (MAR32.5(2)).
 */

export const DESK_LIMITS = { var99: 12, var975: 30 } as const; // MAR32.19
const NONE: ReadonlySet<string> = new Set();

export interface DeskLevelResult {
  confidence: number;
  actual: number;
  hypothetical: number;
  /** The greater of actual and hypothetical (MAR32.18). */
  count: number;
  limit: number;
  /** More exceptions than the limit. */
  fails: boolean;
  /** Days whose P&L or VaR was missing and therefore counted. */
  missingDays: number;
  /** Exceptions the supervisor agreed to disregard (approved exclusions): not counted (docs/rules.md#frtb-desks). */
  excludedDays: number;
}

export interface DeskBacktestResult {
  asOf: string;
  window: { start: string | null; end: string | null; observations: number; complete: boolean };
  at99: DeskLevelResult;
  at975: DeskLevelResult;
  /** The desk passes only if neither level fails. */
  passes: boolean;
}

function level(
  observations: readonly Observation[],
  from: number,
  to: number,
  field: "var99" | "var975",
  confidence: number,
  limit: number,
  excluded: ReadonlySet<string>,
): DeskLevelResult {
  let actual = 0;
  let hypothetical = 0;
  let missingDays = 0;
  let excludedDays = 0;
  for (let i = from; i <= to; i++) {
    const o = observations[i];
    const day = classifyDay(o.actualPnl, o.hypotheticalPnl, o[field] ?? null, true);
    // A missing day has no review to exclude it: it always counts (MAR32.5(2)).
    if (!day.missing && (day.actual || day.hypothetical) && excluded.has(o.date)) {
      excludedDays++;
      continue;
    }
    if (day.actual) actual++;
    if (day.hypothetical) hypothetical++;
    if (day.missing) missingDays++;
  }
  const count = Math.max(actual, hypothetical);
  return { confidence, actual, hypothetical, count, limit, fails: count > limit, missingDays, excludedDays };
}

/**
 * `excluded`: the desk's exceptions the supervisor agreed to disregard (CRR Art. 325bf lets competent
 * authorities permit it, notably for overshootings due to non-modellable risk factors; MAR32 from memory).
 */
export function deskBacktest(
  observations: readonly Observation[],
  asOf: string,
  excluded: ReadonlySet<string> = NONE,
): DeskBacktestResult {
  validateObservations(observations);
  assertIsoDate(asOf, "asOf");
  const b = windowAt(observations, asOf, 250);
  const at99 = level(observations, b.startIndex, b.endIndex, "var99", 0.99, DESK_LIMITS.var99, excluded);
  const at975 = level(observations, b.startIndex, b.endIndex, "var975", 0.975, DESK_LIMITS.var975, excluded);
  return {
    asOf,
    window: {
      start: b.observations > 0 ? observations[b.startIndex].date : null,
      end: b.observations > 0 ? observations[b.endIndex].date : null,
      observations: b.observations,
      complete: b.complete,
    },
    at99,
    at975,
    passes: !at99.fails && !at975.fails,
  };
}
