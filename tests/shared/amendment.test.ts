import { amendmentChanges, exceptionChanges, headlineChanges } from "../../shared/backtest/amendment";
import type { SnapshotException, SnapshotFigures } from "../../shared/schemas/snapshot";

// The before/after of an amendment (docs/rules.md#amendments): only what differs is listed, amounts
// compared to the cent; the capital impact is after − before. Every expected value is worked by hand
// from the fixtures below.

const exception = (date: string, over: Partial<SnapshotException> = {}): SnapshotException => ({
  date,
  actualPnl: -150,
  hypotheticalPnl: -140,
  var99: 100,
  actual: true,
  hypothetical: true,
  excluded: false,
  excessActual: 50,
  excessHypothetical: 40,
  cause: null,
  narrative: null,
  exclusionStatus: "none",
  decisionReference: null,
  decisionDate: null,
  ...over,
});

function figures(over: Partial<SnapshotFigures> = {}): SnapshotFigures {
  return {
    portfolio: "LKS-EU-TOTAL",
    regime: "eu",
    pnlBasis: "max",
    currency: "EUR",
    asOf: "2026-09-30",
    window: { start: "2025-10-16", end: "2026-09-30", observations: 250, complete: true },
    exceptions: { actual: 5, hypothetical: 5, counted: 5, excluded: 0 },
    exceptionDates: ["2025-11-13", "2026-02-05", "2026-05-14", "2026-07-23", "2026-09-24"],
    zone: "yellow",
    zoneLabel: "Yellow",
    plusFactor: 0.4,
    qualitativeAddend: 0,
    multiplier: 3.4,
    multiplierSvar: 3.4,
    expected: 2.5,
    cumulativeProbability: 0.9588,
    capital: 3768.49,
    addOn: 443.35,
    capitalNote: null,
    desks: [],
    exceptionDetail: ["2025-11-13", "2026-02-05", "2026-05-14", "2026-07-23", "2026-09-24"].map((d) => exception(d)),
    ...over,
  };
}

describe("an amendment's before and after", () => {
  it("when nothing differs (amounts equal to the cent), then no change is listed and the capital impact is 0", () => {
    const a = amendmentChanges(figures(), figures({ capital: 3768.494 }), "2026-09-30");
    expect(a.changes).toEqual([]);
    expect(a.exceptions).toEqual([]);
    expect(a.capitalImpact).toEqual({ before: 3768.49, after: 3768.494, change: 0, currency: "EUR" });
  });

  it("when one exception of five is restated away, then count, zone, plus factor, multipliers and capital change, and the day is removed", () => {
    const after = figures({
      exceptions: { actual: 4, hypothetical: 4, counted: 4, excluded: 0 },
      exceptionDates: ["2025-11-13", "2026-02-05", "2026-05-14", "2026-07-23"],
      zone: "green",
      zoneLabel: "Green",
      plusFactor: 0,
      multiplier: 3,
      multiplierSvar: 3,
      capital: 3325.13,
      addOn: 0,
      exceptionDetail: ["2025-11-13", "2026-02-05", "2026-05-14", "2026-07-23"].map((d) => exception(d)),
    });
    const keys = headlineChanges(figures(), after).map((c) => [c.key, c.before, c.after]);
    expect(keys).toEqual([
      ["actual", 5, 4],
      ["hypothetical", 5, 4],
      ["counted", 5, 4],
      ["zone", "yellow", "green"],
      ["plusFactor", 0.4, 0],
      ["multiplier", 3.4, 3],
      ["multiplierSvar", 3.4, 3],
      ["capital", 3768.49, 3325.13],
      ["addOn", 443.35, 0],
    ]);
    const a = amendmentChanges(figures(), after, "2026-09-30");
    // 3325.13 − 3768.49 = −443.36 (worked by hand).
    expect(a.capitalImpact.change).toBe(-443.36);
    // The return data follows the figures: C 24.00 c140 (overshootings) and c150 (m_c) among them.
    const ret = a.changes.filter((c) => c.group === "return");
    expect(ret.find((c) => c.templateRow === "C 24.00 r010 c140")).toMatchObject({ before: 5, after: 4 });
    expect(ret.find((c) => c.templateRow === "C 24.00 r010 c150")).toMatchObject({ before: 3.4, after: 3 });
    expect(a.exceptions).toEqual([
      { date: "2026-09-24", change: "removed", detail: "No longer an exception after the restatement." },
    ]);
  });

  it("when a day becomes an exception and another's amounts move, then it is listed as added and the other as changed, in words", () => {
    const before = figures();
    const after = figures({
      exceptionDetail: [
        exception("2025-11-13", { actualPnl: -180, excessActual: 80 }),
        exception("2026-01-08", { actualPnl: -120, hypothetical: false, hypotheticalPnl: -90 }),
        ...["2026-02-05", "2026-05-14", "2026-07-23", "2026-09-24"].map((d) => exception(d)),
      ],
    });
    expect(exceptionChanges(before, after)).toEqual([
      { date: "2025-11-13", change: "changed", detail: "actual P&L -150 → -180." },
      {
        date: "2026-01-08",
        change: "added",
        detail: "New exception on actual P&L: actual P&L -120, hypothetical -90, VaR 100.",
      },
    ]);
  });

  it("when either side has no capital figure, then the impact is not given rather than guessed", () => {
    const a = amendmentChanges(figures({ capital: null, addOn: null }), figures(), "2026-09-30");
    expect(a.capitalImpact.change).toBeNull();
    expect(a.changes.find((c) => c.key === "capital")).toMatchObject({ before: null, after: 3768.49 });
  });
});
