import { whatIf } from "../../shared/backtest/what-if";
import { buildSeries } from "./build-observations";

const SQRT10 = Math.sqrt(10);
// 250 days, VaR 100, sVaR 200, three exceptions on both series: green, m = 3.
const obs = buildSeries({ days: 250, actualAt: [5, 50, 150], hypotheticalAt: [5, 50, 150], extra: { svar99: 200 } });
const asOf = obs[249].date;

describe("what-if", () => {
  it("when two extra exceptions are assumed, then the zone turns yellow, m = 3.40 and capital rises by 0.40·300·√10 = 379.47 (CRR Art. 366 Table 1 from memory; worked by hand)", () => {
    const r = whatIf(obs, { regime: "eu", asOf, extraExceptions: 2 });
    expect(r.base).toMatchObject({ zone: "green", counted: 3, plusFactor: 0, multiplier: 3, addOn: 0 });
    expect(r.base.capital).toBeCloseTo(900 * SQRT10, 9);
    expect(r.scenario).toMatchObject({ zone: "yellow", counted: 5 });
    expect(r.scenario.multiplier).toBeCloseTo(3.4, 12);
    expect(r.delta.capital).toBeCloseTo(379.4733, 3);
    expect(r.delta.addOn).toBeCloseTo(379.4733, 3);
    expect(r.delta.zoneChanged).toBe(true);
  });

  it("when VaR is scaled by 1.1 and sVaR by 0.5, then capital is 3·(110 + 100)·√10 and the zone is unchanged (CRR Art. 364(1); worked by hand)", () => {
    const r = whatIf(obs, { regime: "eu", asOf, varScale: 1.1, svarScale: 0.5 });
    expect(r.scenario.capital).toBeCloseTo(630 * SQRT10, 9);
    expect(r.delta.capital).toBeCloseTo(-270 * SQRT10, 9);
    expect(r.delta.counted).toBe(0);
    expect(r.delta.zoneChanged).toBe(false);
  });

  it("when nothing is changed, then the scenario equals the base and every delta is 0", () => {
    const r = whatIf(obs, { regime: "us", asOf });
    expect(r.scenario).toEqual(r.base);
    expect(r.delta).toEqual({ counted: 0, plusFactor: 0, multiplier: 0, capital: 0, addOn: 0, zoneChanged: false });
  });

  it("when the input is nonsense, then it throws", () => {
    expect(() => whatIf(obs, { regime: "eu", asOf, extraExceptions: -1 })).toThrow(RangeError);
    expect(() => whatIf(obs, { regime: "eu", asOf, varScale: Number.NaN })).toThrow(/varScale/);
  });
});
