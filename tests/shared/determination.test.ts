import { capitalInputsAt, requirementFromInputs } from "../../shared/backtest/capital";
import {
  capitalUnder,
  determinationCounting,
  determinationsFor,
  inForceOn,
  indicativeAt,
  multipliersFor,
  settingsOn,
  type DatedSettings,
  type DeterminationOptions,
} from "../../shared/backtest/determination";
import { getRegime } from "../../shared/backtest/regimes";
import type { Observation } from "../../shared/backtest/types";
import { businessDates } from "./build-observations";

const SQRT10 = Math.sqrt(10);

const base: DatedSettings = {
  id: 1,
  effectiveFrom: "1900-01-01",
  reference: "initial",
  pnlBasis: "actual",
  qualitativeAddend: 0,
  qualitativeAddendSvar: null,
  multiplierFloor: null,
  determinationFrequency: "quarterly",
};

/** 400 weekdays from 2 Jan 2025, VaR 100, P&L +10 except a loss of 150 on the days given. */
function series(lossOn: readonly string[]): Observation[] {
  const loss = new Set(lossOn);
  return businessDates(400, "2025-01-02").map((date) => ({
    date,
    actualPnl: loss.has(date) ? -150 : 10,
    hypotheticalPnl: loss.has(date) ? -150 : 10,
    var99: 100,
    svar99: 250,
  }));
}

const opts = (settings: DatedSettings[] = [], holidays = new Set<string>()): DeterminationOptions => ({
  regime: "eu",
  holidays,
  settings,
  fallback: base,
});

describe("determinations of the multiplier", () => {
  // Four exceptions before 30 June 2025's window closes, one on 15 July 2025 (mid Q3).
  const obs = series(["2025-03-03", "2025-04-01", "2025-05-02", "2025-06-02", "2025-07-15"]);

  it("when the data runs over several quarters, then there is one determination per quarter end, counted on its last business day and in force from the next one until the day before the following (12 CFR 217.204(b), BCBS 1996: quarterly; from memory)", () => {
    const dets = determinationsFor(obs, opts());
    // The data ends on 15 July 2026: Q2 2026 is the last quarter end with data.
    expect(dets.map((d) => d.periodEnd)).toEqual([
      "2025-03-31",
      "2025-06-30",
      "2025-09-30",
      "2025-12-31",
      "2026-03-31",
      "2026-06-30",
    ]);
    const q2 = dets[1];
    expect(q2).toMatchObject({
      asOf: "2025-06-30",
      effectiveFrom: "2025-07-01",
      effectiveTo: "2025-09-30",
      counted: 4,
    });
    // Four exceptions: green, plus factor 0, multiplier 3 (CRR Art. 366 Table 1, from memory).
    expect(q2).toMatchObject({ zone: "green", plusFactor: 0, multiplier: 3 });
    // Q3 counts the July exception: five, yellow, 3.40.
    expect(dets[2]).toMatchObject({ counted: 5, zone: "yellow", plusFactor: 0.4, multiplier: 3.4 });
    expect(dets.at(-1)!.effectiveTo).toBeNull();
  });

  it("when an exception arrives mid-quarter, then the indicative multiplier moves at once and the one in force only after the next quarter end", () => {
    const dets = determinationsFor(obs, opts());
    expect(indicativeAt(obs, "2025-07-15", opts())).toMatchObject({ counted: 5, multiplier: 3.4 });
    expect(inForceOn(dets, "2025-07-15")).toMatchObject({ periodEnd: "2025-06-30", multiplier: 3 });
    expect(inForceOn(dets, "2025-09-30")).toMatchObject({ periodEnd: "2025-06-30" });
    expect(inForceOn(dets, "2025-10-01")).toMatchObject({ periodEnd: "2025-09-30", multiplier: 3.4 });
    expect(inForceOn(dets, "2025-02-03")).toBeNull();
  });

  it("when the quarter's last day is a holiday or a weekend, then the count is taken on the last business day before it and is in force from the next business day", () => {
    // 30 September 2025 is a Tuesday; make it and 1 October holidays.
    const holidays = new Set(["2025-09-30", "2025-10-01"]);
    const q3 = determinationsFor(obs, opts([], holidays)).find((d) => d.periodEnd === "2025-09-30")!;
    expect(q3).toMatchObject({ asOf: "2025-09-29", effectiveFrom: "2025-10-02" });
    // 31 May 2025 is a Saturday: a monthly determination counts on Friday 30 May.
    expect(determinationCounting("2025-05-31", "monthly", new Set())).toEqual({
      periodEnd: "2025-06-30",
      asOf: "2025-06-30",
      effectiveFrom: "2025-07-01",
    });
    expect(determinationCounting("2025-05-20", "monthly", new Set())).toMatchObject({ asOf: "2025-05-30" });
  });

  it("when the frequency in force is monthly, then every month end is determined from then on (an entity setting; quarterly by default)", () => {
    const monthly = { ...base, id: 2, effectiveFrom: "2025-10-01", determinationFrequency: "monthly" as const };
    const ends = determinationsFor(obs, opts([base, monthly])).map((d) => d.periodEnd);
    expect(ends).toEqual([
      "2025-03-31",
      "2025-06-30",
      "2025-09-30",
      "2025-10-31",
      "2025-11-30",
      "2025-12-31",
      "2026-01-31",
      "2026-02-28",
      "2026-03-31",
      "2026-04-30",
      "2026-05-31",
      "2026-06-30",
    ]);
  });

  it("when a settings record takes effect from a date, then determinations on or after it use it and none before (nothing rewrites the past)", () => {
    const addend = { ...base, id: 2, effectiveFrom: "2025-08-01", reference: "SUP-1", qualitativeAddend: 0.5 };
    const dets = determinationsFor(obs, opts([base, addend]));
    expect(dets.find((d) => d.periodEnd === "2025-06-30")).toMatchObject({ multiplier: 3, settings: { id: 1 } });
    expect(dets.find((d) => d.periodEnd === "2025-09-30")).toMatchObject({ multiplier: 3.9, settings: { id: 2 } });
    expect(settingsOn([base, addend], "2025-07-31")!.id).toBe(1);
    expect(settingsOn([base, addend], "2025-08-01")!.id).toBe(2);
  });

  it("when the supervisor imposes a floor, then the multiplier never goes below it", () => {
    const floor = { qualitativeAddend: 0, qualitativeAddendSvar: null, multiplierFloor: 3.5 };
    expect(multipliersFor(0, "eu", floor)).toMatchObject({ plusFactor: 0, multiplier: 3.5, multiplierSvar: 3.5 });
    expect(multipliersFor(10, "eu", floor)).toMatchObject({ plusFactor: 1, multiplier: 4 });
  });
});

