import fc from "fast-check";
import { capitalAddOn, capitalRequirement } from "../../shared/backtest/capital";
import { backtestAt, rollingBacktest } from "../../shared/backtest/exceptions";
import { multiplierFor, plusFactorFor, zoneFor } from "../../shared/backtest/regimes";
import type { Observation, Zone } from "../../shared/backtest/types";
import type { RegimeId } from "../../shared/schemas/common";
import { businessDates } from "./build-observations";

// Property tests (common practice): invariants the figures must keep for any input.

const REGIME = fc.constantFrom<RegimeId>("basel", "us", "eu", "frtb");
const ZONE_RANK: Record<Zone, number> = { green: 0, yellow: 1, red: 2 };

const amount = fc.option(fc.integer({ min: -300, max: 300 }), { nil: null, freq: 10 });
const day = fc.record({
  actualPnl: amount,
  hypotheticalPnl: amount,
  var99: fc.option(fc.integer({ min: 0, max: 200 }), { nil: null, freq: 10 }),
});

function asObservations(days: Array<Omit<Observation, "date">>): Observation[] {
  const dates = businessDates(days.length + 1, "2024-01-02");
  return days.map((d, i) => ({ ...d, date: dates[i] }));
}

describe("engine invariants", () => {
  it("the counted figure never exceeds the window, at any date and for any rule set", () => {
    fc.assert(
      fc.property(
        fc.array(day, { minLength: 1, maxLength: 400 }),
        REGIME,
        fc.integer({ min: 1, max: 300 }),
        (days, regime, windowSize) => {
          for (const row of rollingBacktest(asObservations(days), { regime, windowSize })) {
            expect(row.counted).toBeLessThanOrEqual(windowSize);
            expect(Math.max(row.actual, row.hypothetical)).toBeLessThanOrEqual(windowSize);
            expect(row.counted).toBeGreaterThanOrEqual(0);
          }
        },
      ),
      { numRuns: 100 },
    );
  });

  it("appending a day without an exception never raises the count", () => {
    fc.assert(
      fc.property(
        fc.array(day, { minLength: 0, maxLength: 300 }),
        REGIME,
        fc.integer({ min: 0, max: 500 }),
        (days, regime, gain) => {
          const before = asObservations(days);
          const dates = businessDates(days.length + 1, "2024-01-02");
          const after = [...before, { date: dates[days.length], actualPnl: gain, hypotheticalPnl: gain, var99: 100 }];
          const asOfBefore = before.length ? before[before.length - 1].date : "2024-01-01";
          const countBefore = backtestAt(before, { regime, asOf: asOfBefore }).exceptions.counted;
          const countAfter = backtestAt(after, { regime, asOf: dates[days.length] }).exceptions.counted;
          expect(countAfter).toBeLessThanOrEqual(countBefore);
        },
      ),
      { numRuns: 200 },
    );
  });

  it("the zone, the plus factor and the multiplier never fall as the count rises, for any window size", () => {
    fc.assert(
      fc.property(
        REGIME,
        fc.integer({ min: 20, max: 2000 }),
        fc.integer({ min: 0, max: 400 }),
        (regime, windowSize, k) => {
          for (const w of [250, windowSize]) {
            expect(ZONE_RANK[zoneFor(k + 1, regime, w)]).toBeGreaterThanOrEqual(ZONE_RANK[zoneFor(k, regime, w)]);
            expect(plusFactorFor(k + 1, regime, w)).toBeGreaterThanOrEqual(plusFactorFor(k, regime, w));
            expect(multiplierFor(k + 1, regime, 0.2, w)).toBeGreaterThanOrEqual(multiplierFor(k, regime, 0.2, w));
          }
        },
      ),
    );
  });

  it("the capital add-on is never negative: the requirement with the plus factor is never below the one without it (checked unclamped)", () => {
    const positive = fc.option(fc.double({ min: 0, max: 1e9, noNaN: true }), { nil: null, freq: 8 });
    fc.assert(
      fc.property(
        fc.array(
          fc.record({
            var99: positive,
            svar99: positive,
            var10d: positive,
            svar10d: positive,
            es975: positive,
            ses: positive,
          }),
          { minLength: 1, maxLength: 80 },
        ),
        REGIME,
        fc.integer({ min: 0, max: 30 }),
        fc.double({ min: 0, max: 2, noNaN: true }),
        (days, regime, count, addend) => {
          const obs = asObservations(
            days.map((d) => ({ ...d, actualPnl: 0, hypotheticalPnl: 0, var99: d.var99 ?? 1, es975: d.es975 ?? 1 })),
          );
          const asOf = obs[obs.length - 1].date;
          const addOn = capitalAddOn(obs, { regime, asOf, count, qualitativeAddend: addend });
          expect(addOn).toBeGreaterThanOrEqual(0);
          // capitalAddOn clamps at 0, so compare the two requirements themselves as well.
          const withPlus = capitalRequirement(obs, { regime, asOf, count, qualitativeAddend: addend }).requirement;
          const without = capitalRequirement(obs, {
            regime,
            asOf,
            count,
            qualitativeAddend: addend,
            plusFactor: 0,
          }).requirement;
          expect(withPlus).toBeGreaterThanOrEqual(without);
          expect(Number.isFinite(addOn)).toBe(true);
        },
      ),
      { numRuns: 200 },
    );
  });
});
