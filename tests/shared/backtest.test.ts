import fc from "fast-check";
import { EngineInputError } from "../../shared/backtest/errors";
import { backtestAt, rollingBacktest } from "../../shared/backtest/exceptions";
import { plusFactorAt, rollingArrays, zoneAt, type RollingRequest } from "../../shared/backtest/rolling";
import { toSeries } from "../../shared/backtest/window";
import type { Observation } from "../../shared/backtest/types";
import { buildSeries } from "./build-observations";

const lastDate = (obs: Observation[]): string => obs[obs.length - 1].date;

describe("backtest at an as-of date", () => {
  it("when five exceptions fall in the window, then the zone is yellow, the plus factor 0.40 and the multiplier 3.40 (BCBS 1996 Table 2, from memory for 0.40)", () => {
    const obs = buildSeries({ days: 250, actualAt: [3, 50, 90, 140, 200], hypotheticalAt: [3, 50, 90, 140, 200] });
    const r = backtestAt(obs, { regime: "basel", asOf: lastDate(obs) });
    expect(r.exceptions).toEqual({ actual: 5, hypothetical: 5, counted: 5, excluded: 0 });
    expect(r.zone).toBe("yellow");
    expect(r.plusFactor).toBeCloseTo(0.4, 12);
    expect(r.multiplier).toBeCloseTo(3.4, 12);
    expect(r.window).toEqual({ start: obs[0].date, end: lastDate(obs), observations: 250, complete: true });
    // BCBS 1996 Table 2: P(X ≤ 5) = 95.88%
    expect(r.tests.cumulativeProbability).toBeCloseTo(0.9588, 4);
    expect(r.expected).toBeCloseTo(2.5, 12); // 250 × 1%
    expect(r.provisionalBoundaries).toBe(false);
    expect(r.exceptionDays.map((d) => d.date)).toEqual([3, 50, 90, 140, 200].map((i) => obs[i].date));
  });

  it("when the series is longer than the window, then only the last 250 observations on or before the as-of date count (docs/rules.md#window)", () => {
    const obs = buildSeries({ days: 320, actualAt: [10, 100, 310], hypotheticalAt: [] });
    const asOf = obs[299].date;
    const r = backtestAt(obs, { regime: "us", asOf });
    expect(r.window).toEqual({ start: obs[50].date, end: asOf, observations: 250, complete: true });
    expect(r.exceptions.actual).toBe(1); // index 10 has left the window, index 310 is after asOf
  });

  it("when the as-of date falls on a weekend, then the window ends on the last observation before it", () => {
    const obs = buildSeries({ days: 10, first: "2026-09-14" }); // Monday 14 Sep … Friday 25 Sep 2026
    const r = backtestAt(obs, { regime: "eu", asOf: "2026-09-27" });
    expect(r.window.end).toBe("2026-09-25");
  });

  it("when the loss equals VaR exactly, then it is not an exception; a cent more is (docs/rules.md#exception: −pnl > var strictly)", () => {
    const obs = buildSeries({ days: 3 });
    obs[1].actualPnl = -100;
    obs[2].actualPnl = -100.01;
    const r = backtestAt(obs, { regime: "us", asOf: lastDate(obs) });
    expect(r.exceptions.actual).toBe(1);
    expect(r.exceptionDays[0].date).toBe(obs[2].date);
    expect(r.exceptionDays[0].excessActual).toBeCloseTo(0.01, 9);
  });

  it("when actual and hypothetical counts differ, then each basis counts its own series and max takes the higher (EBA Q&A 2016_2759; MAR32.5(1))", () => {
    const obs = buildSeries({ days: 250, actualAt: [1, 2, 3], hypotheticalAt: [10, 20, 30, 40, 50, 60] });
    const asOf = lastDate(obs);
    const eu = backtestAt(obs, { regime: "eu", asOf });
    expect(eu.pnlBasis).toBe("max");
    expect(eu.exceptions).toMatchObject({ actual: 3, hypothetical: 6, counted: 6 });
    expect(eu.testedSeries).toBe("hypothetical");
    expect(eu.tests.kupiec).toEqual(eu.testsBySeries.hypothetical.kupiec);
    const us = backtestAt(obs, { regime: "us", asOf });
    expect(us.pnlBasis).toBe("actual");
    expect(us.exceptions.counted).toBe(3);
    expect(us.testedSeries).toBe("actual");
    expect(backtestAt(obs, { regime: "eu", asOf, pnlBasis: "hypothetical" }).exceptions.counted).toBe(6);
  });

  it("when the supervisor approved the exclusion of an exception, then it is subtracted from the counted figure and reported as excluded (docs/rules.md#exclusions)", () => {
    const obs = buildSeries({ days: 250, actualAt: [1, 2, 3, 4, 5, 6], hypotheticalAt: [1, 2, 3, 4, 5] });
    const r = backtestAt(obs, { regime: "eu", asOf: lastDate(obs), excludedDates: [obs[6].date, obs[100].date] });
    // Actual 6 − 1 excluded = 5, hypothetical 5: counted 5; the exclusion took one off the count of 6.
    expect(r.exceptions).toEqual({ actual: 6, hypothetical: 5, counted: 5, excluded: 1 });
    expect(r.zone).toBe("yellow");
    expect(r.exceptionDays.find((d) => d.date === obs[6].date)?.excluded).toBe(true);
    // The excluded day no longer enters the tests either: 5 exceptions in 250.
    expect(r.testsBySeries.actual.kupiec.statistic).toBeCloseTo(1.956811, 5);
  });

  it("when an excluded day shares its exception on both series, then both counts drop (docs/rules.md#exclusions)", () => {
    const obs = buildSeries({ days: 250, actualAt: [1, 2, 3, 4, 5], hypotheticalAt: [1, 2, 3, 4, 5] });
    const r = backtestAt(obs, { regime: "basel", asOf: lastDate(obs), excludedDates: new Set([obs[1].date]) });
    expect(r.exceptions).toEqual({ actual: 5, hypothetical: 5, counted: 4, excluded: 1 });
    expect(r.zone).toBe("green"); // zero exceptions lie in the green zone (BCBS 1996 Table 2)
  });

  it("when FRTB sees a day with P&L missing, then it counts as an exception on that series; VaR missing counts on both (MAR32.5(2))", () => {
    const obs = buildSeries({ days: 250 });
    obs[10].actualPnl = null;
    obs[20].var99 = null;
    const r = backtestAt(obs, { regime: "frtb", asOf: lastDate(obs) });
    expect(r.exceptions).toEqual({ actual: 2, hypothetical: 1, counted: 2, excluded: 0 });
    expect(r.dataGaps).toEqual([]);
    expect(r.exceptionDays.map((d) => [d.date, d.missing, d.actual, d.hypothetical])).toEqual([
      [obs[10].date, true, true, false],
      [obs[20].date, true, true, true],
    ]);
  });

  it("when the EU rule set sees the same missing values, then they are data gaps and not exceptions (docs/rules.md#missing-values)", () => {
    const obs = buildSeries({ days: 250 });
    obs[10].actualPnl = null;
    obs[20].var99 = null;
    const r = backtestAt(obs, { regime: "eu", asOf: lastDate(obs) });
    expect(r.exceptions.counted).toBe(0);
    expect(r.dataGaps).toEqual([obs[10].date, obs[20].date]);
  });

  it("when fewer than 250 observations exist, then the result is marked incomplete (docs/rules.md#window)", () => {
    const obs = buildSeries({ days: 120, actualAt: [5] });
    const r = backtestAt(obs, { regime: "us", asOf: lastDate(obs) });
    expect(r.window.complete).toBe(false);
    expect(r.window.observations).toBe(120);
    expect(r.expected).toBeCloseTo(1.2, 12);
  });

  it("when no observation lies on or before the as-of date, then the window is empty and green", () => {
    const obs = buildSeries({ days: 5, first: "2026-01-05" });
    const r = backtestAt(obs, { regime: "eu", asOf: "2025-12-31" });
    expect(r.window).toEqual({ start: null, end: null, observations: 0, complete: false });
    expect(r.zone).toBe("green");
  });

  it("when the window is not 250 observations, then the boundaries are derived and flagged provisional (BCBS 1996 binomial rule)", () => {
    const obs = buildSeries({ days: 500, actualAt: [1, 2, 3, 4, 5, 6, 7, 8, 9], hypotheticalAt: [] });
    const r = backtestAt(obs, { regime: "us", asOf: lastDate(obs), windowSize: 500 });
    expect(r.provisionalBoundaries).toBe(true);
    expect(r.zone).toBe("yellow"); // yellow from 9 in 500 (computed)
  });

  it("when backtesting the 97.5% VaR, then the var975 column is compared and 2.5% expected (MAR32.18)", () => {
    const obs = buildSeries({ days: 250, extra: { var975: 5 } });
    const r = backtestAt(obs, { regime: "frtb", asOf: lastDate(obs), confidence: 0.975 });
    expect(r.exceptions.counted).toBe(0);
    obs[7].actualPnl = -6;
    expect(backtestAt(obs, { regime: "frtb", asOf: lastDate(obs), confidence: 0.975 }).exceptions.actual).toBe(1);
    expect(r.expected).toBeCloseTo(6.25, 12);
  });
});

