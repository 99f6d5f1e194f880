import { endedQuarterEnds as endedOn } from "@shared/backtest/quarters";

/**
 * The last `count` calendar quarter ends that are over at `today`, newest first, as YYYY-MM-DD.
 * The date is read in UTC, as the office's timestamps are (the rule is in shared/backtest/quarters.ts).
 */
export function endedQuarterEnds(today: Date, count = 8): string[] {
  return endedOn(today.toISOString().slice(0, 10), count);
}
