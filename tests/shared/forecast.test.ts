import { addBusinessDays } from "../../shared/backtest/calendar";
import fc from "fast-check";
import { capitalInputsAt } from "../../shared/backtest/capital";
import { forecastAt, rollOffs, startingSeries, STARTING_POINT_OBSERVATIONS } from "../../shared/backtest/forecast";
import type { Observation } from "../../shared/backtest/types";
import { whatIfFromCount } from "../../shared/backtest/what-if";
import { buildSeries, businessDates } from "./build-observations";

const SQRT10 = Math.sqrt(10);
// 250 days, VaR 100 and sVaR 200 every day; five exceptions (yellow) at these indices on both series.
const AT = [10, 100, 200, 240, 245];
const obs = buildSeries({ days: 250, actualAt: AT, hypotheticalAt: AT, extra: { svar99: 200 } });
const asOf = obs[249].date;
const opts = { regime: "eu" as const, asOf };

describe("roll-off of exceptions", () => {
  it("when an exception entered at position 10 of a full window, then it leaves 250 observations later: the 11th business day after the last one (docs/rules.md#forecast; worked by hand)", () => {
    const r = rollOffs(obs, opts);
    expect(r.map((x) => x.date)).toEqual(AT.map((i) => obs[i].date));
    expect(r[0].leavesOn).toBe(addBusinessDays(asOf, 11));
    expect(r[4].leavesOn).toBe(addBusinessDays(asOf, 246));
    expect(r.map((x) => x.countAfter)).toEqual([4, 3, 2, 1, 0]);
    expect(r[0].zoneAfter).toBe("green");
    expect(r[0].plusFactorAfter).toBe(0);
  });

  it("when a holiday falls in the projection, then the roll-off moves one business day later", () => {
    const plain = rollOffs(obs, opts)[0].leavesOn;
    const holiday = addBusinessDays(asOf, 3);
    expect(rollOffs(obs, opts, new Set([holiday]))[0].leavesOn).toBe(addBusinessDays(plain, 1));
  });
});

describe("forecast at a future date", () => {
  it("when the first exception has rolled off after 11 business days, then 4 remain and P(green) = 0.99^11 = 0.895338 (docs/rules.md#forecast; worked by hand)", () => {
    const date = addBusinessDays(asOf, 11);
    const f = forecastAt(obs, { ...opts, date });
    expect(f.knownRemaining).toBe(4);
    expect(f.newDays).toBe(11);
    expect(f.distribution).toHaveLength(12);
    expect(f.distribution[0]).toEqual({ exceptions: 4, probability: expect.closeTo(0.895338, 6) });
    // P(X = 1) = 11 × 0.01 × 0.99^10 = 0.099482
    expect(f.distribution[1].probability).toBeCloseTo(0.099482, 6);
    expect(f.zones.green).toBeCloseTo(0.895338, 6);
    expect(f.zones.green + f.zones.yellow + f.zones.red).toBeCloseTo(1, 12);
    // Red needs ≥ 6 new exceptions out of 11: about 4.3e-10.
    expect(f.zones.red).toBeLessThan(1e-9);
    expect(f.ifNoNewException).toMatchObject({ counted: 4, zone: "green", plusFactor: 0, addOn: 0 });
  });

  it("when the capital inputs are constant, then the expected add-on is 300·√10 × Σ P(k)·plus(k) ≈ 300·√10 × (0.4·0.099482 + 0.5·0.005024 + 0.65·0.000152) = 40.18 (CRR Art. 366 Table 1 from memory; worked by hand)", () => {
    const f = forecastAt(obs, { ...opts, date: addBusinessDays(asOf, 11) });
    expect(f.expectedAddOn).toBeCloseTo(
      300 * SQRT10 * (0.4 * 0.0994819 + 0.5 * 0.00502434 + 0.65 * 0.000152253 + 0.75 * 3.075e-6),
      2,
    );
  });

  it("when the date lies 250 or more business days ahead, then nothing known remains and the count is Binomial(250, 1%): P(green) = 89.22% (BCBS 1996 Table 2)", () => {
    const f = forecastAt(obs, { ...opts, date: addBusinessDays(asOf, 400) });
    expect(f.knownRemaining).toBe(0);
    expect(f.newDays).toBe(250);
    expect(f.zones.green).toBeCloseTo(0.8922, 4);
  });

  it("when the date is the as-of date itself, then the forecast is today's count with certainty", () => {
    const f = forecastAt(obs, { ...opts, date: asOf });
    expect(f.newDays).toBe(0);
    expect(f.distribution).toEqual([{ exceptions: 5, probability: 1 }]);
    expect(f.zones).toEqual({ green: 0, yellow: 1, red: 0 });
    expect(f.ifNoNewException.addOn).toBeCloseTo(0.4 * 300 * SQRT10, 9);
  });

  it("when the date is before the as-of date, then it throws", () => {
    expect(() => forecastAt(obs, { ...opts, date: obs[100].date })).toThrow(/before the as-of date/);
  });
});

describe("the starting point of the forecast and the what-if", () => {
  const REGIMES = ["basel", "us", "eu", "frtb"] as const;
  const amount = fc.option(fc.integer({ min: -300, max: 300 }), { nil: null, freq: 10 });
  const day = fc.record({
    actualPnl: amount,
    hypotheticalPnl: amount,
    var99: fc.option(fc.integer({ min: 50, max: 200 }), { nil: null, freq: 10 }),
    svar99: fc.option(fc.integer({ min: 100, max: 400 }), { nil: null, freq: 10 }),
    es975: fc.option(fc.integer({ min: 50, max: 200 }), { nil: null, freq: 10 }),
  });

  it("when the forecast, what-if and capital read only the last 250 observations, then every figure equals the one on the whole history (property)", () => {
    fc.assert(
      fc.property(
        fc.array(day, { minLength: 1, maxLength: 700 }),
        fc.constantFrom(...REGIMES),
        fc.integer({ min: 0, max: 400 }),
        fc.integer({ min: 0, max: 3 }),
        (days, regime, ahead, extra) => {
          const series: Observation[] = businessDates(days.length).map((date, i) => ({ date, ...days[i] }));
          const asOf = series[series.length - 1].date;
          const start = startingSeries(series, asOf);
          expect(start.length).toBe(Math.min(series.length, STARTING_POINT_OBSERVATIONS));
          const date = addBusinessDays(asOf, ahead);
          const excludedDates = series.filter((_, i) => i % 37 === 5).map((o) => o.date);
          const opts = { regime, asOf, date, excludedDates, qualitativeAddend: 0.25 };
          expect(forecastAt(start, opts)).toEqual(forecastAt(series, opts));
          const scenario = { regime, asOf, counted: 3, extraExceptions: extra, varScale: 1.2 };
          const safely = <T>(f: () => T) => {
            try {
              return f();
            } catch (e) {
              return String(e);
            }
          };
          expect(safely(() => whatIfFromCount(start, scenario))).toEqual(
            safely(() => whatIfFromCount(series, scenario)),
          );
          expect(safely(() => capitalInputsAt(start, regime, asOf))).toEqual(
            safely(() => capitalInputsAt(series, regime, asOf)),
          );
        },
      ),
      { numRuns: 150 },
    );
  });
});