describe("input validation", () => {
  it("when two observations share a date, then it throws an EngineInputError naming the date", () => {
    const obs = buildSeries({ days: 5 });
    obs[3].date = obs[2].date;
    expect(() => backtestAt(obs, { regime: "eu", asOf: "2030-01-01" })).toThrow(EngineInputError);
    expect(() => backtestAt(obs, { regime: "eu", asOf: "2030-01-01" })).toThrow(
      `Duplicate observation for ${obs[2].date}`,
    );
  });

  it("when dates are out of order, then it throws naming both dates", () => {
    const obs = buildSeries({ days: 5 });
    [obs[1], obs[2]] = [obs[2], obs[1]];
    expect(() => rollingBacktest(obs, { regime: "eu" })).toThrow(`${obs[2].date} comes after ${obs[1].date}`);
  });

  it("when a date is not a real calendar day, or an amount is not finite, then it throws naming the row", () => {
    const bad = buildSeries({ days: 3 });
    bad[1].date = "2025-02-30";
    expect(() => backtestAt(bad, { regime: "eu", asOf: "2030-01-01" })).toThrow(/2025-02-30/);
    const nan = buildSeries({ days: 3 });
    nan[2].var99 = Number.NaN;
    expect(() => backtestAt(nan, { regime: "eu", asOf: "2030-01-01" })).toThrow(new RegExp(`${nan[2].date} has var99`));
  });

  it("when the as-of date or the confidence is malformed, then it throws an EngineInputError", () => {
    const obs = buildSeries({ days: 3 });
    expect(() => backtestAt(obs, { regime: "eu", asOf: "30/09/2026" })).toThrow(EngineInputError);
    expect(() => backtestAt(obs, { regime: "eu", asOf: "2026-09-30", confidence: 0.95 })).toThrow(/0.99/);
  });
});

