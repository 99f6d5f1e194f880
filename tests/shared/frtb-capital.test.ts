import fc from "fast-check";
import {
  deskPlaStanding,
  deskStatusHistory,
  frtbAggregation,
  nextDeskStatus,
  type DeskStatus,
  type FrtbDeskInput,
  topOfHouseScope,
  topScopeNote,
} from "../../shared/backtest/frtb-capital";
import type { Observation } from "../../shared/backtest/types";
import { businessDates } from "./build-observations";

/** 60 business days carrying the same figures every day. */
const flat = (values: Partial<Observation>, days = 60): Observation[] =>
  businessDates(days).map((date) => ({ date, actualPnl: 10, hypotheticalPnl: 10, var99: 100, ...values }));

const ASOF = businessDates(60)[59];

// Worked by hand (docs/rules.md#frtb-aggregation). Standardised charge = SBM + RRAO + SA DRC (MAR20.2).
const FX = { es975: 100, ses: 20, imaDrc: 15, sbm: 150, rrao: 10, saDrc: 40 }; // SA 200
const RATES = { es975: 60, ses: 10, imaDrc: 5, sbm: 120, rrao: 5, saDrc: 25 }; // SA 150
const CREDIT = { es975: 80, ses: 30, imaDrc: 9, sbm: 100, rrao: 0, saDrc: 20 }; // SA 120
const TOP = { es975: 210, ses: 55, imaDrc: 25, sbm: 300, rrao: 15, saDrc: 85 }; // SA_all 400

const desks = (statuses: [DeskStatus, DeskStatus, DeskStatus]): FrtbDeskInput[] => [
  { code: "FX", status: statuses[0], series: flat(FX) },
  { code: "RATES", status: statuses[1], series: flat(RATES) },
  { code: "CREDIT", status: statuses[2], series: flat(CREDIT) },
];