describe("EU: separate addends for the VaR and the stressed VaR multipliers (CRR Art. 366; m_c and m_s)", () => {
  const obs: Observation[] = businessDates(60, "2026-06-01").map((date) => ({
    date,
    actualPnl: 0,
    hypotheticalPnl: 0,
    var99: 100,
    svar99: 200,
  }));
  const inputs = capitalInputsAt(obs, "eu", obs[59].date);

  it("when the sVaR addend is 0.25 and the VaR addend 0.10, then m_c = 3.10 applies to VaR and m_s = 3.25 to stressed VaR (worked by hand)", () => {
    const settings = { qualitativeAddend: 0.1, qualitativeAddendSvar: 0.25, multiplierFloor: null };
    expect(multipliersFor(0, "eu", settings)).toEqual({ plusFactor: 0, multiplier: 3.1, multiplierSvar: 3.25 });
    const c = capitalUnder(inputs, "eu", 0, settings);
    expect(c.requirement).toBeCloseTo((3.1 * 100 + 3.25 * 200) * SQRT10, 9);
    // Five exceptions: plus factor 0.40 on both; the add-on is 0.40 × (100 + 200) × √10.
    expect(capitalUnder(inputs, "eu", 0.4, settings).addOn).toBeCloseTo(0.4 * 300 * SQRT10, 9);
    const one = requirementFromInputs(inputs, getRegime("eu"), 3.1).requirement;
    expect(one).toBeCloseTo(3.1 * 300 * SQRT10, 9);
  });
});

describe("US: the stressed VaR term on weekly measures (12 CFR 217.204(a)(2)(ii); 217.206(a), (b)(2))", () => {
  // Weekdays from Monday 5 January 2026 for 16 weeks; the stressed VaR is recalculated each week
  // (217.206: at least weekly) and reported every day: week k (0-based) has sVaR 100 + 10k on its
  // first four days and 1000 + k on its Friday, the week's last report.
  const obs: Observation[] = businessDates(80, "2026-01-05").map((date, i) => {
    const week = Math.floor(i / 5);
    const friday = i % 5 === 4;
    return { date, actualPnl: 0, hypotheticalPnl: 0, var99: 50, svar99: friday ? 1000 + week : 100 + 10 * week };
  });

  it("when asked on a Wednesday, then the most recent weekly measure is that week's latest and the average runs over the 12 weeks ending with it (worked by hand)", () => {
    const asOf = obs[77].date; // the Wednesday of week 15
    const inputs = capitalInputsAt(obs, "us", asOf);
    expect(inputs.svarWeeks).toBe(12);
    // Week 15 so far: 100 + 150 = 250 (its latest report); weeks 4–14: Fridays 1004 … 1014.
    expect(inputs.svarPrev).toBeCloseTo(250 * SQRT10, 9);
    const weeks = [250, ...Array.from({ length: 11 }, (_, j) => 1004 + j)];
    expect(inputs.svarAvg60).toBeCloseTo((weeks.reduce((a, b) => a + b, 0) / 12) * SQRT10, 9);
    // The EU rule averages the last 60 daily values instead.
    expect(capitalInputsAt(obs, "eu", asOf).svarWeeks).toBeUndefined();
  });
});