/** Up to `maxLength` days of small P&L, each with a `gap` drawn from 0 to `maxGap` (a low draw leaves a value out). */
const pnlDays = (maxGap: number, maxLength: number) =>
  fc.array(
    fc.record({
      pnl: fc.integer({ min: -30, max: 10 }),
      hyp: fc.integer({ min: -30, max: 10 }),
      gap: fc.integer({ min: 0, max: maxGap }),
    }),
    { minLength: 1, maxLength },
  );

describe("rolling backtest", () => {
  it("when computed over a series, then every row equals a backtest at that date (cross-check of the sliding count)", () => {
    fc.assert(
      fc.property(
        pnlDays(40, 60),
        fc.constantFrom("basel", "us", "eu", "frtb" as const),
        fc.integer({ min: 1, max: 20 }),
        fc.array(fc.nat(59), { maxLength: 5 }),
        (days, regime, windowSize, excludedIdx) => {
          const obs = buildSeries({ days: days.length, var99: 20 }).map((o, i) => ({
            ...o,
            actualPnl: days[i].gap === 0 ? null : days[i].pnl,
            hypotheticalPnl: days[i].hyp,
            var99: days[i].gap === 1 ? null : 20,
          }));
          const excludedDates = excludedIdx.filter((i) => i < obs.length).map((i) => obs[i].date);
          const rows = rollingBacktest(obs, { regime, windowSize, excludedDates });
          expect(rows).toHaveLength(obs.length);
          for (const row of rows) {
            const at = backtestAt(obs, { regime, asOf: row.date, windowSize, excludedDates });
            expect([row.actual, row.hypothetical, row.counted, row.zone, row.plusFactor, row.complete]).toEqual([
              at.exceptions.actual,
              at.exceptions.hypothetical,
              at.exceptions.counted,
              at.zone,
              at.plusFactor,
              at.window.complete,
            ]);
          }
        },
      ),
      { numRuns: 150 },
    );
  });

  it("when several rule sets and bases are computed in one pass, then each equals its own backtest at every date (cross-check of the shared pass)", () => {
    fc.assert(
      fc.property(pnlDays(30, 50), fc.integer({ min: 1, max: 15 }), fc.boolean(), (days, windowSize, withGaps) => {
        const obs = buildSeries({ days: days.length, var99: 20 }).map((o, i) => ({
          ...o,
          actualPnl: withGaps && days[i].gap === 0 ? null : days[i].pnl,
          hypotheticalPnl: days[i].hyp,
        }));
        const excludedDates = [obs[0].date];
        const requests: RollingRequest[] = [
          { regime: "basel" },
          { regime: "us" },
          { regime: "eu" },
          { regime: "frtb" },
          { regime: "eu", pnlBasis: "hypothetical" },
          { regime: "us", pnlBasis: "max" },
          { regime: "basel", pnlBasis: "actual" },
          { regime: "frtb", pnlBasis: "actual", excludedDates },
        ];
        const result = rollingArrays(toSeries(obs), requests, windowSize);
        requests.forEach((req, k) => {
          const r = result.regimes[k];
          obs.forEach((o, i) => {
            const at = backtestAt(obs, { ...req, asOf: o.date, windowSize });
            expect([r.actual[i], r.hypothetical[i], r.counted[i], zoneAt(r, i), plusFactorAt(r, i)]).toEqual([
              at.exceptions.actual,
              at.exceptions.hypothetical,
              at.exceptions.counted,
              at.zone,
              at.plusFactor,
            ]);
          });
        });
      }),
      { numRuns: 60 },
    );
  });

  it("when from and to are given, then only rows in that range are returned but the window still looks back", () => {
    const obs = buildSeries({ days: 300, actualAt: [5], hypotheticalAt: [5] });
    const rows = rollingBacktest(obs, { regime: "eu", from: obs[200].date, to: obs[210].date });
    expect(rows.map((r) => r.date)).toEqual(obs.slice(200, 211).map((o) => o.date));
    expect(rows[0].counted).toBe(1);
  });
});
