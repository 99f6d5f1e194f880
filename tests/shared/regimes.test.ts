import type { RegimeId } from "../../shared/schemas/common";
import {
  deriveZoneBoundaries,
  getRegime,
  multiplierFor,
  plusFactorFor,
  REGIMES,
  zoneBoundariesFor,
  zoneFor,
} from "../../shared/backtest/regimes";
import { zoneLabel } from "../../shared/backtest/types";

// Full schedules k = 0..12. Plus factors: BCBS 1996 Table 2 and MAR99; status in docs/rules.md#rule-sets.
const BASEL_1996_PLUS = [0, 0, 0, 0, 0, 0.4, 0.5, 0.65, 0.75, 0.85, 1, 1, 1];
const FRTB_PLUS = [0, 0, 0, 0, 0, 0.2, 0.26, 0.33, 0.38, 0.42, 0.5, 0.5, 0.5];
const ZONES = [
  "green",
  "green",
  "green",
  "green",
  "green",
  "yellow",
  "yellow",
  "yellow",
  "yellow",
  "yellow",
  "red",
  "red",
  "red",
] as const;

const SCHEDULES: Array<[RegimeId, string, number, readonly number[]]> = [
  ["basel", "BCBS 2009 para 718(Lxxvi) with BCBS 1996 Table 2 plus factors (from memory)", 3, BASEL_1996_PLUS],
  ["eu", "CRR Art. 366 Table 1 addends (from memory)", 3, BASEL_1996_PLUS],
  ["us", "12 CFR 217.204(b) Table 1 multiplication factors 3.00–4.00 (from memory)", 3, BASEL_1996_PLUS],
  ["frtb", "MAR33.42 range 0–0.5 and MAR99 steps (secondary source, docs/rules.md#frtb)", 1.5, FRTB_PLUS],
];

describe.each(SCHEDULES)("the %s rule set", (id, source, base, plus) => {
  it.each(plus.map((pf, k) => [k, ZONES[k], pf] as const))(
    `when %i exceptions fall in 250 days, then the zone is %s and the plus factor %f (${source})`,
    (k, zone, pf) => {
      expect(zoneFor(k, id)).toBe(zone);
      expect(plusFactorFor(k, id)).toBeCloseTo(pf, 12);
      expect(multiplierFor(k, id)).toBeCloseTo(base + pf, 12);
    },
  );
});

describe("multiplication factors of the US rule", () => {
  it("when the count runs 4..10, then the multiplication factor is 3.00/3.40/3.50/3.65/3.75/3.85/4.00 (12 CFR 217.204(b) Table 1, from memory)", () => {
    const factors = [4, 5, 6, 7, 8, 9, 10].map((k) => Number(multiplierFor(k, "us").toFixed(2)));
    expect(factors).toEqual([3, 3.4, 3.5, 3.65, 3.75, 3.85, 4]);
  });

  it("when FRTB counts 4..10, then m_c is 1.50/1.70/1.76/1.83/1.88/1.92/2.00 (MAR99 steps, secondary source: docs/rules.md#frtb)", () => {
    const factors = [4, 5, 6, 7, 8, 9, 10].map((k) => Number(multiplierFor(k, "frtb").toFixed(2)));
    expect(factors).toEqual([1.5, 1.7, 1.76, 1.83, 1.88, 1.92, 2]);
  });

  it("when the supervisor sets a qualitative addend of 0.3, then it is added to the multiplier (docs/rules.md#multiplier)", () => {
    expect(multiplierFor(6, "eu", 0.3)).toBeCloseTo(3.8, 12);
  });
});

describe("rule sets as data", () => {
  it("when each rule set is read, then it carries its label, citation, base multiplier and default basis (docs/rules.md#rule-sets)", () => {
    expect(getRegime("basel")).toMatchObject({
      label: "Basel 2.5",
      baseMultiplier: 3,
      defaultPnlBasis: "max",
      missingCountsAsException: false,
    });
    expect(getRegime("us")).toMatchObject({
      label: "US market risk rule",
      baseMultiplier: 3,
      defaultPnlBasis: "actual",
    });
    expect(getRegime("eu")).toMatchObject({ label: "EU CRR", baseMultiplier: 3, defaultPnlBasis: "max" });
    expect(getRegime("frtb")).toMatchObject({
      label: "FRTB IMA",
      baseMultiplier: 1.5,
      defaultPnlBasis: "max",
      missingCountsAsException: true,
    });
    for (const r of Object.values(REGIMES)) {
      expect(r.citation.length).toBeGreaterThan(10);
      expect(r.zoneBoundaries).toEqual({ yellowFrom: 5, redFrom: 10 });
    }
  });

  it("when an unknown rule set is asked for, then it throws naming the known ones", () => {
    expect(() => getRegime("xx" as RegimeId)).toThrow(/basel, us, eu, frtb/);
  });

  it("when FRTB is in the middle zone, then it is labelled amber, and yellow elsewhere (MAR99; docs/rules.md#traffic-light)", () => {
    expect(zoneLabel("yellow", "frtb")).toBe("amber");
    expect(zoneLabel("yellow", "eu")).toBe("yellow");
    expect(zoneLabel("red", "frtb")).toBe("red");
  });
});

describe("zone boundaries by the binomial rule", () => {
  it("when derived for 250 observations at 99%, then yellow starts at 5 and red at 10 (BCBS 1996 Table 2)", () => {
    expect(deriveZoneBoundaries(250)).toEqual({ yellowFrom: 5, redFrom: 10 });
  });

  it("when the window is 250, then the boundaries are the table's and not provisional", () => {
    expect(zoneBoundariesFor("eu", 250)).toEqual({ yellowFrom: 5, redFrom: 10, provisional: false });
  });

  it("when the window is 500, then yellow starts at 9 and red at 15, flagged provisional (computed: P(X≤8)=93.3% < 95% ≤ P(X≤9); P(X≤14) < 99.99% ≤ P(X≤15))", () => {
    expect(zoneBoundariesFor("basel", 500)).toEqual({ yellowFrom: 9, redFrom: 15, provisional: true });
    expect(zoneFor(8, "basel", 500)).toBe("green");
    expect(zoneFor(9, "basel", 500)).toBe("yellow");
    expect(zoneFor(15, "basel", 500)).toBe("red");
  });

  it("when the window is 500, then the plus factor steps through the yellow schedule from the derived boundary and is 1.00 in red (our rule for provisional windows)", () => {
    expect(plusFactorFor(8, "eu", 500)).toBe(0);
    expect(plusFactorFor(9, "eu", 500)).toBeCloseTo(0.4, 12);
    expect(plusFactorFor(10, "eu", 500)).toBeCloseTo(0.5, 12);
    expect(plusFactorFor(14, "eu", 500)).toBeCloseTo(0.85, 12);
    expect(plusFactorFor(15, "eu", 500)).toBe(1);
  });
});
