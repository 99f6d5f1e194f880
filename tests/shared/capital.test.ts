import { capitalAddOn, capitalRequirement, marginalCostOfNextException } from "../../shared/backtest/capital";
import { EngineInputError } from "../../shared/backtest/errors";
import type { Observation } from "../../shared/backtest/types";
import { businessDates } from "./build-observations";

const SQRT10 = Math.sqrt(10);

function days(n: number, fill: (i: number) => Partial<Observation>): Observation[] {
  return businessDates(n, "2026-06-01").map((date, i) => ({
    date,
    actualPnl: 0,
    hypotheticalPnl: 0,
    var99: null,
    ...fill(i),
  }));
}
const lastOf = (obs: Observation[]): string => obs[obs.length - 1].date;

describe("capital requirement, Basel 2.5 / EU / US", () => {
  // 60 days of constant 1-day VaR 100 and sVaR 200; capital VaR = 100·√10 = 316.228, sVaR = 632.456.
  const constant = days(60, () => ({ var99: 100, svar99: 200 }));

  it("when VaR and sVaR are constant over 60 days and there is no exception, then the requirement is 3·(100 + 200)·√10 = 2,846.05 (CRR Art. 364(1), Art. 365 √10 scaling; worked by hand)", () => {
    const r = capitalRequirement(constant, { regime: "eu", asOf: lastOf(constant), count: 0 });
    expect(r.varTerm).toBeCloseTo(300 * SQRT10, 9); // max(316.23, 3 × 316.23)
    expect(r.svarTerm).toBeCloseTo(600 * SQRT10, 9);
    expect(r.requirement).toBeCloseTo(2846.0498, 3);
    expect(r.multiplier).toBe(3);
    expect(r.binding).toBe("average");
    expect(r.inputs.varAvg60).toBeCloseTo(100 * SQRT10, 9);
    expect(r.inputs.svarAvg60).toBeCloseTo(200 * SQRT10, 9);
    expect(r.inputs).toMatchObject({ averagedObservations: 60, varScaledFromOneDay: 60 });
  });

  it("when five exceptions raise the multiplier to 3.40, then the add-on is 0.40·300·√10 = 379.47 and the next exception costs 0.10·300·√10 = 94.87 (CRR Art. 366 Table 1 from memory; worked by hand)", () => {
    const opts = { regime: "eu" as const, asOf: lastOf(constant), count: 5 };
    expect(capitalRequirement(constant, opts).requirement).toBeCloseTo(3.4 * 300 * SQRT10, 9);
    expect(capitalAddOn(constant, opts)).toBeCloseTo(379.4733, 3);
    expect(marginalCostOfNextException(constant, opts)).toBeCloseTo(94.8683, 3);
  });

  it("when 10-day figures are supplied, then they are used instead of √10 scaling: 3·300 + 3·500 = 2,400 (CRR Art. 365; worked by hand)", () => {
    const obs = days(60, () => ({ var99: 100, svar99: 200, var10d: 300, svar10d: 500 }));
    const r = capitalRequirement(obs, { regime: "basel", asOf: lastOf(obs), count: 0 });
    expect(r.requirement).toBeCloseTo(2400, 9);
    expect(r.inputs.varScaledFromOneDay).toBe(0);
  });

  it("when the latest VaR exceeds m × the average, then the previous day's figure binds and the plus factor adds nothing (12 CFR 217.204(a)(2)(i); worked by hand)", () => {
    // 59 days at 100, the last at 1,000: average 115, 3.40 × 115 = 391 < 1,000.
    const obs = days(60, (i) => ({ var10d: i === 59 ? 1000 : 100, svar10d: 0 }));
    const r = capitalRequirement(obs, { regime: "us", asOf: lastOf(obs), count: 5 });
    expect(r.inputs.varAvg60).toBeCloseTo(115, 12);
    expect(r.varTerm).toBe(1000);
    expect(r.binding).toBe("previous");
    expect(capitalAddOn(obs, { regime: "us", asOf: lastOf(obs), count: 5 })).toBe(0);
  });

  it("when more than 60 observations exist, then only the last 60 on or before the as-of date are averaged (CRR Art. 364(1), docs/rules.md#capital; our reading of t−1 documented in capital.ts)", () => {
    const obs = days(130, (i) => ({ var10d: i < 40 ? 1000 : i < 100 ? 100 : 5000, svar10d: 0 }));
    const asOf = obs[99].date;
    const r = capitalRequirement(obs, { regime: "eu", asOf, count: 0 });
    expect(r.inputs.previousDate).toBe(asOf);
    expect(r.inputs.varAvg60).toBe(100);
    expect(r.requirement).toBeCloseTo(300, 12);
  });

  it("when the supervisor's qualitative addend is 0.5, then m = 3.5 scales both averages and the add-on still counts the plus factor only (docs/rules.md#multiplier)", () => {
    const opts = { regime: "eu" as const, asOf: lastOf(constant), count: 6, qualitativeAddend: 0.5 };
    const r = capitalRequirement(constant, opts);
    expect(r.multiplier).toBeCloseTo(4, 12); // 3 + 0.50 + 0.5
    expect(capitalAddOn(constant, opts)).toBeCloseTo(0.5 * 300 * SQRT10, 9);
  });

  it("when fewer than 60 observations or no sVaR exist, then the figure is computed from what there is and warnings say so", () => {
    const obs = days(20, () => ({ var10d: 100 }));
    const r = capitalRequirement(obs, { regime: "eu", asOf: lastOf(obs), count: 0 });
    expect(r.requirement).toBe(300); // 3 × 100 with no sVaR term (worked by hand)
    expect(r.inputs.warnings.join(" ")).toMatch(/Only 20 observations/);
    expect(r.inputs.warnings.join(" ")).toMatch(/No stressed VaR/);
  });

  it("when there is no VaR at all on or before the as-of date, then it throws an EngineInputError", () => {
    const obs = days(5, () => ({}));
    expect(() => capitalRequirement(obs, { regime: "eu", asOf: lastOf(obs), count: 0 })).toThrow(EngineInputError);
    expect(() => capitalRequirement(obs, { regime: "eu", asOf: "2020-01-01", count: 0 })).toThrow(
      /No observation on or before 2020-01-01/,
    );
  });
});