describe("FRTB aggregation (MAR33.41–33.45), worked by hand", () => {
  it("when one desk is amber and one out of the model, then C_A, IMA_G,A, C_U, k, the surcharge and ACR follow the paragraphs", () => {
    const r = frtbAggregation(flat(TOP), desks(["in-model", "amber", "out-of-model"]), ASOF, 1.5);
    // MAR33.41 over FX and RATES: IMCC 160, SES 30; max(160 + 30, 1.5 · 160 + 30) = 270 (the average binds).
    expect(r).toMatchObject({ imccPrev: 160, imccAvg: 160, sesPrev: 30, sesAvg: 30, ca: 270, binding: "average" });
    // MAR33.43: IMA_G,A = C_A + DRC = 270 + (15 + 5) = 290; C_U = CREDIT's SA = 120; SA_all from the top = 400.
    expect(r).toMatchObject({ drc: 20, imaGA: 290, cU: 120, saAll: 400 });
    // No sa_ga supplied: SA_G,A = 200 + 150 = 350 (and a note says so).
    expect(r.saGA).toBe(350);
    expect(r.sources).toEqual({ imcc: "desks", drc: "desks", saAll: "top", saGA: "desks" });
    expect(r.notes.join(" ")).toMatch(/sa_ga\) is not supplied/);
    // MAR33.45: k = 0.5 · 150 / 350 = 3/14; surcharge = 3/14 · max(0, 350 − 290) = 180/14.
    expect(r.k).toBeCloseTo(3 / 14, 12);
    expect(r.surcharge).toBeCloseTo(180 / 14, 10);
    // MAR33.43: min(290 + 12.857… + 120, 400) + max(0, 290 − 350) = 400 (the all-desk standardised figure caps it).
    expect(r.acrTotal).toBeCloseTo(400, 10);
  });

  it("when the top of house supplies SA_G,A and SA_all is higher, then the sum below the cap is the requirement (MAR33.43, 33.45)", () => {
    const top = flat({ ...TOP, sbm: 400, saGa: 330 }); // SA_all 500
    const r = frtbAggregation(top, desks(["in-model", "amber", "out-of-model"]), ASOF, 1.5);
    expect(r.saGA).toBe(330);
    expect(r.sources.saGA).toBe("top");
    // k = 0.5 · 150 / 330; surcharge = k · (330 − 290) = 3000 / 330 = 9.0909…
    expect(r.k).toBeCloseTo(75 / 330, 12);
    expect(r.surcharge).toBeCloseTo(3000 / 330, 10);
    // min(290 + 9.0909… + 120, 500) + 0 = 419.0909…
    expect(r.acrTotal).toBeCloseTo(290 + 3000 / 330 + 120, 10);
  });

  it("when IMA_G,A exceeds SA_G,A, then the surcharge is 0 and the excess is added on top of the min (MAR33.43)", () => {
    const top = flat({ ...TOP, sbm: 400, saGa: 250 });
    const r = frtbAggregation(top, desks(["in-model", "amber", "out-of-model"]), ASOF, 1.5);
    expect(r.surcharge).toBe(0);
    // min(290 + 0 + 120, 500) + max(0, 290 − 250) = 410 + 40 = 450.
    expect(r.acrTotal).toBe(450);
  });

  it("when every desk is in the model, then C_A and DRC are the top of house's and SA_G,A is SA_all (MAR33.41, 33.43)", () => {
    const r = frtbAggregation(flat(TOP), desks(["in-model", "in-model", "in-model"]), ASOF, 1.5);
    // max(210 + 55, 1.5 · 210 + 55) = 370; IMA_G,A = 370 + 25 = 395.
    expect(r).toMatchObject({ ca: 370, drc: 25, imaGA: 395, saGA: 400, cU: 0, k: 0, surcharge: 0 });
    expect(r.sources).toEqual({ imcc: "top", drc: "top", saAll: "top", saGA: "top" });
    // min(395 + 0 + 0, 400) + max(0, 395 − 400) = 395.
    expect(r.acrTotal).toBe(395);
  });

  it("when yesterday's IMCC is far above its average, then IMCC_{t−1} + SES_{t−1} binds (MAR33.41)", () => {
    const top = flat({ ...TOP, es975: 100, ses: 0 });
    top[59] = { ...top[59], es975: 400 };
    const r = frtbAggregation(top, [], ASOF, 1.5);
    // average (59 · 100 + 400) / 60 = 105; 1.5 · 105 = 157.5 < 400.
    expect(r).toMatchObject({ imccPrev: 400, imccAvg: 105, ca: 400, binding: "previous" });
  });

  it("when no standardised figure is supplied anywhere, then it refuses: ACR needs SA_all (MAR33.43)", () => {
    const top = flat({ es975: 100, ses: 0 });
    expect(() => frtbAggregation(top, [], ASOF, 1.5)).toThrow(/standardised charge of all desks/);
  });
});

describe("FRTB aggregation, properties", () => {
  const status = fc.constantFrom<DeskStatus>("in-model", "amber", "out-of-model");
  const amount = fc.integer({ min: 0, max: 1_000 });
  const desk = fc.record({ status, es: amount, ses: amount, drc: amount, sa: amount });
  const inputs = fc.record({
    desks: fc.array(desk, { minLength: 1, maxLength: 6 }),
    topSa: fc.option(amount, { nil: null }),
    saGa: fc.option(amount, { nil: null }),
    m: fc.constantFrom(1.5, 1.7, 2),
  });
  type Inputs = {
    desks: { status: DeskStatus; es: number; ses: number; drc: number; sa: number }[];
    topSa: number | null;
    saGa: number | null;
    m: number;
  };
  const run = (v: Inputs) => {
    const top = flat({ es975: 1, ses: 0, imaDrc: 0, sbm: v.topSa, saGa: v.saGa }, 5);
    const ds = v.desks.map((d, n) => ({
      code: `D${n}`,
      status: d.status,
      series: flat({ es975: d.es, ses: d.ses, imaDrc: d.drc, sbm: d.sa }, 5),
    }));
    return { v, r: frtbAggregation(top, ds, top[4].date, v.m) };
  };

  it("when the inputs are random, then ACR never exceeds SA_all plus the IMA excess term (MAR33.43)", () => {
    fc.assert(
      fc.property(inputs, (i) => {
        const { r } = run(i);
        expect(r.acrTotal).toBeLessThanOrEqual(r.saAll + Math.max(0, r.imaGA - r.saGA) + 1e-9);
        expect(r.acrTotal).toBeGreaterThanOrEqual(0);
      }),
    );
  });

  it("when no desk is amber, then k and the surcharge are 0 (MAR33.45)", () => {
    fc.assert(
      fc.property(inputs, (i) => {
        const { v, r } = run(i);
        if (v.desks.some((d) => d.status === "amber")) return;
        expect(r.k).toBe(0);
        expect(r.surcharge).toBe(0);
      }),
    );
  });

  it("when SA_all and SA_G,A are the desks' sums, then k stays between 0 and 0.5 (MAR33.45: 0.5 times a share)", () => {
    fc.assert(
      fc.property(inputs, (i) => {
        const { r } = run({ ...i, topSa: null, saGa: null });
        expect(r.k).toBeGreaterThanOrEqual(0);
        expect(r.k).toBeLessThanOrEqual(0.5 + 1e-12);
      }),
    );
  });
});

