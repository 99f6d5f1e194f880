import { backtestAt } from "../../shared/backtest/exceptions";
import {
  backtestingActualPnl,
  PNL_DEFINITIONS,
  pnlMakeUp,
  withPnlDefinition,
} from "../../shared/backtest/pnl-definition";
import type { Observation } from "../../shared/backtest/types";
import { buildSeries } from "./build-observations";

/**
 * A day whose supplied actual P&L (−95) does not beat VaR (100), made up of fee income +12, net
 * interest income +3, an intraday trading loss −20 and new-trade P&L +4. The expected figures below
 * are worked by hand from each rule text's list of exclusions (docs/rules.md#pnl-definition).
 */
const day: Observation = {
  date: "2026-03-10",
  actualPnl: -95,
  hypotheticalPnl: -40,
  var99: 100,
  feesCommissions: 12,
  reservesAdjustments: null,
  netInterestIncome: 3,
  intradayPnl: -20,
  newTradePnl: 4,
};

describe("actual P&L as each rule set defines it", () => {
  it("when the parts are given, then each rule set takes out what its text excludes", () => {
    // BCBS 1996 framework, fee income (common practice): −95 − 12
    expect(backtestingActualPnl(day, "basel")).toBe(-107);
    // CRR Art. 366(3), fees, commissions and net interest income (verified-secondary): −95 − 12 − 3
    expect(backtestingActualPnl(day, "eu")).toBe(-110);
    // 12 CFR 217.204(b)(1), fees, commissions, reserves, NII and intraday trading (from memory): −95 − 12 − 0 − 3 + 20
    expect(backtestingActualPnl(day, "us")).toBe(-90);
    // MAR32 actual P&L, fees and commissions and valuation adjustments (from memory): −95 − 12 − 0
    expect(backtestingActualPnl(day, "frtb")).toBe(-107);
  });

  it("when no rule set takes out new-trade P&L, then it stays in every definition (docs/rules.md#pnl-definition)", () => {
    for (const d of Object.values(PNL_DEFINITIONS)) expect(d.excludes).not.toContain("newTradePnl");
    expect(PNL_DEFINITIONS.frtb.excludes).not.toContain("intradayPnl"); // MAR32: APL includes intraday trading
  });

  it("when a day has no parts, then it is backtested as supplied and the same object is returned", () => {
    const plain: Observation = { date: "2026-03-11", actualPnl: -95, hypotheticalPnl: -40, var99: 100 };
    const [out] = withPnlDefinition([plain], "us");
    expect(out).toBe(plain);
    expect(pnlMakeUp(plain, "us")).toBeNull();
  });

  it("when amounts are in cents, then the derived P&L is exact to the cent", () => {
    const cents: Observation = { ...day, actualPnl: 0.3, feesCommissions: 0.1, netInterestIncome: 0.2 };
    expect(backtestingActualPnl(cents, "eu")).toBe(0);
    expect(backtestingActualPnl({ ...day, actualPnl: null }, "eu")).toBeNull();
  });

  it("when the make-up is asked for, then it lists every part, what was taken out and the figure compared with VaR", () => {
    const [derived] = withPnlDefinition([day], "us");
    expect(derived.suppliedActualPnl).toBe(-95);
    const makeUp = pnlMakeUp(derived, "us")!;
    expect(makeUp.supplied).toBe(-95);
    expect(makeUp.backtesting).toBe(-90);
    expect(makeUp.lines.map((l) => [l.component, l.amount, l.removed])).toEqual([
      ["feesCommissions", 12, true],
      ["reservesAdjustments", null, true],
      ["netInterestIncome", 3, true],
      ["intradayPnl", -20, true],
      ["newTradePnl", 4, false],
    ]);
    expect(makeUp.source).toMatch(/217\.204\(b\)/);
  });

  it("when a series carries the parts, then the exception count follows the rule set's P&L", () => {
    const series = buildSeries({ days: 250 });
    const i = 100;
    series[i] = { ...series[i], ...day, date: series[i].date };
    const count = (regime: "basel" | "us" | "eu" | "frtb") =>
      backtestAt(withPnlDefinition(series, regime), { regime, asOf: series[249].date, pnlBasis: "actual" });
    expect(count("eu").exceptions.actual).toBe(1);
    expect(count("us").exceptions.actual).toBe(0);
    const eu = count("eu").exceptionDays[0];
    expect(eu.actualPnl).toBe(-110);
    expect(eu.excessActual).toBe(10);
    expect(eu.actualMakeUp?.backtesting).toBe(-110);
  });
});
