import { deskBacktest } from "../../shared/backtest/frtb-desk";
import { ksStatistic, plaTest, plaZone, spearmanCorrelation } from "../../shared/backtest/pla";
import { buildSeries } from "./build-observations";

const range = (n: number): number[] => Array.from({ length: n }, (_, i) => i);

describe("FRTB desk backtesting", () => {
  it("when a desk has 12 exceptions at 99%, then it passes; with 13 it fails (MAR32.19: fail above 12)", () => {
    const twelve = buildSeries({ days: 250, actualAt: range(12), extra: { var975: 50 } });
    // var975 = 50 < loss 150, so the 97.5% level also sees these 12: within its limit of 30.
    expect(deskBacktest(twelve, twelve[249].date)).toMatchObject({
      at99: { count: 12, fails: false },
      at975: { count: 12, fails: false },
      passes: true,
    });
    const thirteen = buildSeries({ days: 250, actualAt: range(13), extra: { var975: 50 } });
    expect(deskBacktest(thirteen, thirteen[249].date)).toMatchObject({
      at99: { count: 13, fails: true },
      passes: false,
    });
  });

  it("when 31 days breach the 97.5% VaR but none the 99% VaR, then the desk fails at 97.5% only (MAR32.19: fail above 30)", () => {
    const obs = buildSeries({ days: 250, extra: { var975: 50 } });
    for (let i = 0; i < 31; i++) obs[i * 5].hypotheticalPnl = -60;
    const r = deskBacktest(obs, obs[249].date);
    expect(r.at99.count).toBe(0);
    expect(r.at975).toMatchObject({ actual: 0, hypothetical: 31, count: 31, limit: 30, fails: true });
    obs[0].hypotheticalPnl = 10;
    expect(deskBacktest(obs, obs[249].date).at975.fails).toBe(false);
  });

  it("when the 97.5% VaR is missing on a day, then that day counts as an exception on both series (MAR32.5(2))", () => {
    const obs = buildSeries({ days: 250, extra: { var975: 50 } });
    obs[3].var975 = null;
    const r = deskBacktest(obs, obs[249].date);
    expect(r.at975).toMatchObject({ actual: 1, hypothetical: 1, count: 1, missingDays: 1 });
  });
});

describe("FRTB desk backtesting with approved exclusions", () => {
  it("when the supervisor agreed to disregard one of 13 exceptions, then the desk counts 12 and passes; a missing day is never excluded (CRR Art. 325bf, verified-secondary; MAR32.5(2))", () => {
    const thirteen = buildSeries({ days: 250, actualAt: range(13), extra: { var975: 50 } });
    const asOf = thirteen[249].date;
    const excluded = new Set([thirteen[4].date]);
    expect(deskBacktest(thirteen, asOf, excluded)).toMatchObject({
      at99: { count: 12, excludedDays: 1, fails: false },
      at975: { count: 12, excludedDays: 1 },
      passes: true,
    });
    // Without the exclusion the same desk fails (MAR32.19: more than 12 at 99%).
    expect(deskBacktest(thirteen, asOf).passes).toBe(false);

    thirteen[20].var99 = null; // a missing VaR counts whatever was agreed for its date
    const r = deskBacktest(thirteen, asOf, new Set([thirteen[20].date]));
    expect(r.at99).toMatchObject({ count: 14, missingDays: 1, excludedDays: 0 });
  });
});

describe("P&L attribution test zones at their thresholds (MAR32.42)", () => {
  it.each([
    [0.81, 0.05, "green"],
    [0.8, 0.05, "amber"], // correlation = 0.80 is not > 0.80
    [0.9, 0.09, "amber"], // KS = 0.09 is not < 0.09
    [0.8000001, 0.0899999, "green"],
    [0.7, 0.05, "amber"], // correlation = 0.70 is not < 0.70
    [0.6999999, 0.05, "red"],
    [0.9, 0.12, "amber"], // KS = 0.12 is not > 0.12
    [0.9, 0.1200001, "red"],
    [0.75, 0.1, "amber"],
    [Number.NaN, 0.01, "red"],
  ] as const)(
    "when Spearman is %f and KS %f, then the zone is %s (MAR32.42; equalities fall to amber)",
    (rho, ks, zone) => {
      expect(plaZone(rho, ks)).toBe(zone);
    },
  );
});

