import { quarterLabel } from "@shared/backtest/quarters";

/**
 * How a determination of the multiplier is named on every screen (docs/rules.md#determination):
 * the count is taken at a period end and its multiplier stays in force until the next one.
 */

const quarterMonths = new Set(["03", "06", "09", "12"]);

/** "Q3 2026" for a quarter end; a monthly determination is named by its month end. */
export function periodLabel(periodEnd: string): string {
  return quarterMonths.has(periodEnd.slice(5, 7)) ? quarterLabel(periodEnd) : `month end ${periodEnd}`;
}

export const determinationStatusWords = {
  provisional: "provisional",
  approved: "approved",
  filed: "filed",
} as const;

/** "in force since 2026-10-01 (Q3 2026, approved)" */
export function inForceSince(d: {
  effectiveFrom: string;
  quarterEnd: string;
  status: keyof typeof determinationStatusWords;
}): string {
  return `in force since ${d.effectiveFrom} (${periodLabel(d.quarterEnd)}, ${determinationStatusWords[d.status]})`;
}

/** When a change would bite: "from 2027-01-04 (the Q4 2026 determination)". */
export function bitesFromWords(p: { quarterEnd: string; effectiveFrom: string }): string {
  return `from ${p.effectiveFrom} (the ${periodLabel(p.quarterEnd)} determination)`;
}