describe("capital requirement, FRTB", () => {
  const obs = days(60, () => ({ es975: 100, ses: 50 }));

  it("when ES is 100 and SES 50 for 60 days with no exception, then C_A = max(150, 1.5·100 + 50) = 200 (MAR33.41; worked by hand)", () => {
    const r = capitalRequirement(obs, { regime: "frtb", asOf: lastOf(obs), count: 0 });
    expect(r.requirement).toBe(200);
    expect(r.esTerm).toBe(150);
    expect(r.sesTerm).toBe(50);
    expect(r.binding).toBe("average");
  });

  it("when ten exceptions raise m_c to 2.00, then C_A = 2·100 + 50 = 250 and the add-on 50; SES is not multiplied (MAR33.41 structure V, steps from memory; worked by hand)", () => {
    const opts = { regime: "frtb" as const, asOf: lastOf(obs), count: 10 };
    expect(capitalRequirement(obs, opts).requirement).toBe(250);
    expect(capitalAddOn(obs, opts)).toBe(50);
  });

  it("when the last day's ES + SES exceeds the averaged branch, then it binds (MAR33.41; worked by hand)", () => {
    const spike = days(60, (i) => ({ es975: i === 59 ? 700 : 100, ses: 50 }));
    // avg ES = (59·100 + 700)/60 = 110; 1.5·110 + 50 = 215 < 700 + 50 = 750
    const r = capitalRequirement(spike, { regime: "frtb", asOf: lastOf(spike), count: 0 });
    expect(r.requirement).toBe(750);
    expect(r.binding).toBe("previous");
  });
});