describe("P&L attribution test on full series", () => {
  const hpl = range(250).map((i) => i + 1);

  it("when RTPL equals HPL, then Spearman is 1, KS 0 and the zone green (definition)", () => {
    expect(plaTest(hpl, hpl)).toEqual({ spearman: 1, ks: 0, zone: "green", observations: 250 });
  });

  it.each([
    [22, 0.088, "green"],
    [23, 0.092, "amber"],
    [30, 0.12, "amber"],
    [31, 0.124, "red"],
  ] as const)(
    "when RTPL is HPL shifted up by %i, then KS is %f (shift/250, worked by hand), Spearman 1 and the zone %s (MAR32.42)",
    (shift, ks, zone) => {
      const r = plaTest(
        hpl,
        hpl.map((x) => x + shift),
      );
      expect(r.ks).toBe(ks);
      expect(r.spearman).toBeCloseTo(1, 12);
      expect(r.zone).toBe(zone);
    },
  );

  /** HPL ranks reversed inside consecutive blocks: same values, so KS = 0; each block of size B adds B(B²−1)/3 to Σd². */
  function blockReversed(sizes: number[]): number[] {
    const out: number[] = [];
    let start = 0;
    for (const b of sizes) {
      for (let j = b - 1; j >= 0; j--) out.push(hpl[start + j]);
      start += b;
    }
    return out;
  }

  it.each([
    [[100, 50, 50, 50], 0.824029, "green"],
    [[100, 100, 50], 0.728028, "amber"],
    [[125, 125], 0.500024, "red"],
  ])(
    "when HPL is reversed in blocks %j, then Spearman = 1 − 6Σd²/(n(n²−1)) = %f and the zone %s (Spearman formula, worked by hand)",
    (sizes, rho, zone) => {
      // e.g. [100, 100, 50]: Σd² = (2·100·9999 + 50·2499)/3 = 708,250; 1 − 6·708,250/15,624,750 = 0.728028
      const r = plaTest(hpl, blockReversed(sizes));
      expect(r.ks).toBe(0);
      expect(r.spearman).toBeCloseTo(rho, 6);
      expect(r.zone).toBe(zone);
    },
  );

  it("when the series are longer than 250 days, then only the last 250 pairs count (MAR32.34)", () => {
    const early = range(50).map(() => 0);
    const r = plaTest([...early, ...hpl], [...range(50).map((i) => 1000 - i), ...hpl]);
    expect(r).toMatchObject({ spearman: 1, ks: 0, zone: "green", observations: 250 });
  });

  it("when values tie, then average ranks are used: x = 1,2,2,3 against 1,2,3,4 gives 4.5/√(4.5·5) = 0.948683 (worked by hand)", () => {
    expect(spearmanCorrelation([1, 2, 2, 3], [1, 2, 3, 4])).toBeCloseTo(0.948683, 6);
  });

  it("when the samples tie across series, then KS steps past the shared value on both sides: {1,2,2} vs {2,3,3} gives 2/3 (worked by hand)", () => {
    // At 1: F = 1/3 vs 0; at 2: F = 1 vs 1/3 → 2/3; at 3: 1 vs 1.
    expect(ksStatistic([1, 2, 2], [2, 3, 3])).toBeCloseTo(2 / 3, 15);
  });

  it("when the series differ in length, then it throws", () => {
    expect(() => plaTest([1, 2], [1])).toThrow(/2 days and RTPL 1/);
  });
});

describe("a desk's P&L attribution at an as-of date", () => {
  it("uses the 250 observations up to the as-of date and skips days without RTPL (MAR32.34)", async () => {
    const { deskPla, plaTest } = await import("../../shared/backtest/pla");
    const obs = Array.from({ length: 300 }, (_, i) => ({
      date: new Date(Date.UTC(2025, 0, 1) + i * 86_400_000).toISOString().slice(0, 10),
      actualPnl: 0,
      hypotheticalPnl: Math.sin(i) * 100,
      var99: 10,
      rtpl: i % 10 === 0 ? null : Math.sin(i) * 100 + Math.cos(3 * i) * 20,
    }));
    const asOf = obs[279].date;
    const window = obs.slice(30, 280).filter((o) => o.rtpl !== null);
    const expected = plaTest(
      window.map((o) => o.hypotheticalPnl),
      window.map((o) => o.rtpl as number),
    );
    expect(deskPla(obs, asOf)).toEqual(expected);
    expect(expected.observations).toBe(225); // 250 days minus the 25 without RTPL (worked by hand)
    expect(deskPla(obs, "2024-12-31")).toBeNull();
  });
});
