import { classifyDay } from "./exceptions";
import type { Observation } from "./types";
import { assertIsoDate, validateObservations, windowAt } from "./window";

/**
 * FRTB desk-level backtesting (Basel Framework MAR32.18–32.19): over the last 250 observations,
 * the greater of actual and hypothetical exceptions at 99% and at 97.5%; a desk fails with more
 * than 12 at 99% or more than 30 at 97.5%. A missing P&L or VaR counts as an exception (MAR32.5(2)).
 */

export const DESK_LIMITS = { var99: 12, var975: 30 } as const; // MAR32.19

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
): DeskLevelResult {
  let actual = 0;
  let hypothetical = 0;
  let missingDays = 0;
  for (let i = from; i <= to; i++) {
    const o = observations[i];
    const day = classifyDay(o.actualPnl, o.hypotheticalPnl, o[field] ?? null, true);
    if (day.actual) actual++;
    if (day.hypothetical) hypothetical++;
    if (day.missing) missingDays++;
  }
  const count = Math.max(actual, hypothetical);
  return { confidence, actual, hypothetical, count, limit, fails: count > limit, missingDays };
}

export function deskBacktest(observations: readonly Observation[], asOf: string): DeskBacktestResult {
  validateObservations(observations);
  assertIsoDate(asOf, "asOf");
  const b = windowAt(observations, asOf, 250);
  const at99 = level(observations, b.startIndex, b.endIndex, "var99", 0.99, DESK_LIMITS.var99);
  const at975 = level(observations, b.startIndex, b.endIndex, "var975", 0.975, DESK_LIMITS.var975);
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
