import { describe, expect, it } from "vitest";
import { withMissingBusinessDays } from "../../shared/backtest/window";
import { backtestAt } from "../../shared/backtest/exceptions";
import type { Observation } from "../../shared/backtest/types";

const day = (date: string, pnl = -10): Observation => ({ date, actualPnl: pnl, hypotheticalPnl: pnl, var99: 100 });

describe("business days that were never reported", () => {
  it("become placeholders with every value missing, skipping weekends and holidays", () => {
    // Thu 1 Jan 2026 is a holiday; Fri 2 Jan missing; Mon 5 Jan reported; Tue 6 missing; Wed 7 reported.
    const filled = withMissingBusinessDays(
      [day("2025-12-31"), day("2026-01-05"), day("2026-01-07")],
      new Set(["2026-01-01"]),
    );
    expect(filled.map((o) => [o.date, o.var99])).toEqual([
      ["2025-12-31", 100],
      ["2026-01-02", null],
      ["2026-01-05", 100],
      ["2026-01-06", null],
      ["2026-01-07", 100],
    ]);
  });

  it("count as exceptions under FRTB (MAR32.5(2)) and as data gaps elsewhere", () => {
    const series = withMissingBusinessDays([day("2026-03-02"), day("2026-03-04"), day("2026-03-05")], new Set());
    const frtb = backtestAt(series, { regime: "frtb", asOf: "2026-03-05" });
    expect(frtb.exceptions).toMatchObject({ actual: 1, hypothetical: 1, counted: 1 });
    const eu = backtestAt(series, { regime: "eu", asOf: "2026-03-05" });
    expect(eu.exceptions.counted).toBe(0);
    expect(eu.dataGaps).toEqual(["2026-03-03"]);
  });
});