/**
 * 500 business days of one desk: 13 actual exceptions in the first 250 days, then clean days; RTPL
 * equals HPL except on the days `noRtpl` names, which have none.
 */
function deskFailingFirstYear(noRtpl: (i: number) => boolean) {
  const dates = businessDates(500);
  const series: Observation[] = dates.map((date, i) => ({
    date,
    actualPnl: i < 13 ? -150 : 10 + (i % 7),
    hypotheticalPnl: 10 + (i % 7),
    var99: 100,
    var975: 80,
    rtpl: noRtpl(i) ? null : 10 + (i % 7),
  }));
  return { dates, series };
}

describe("FRTB desk eligibility (MAR32.19, 32.43–32.45)", () => {
  const passes = {
    passes: true,
    at99: { count: 2, limit: 12, fails: false },
    at975: { count: 5, limit: 30, fails: false },
  };
  const fails99 = {
    passes: false,
    at99: { count: 13, limit: 12, fails: true },
    at975: { count: 20, limit: 30, fails: false },
  };
  const pla = (zone: "green" | "amber" | "red" | null) => ({
    zone,
    provisional: zone === null,
    observations: zone === null ? 120 : 250,
  });
  const bt = <T>(x: T) => x as unknown as Parameters<typeof nextDeskStatus>[1];

  it("when a desk fails backtesting, then it leaves the model whatever its PLA zone (MAR32.19)", () => {
    expect(nextDeskStatus("in-model", bt(fails99), pla("green")).status).toBe("out-of-model");
    expect(nextDeskStatus("amber", bt(fails99), pla("amber")).reason).toMatch(/13 exceptions at 99%/);
  });

  it("when a desk is PLA red, then it leaves the model; amber keeps it in with the surcharge (MAR32.44, 33.45)", () => {
    expect(nextDeskStatus("in-model", bt(passes), pla("red")).status).toBe("out-of-model");
    expect(nextDeskStatus("in-model", bt(passes), pla("amber")).status).toBe("amber");
    expect(nextDeskStatus("amber", bt(passes), pla("green")).status).toBe("in-model");
  });

  it("when a desk out of the model passes backtesting, then it returns only with a PLA green zone (MAR32.45)", () => {
    expect(nextDeskStatus("out-of-model", bt(passes), pla("amber")).status).toBe("out-of-model");
    expect(nextDeskStatus("out-of-model", bt(passes), pla(null)).status).toBe("out-of-model");
    expect(nextDeskStatus("out-of-model", bt(passes), pla("green")).status).toBe("in-model");
  });

  it("when the PLA is provisional, then the desk keeps its status (no zone from fewer than 250 days, MAR32.34–32.42)", () => {
    expect(nextDeskStatus("amber", bt(passes), pla(null)).status).toBe("amber");
    expect(nextDeskStatus(null, bt(passes), pla(null)).status).toBe("in-model");
  });

  it("when fewer than 250 days carry HPL and RTPL, then no zone is given and HPL-only days are listed", () => {
    const series = flat({ var975: 80 }, 250).map((o, i) => ({
      ...o,
      hypotheticalPnl: i,
      rtpl: i % 10 === 0 ? null : i,
    }));
    const s = deskPlaStanding(series, series[249].date);
    expect(s).toMatchObject({ provisional: true, zone: null, observations: 225 });
    expect(s.hplWithoutRtpl).toHaveLength(25);
    const full = series.map((o) => ({ ...o, rtpl: o.hypotheticalPnl }));
    expect(deskPlaStanding(full, full[249].date)).toMatchObject({
      provisional: false,
      zone: "green",
      observations: 250,
    });
  });

  it("when a desk fails backtesting in one quarter, then it is out at that determination and returns once within limits and green", () => {
    // 13 actual exceptions in the first 250 days, then 250 clean days; RTPL equals HPL (PLA green).
    const { dates, series } = deskFailingFirstYear(() => false);
    const history = deskStatusHistory([{ code: "FX", series }], [dates[249], dates[499]]);
    expect(history[0].desks[0]).toMatchObject({ status: "out-of-model", backtest99: 13, backtestPasses: false });
    expect(history[1].desks[0]).toMatchObject({ status: "in-model", backtest99: 0, plaZone: "green" });
  });

  it("when a signed-off quarter froze a desk's status, then that status stands and the next determination starts from it", () => {
    // The second year's PLA is provisional (225 days).
    const { dates, series } = deskFailingFirstYear((i) => i >= 250 && i % 10 === 0);
    const computed = deskStatusHistory([{ code: "FX", series }], [dates[249], dates[499]]);
    expect(computed.map((h) => h.desks[0].status)).toEqual(["out-of-model", "out-of-model"]);
    // Signed off with the desk in the model (as the data stood then): the next quarter keeps it in unless it fails.
    const frozen = new Map([[dates[249], new Map([["FX", { ...computed[0].desks[0], status: "in-model" as const }]])]]);
    const history = deskStatusHistory([{ code: "FX", series }], [dates[249], dates[499]], frozen);
    expect(history[0].desks[0].status).toBe("in-model");
    expect(history[1].desks[0]).toMatchObject({ status: "in-model", plaZone: null, backtest99: 0 });
  });
});

describe("the scope of the bank-wide backtest (docs/rules.md#frtb-scope)", () => {
  const days = businessDates(60);
  const desk = (code: string, pnl: number, status: DeskStatus) => ({
    code,
    status,
    series: days.map((date) => ({ date, actualPnl: pnl, hypotheticalPnl: pnl, var99: 100 })),
  });
  const top = (pnl: number) => days.map((date) => ({ date, actualPnl: pnl, hypotheticalPnl: pnl, var99: 100 }));
  const desksNow = [desk("FX", 30, "in-model"), desk("RATES", 20, "amber"), desk("EQ", 50, "out-of-model")];

  it("when the top of house is the sum of the desks in the model, then the note says the backtest runs on them", () => {
    const scope = topOfHouseScope(top(50), desksNow, days[59]);
    expect(scope).toEqual({ daysCompared: 60, matchesInModel: 60, matchesAll: 0, outOfModel: ["EQ"] });
    expect(topScopeNote(scope)).toMatch(/sum of the desks in the model on 60 of the 60 days.*without EQ/);
  });

  it("when the top of house still carries a desk out of the model, then the note asks for a top of house without it (MAR32, from memory)", () => {
    const scope = topOfHouseScope(top(100), desksNow, days[59]);
    expect(scope.matchesAll).toBe(60);
    expect(topScopeNote(scope)).toMatch(/sum of all desks on 60 of the 60 days compared, including EQ.*without EQ/);
  });

  it("when the statuses took effect after a quarter end, then only the days after it are compared; with every desk in the model there is nothing to say", () => {
    const scope = topOfHouseScope(top(100), desksNow, days[59], days[49]);
    expect(scope.daysCompared).toBe(10);
    expect(
      topScopeNote(topOfHouseScope(top(50), [desk("FX", 30, "in-model"), desk("R", 20, "amber")], days[59])),
    ).toBeNull();
    expect(topScopeNote(topOfHouseScope(top(7), desksNow, days[59]))).toMatch(/neither the sum/);
  });
});
