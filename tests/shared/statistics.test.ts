import jStat from "jstat";
import {
  CHI2_1_CRITICAL_5PCT,
  CHI2_2_CRITICAL_5PCT,
  chiSquareOneSf,
  chiSquareTwoSf,
  christoffersenIndependence,
  conditionalCoverage,
  erfc,
  kupiecPof,
  transitionCounts,
} from "../../shared/backtest/statistics";

const hits = (s: string): boolean[] => [...s].map((c) => c === "1");

/** The N for which Kupiec's test does not reject at 5%. */
function nonRejected(T: number, p: number): number[] {
  const out: number[] = [];
  for (let x = 0; x <= T; x++) if (!kupiecPof(x, T, p).reject) out.push(x);
  return out;
}
const range = (from: number, to: number): number[] => Array.from({ length: to - from + 1 }, (_, i) => from + i);

describe("chi-square p-values", () => {
  it("when the statistic equals the 5% critical value, then the p-value is 5% (χ² tables, docs/rules.md#statistics: 3.841459 for χ²(1), 5.991465 for χ²(2))", () => {
    expect(chiSquareOneSf(CHI2_1_CRITICAL_5PCT)).toBeCloseTo(0.05, 7);
    expect(chiSquareTwoSf(CHI2_2_CRITICAL_5PCT)).toBeCloseTo(0.05, 7);
  });

  it("when compared with jStat over a range of statistics, then the χ²(1) tail agrees (independent implementation)", () => {
    for (const x of [0.001, 0.1, 0.5, 1, 2, 3.84, 5, 10, 12.5, 20, 30]) {
      expect(chiSquareOneSf(x)).toBeCloseTo(1 - jStat.chisquare.cdf(x, 1), 9);
      expect(chiSquareTwoSf(x)).toBeCloseTo(1 - jStat.chisquare.cdf(x, 2), 9);
    }
  });

  it("when erfc is evaluated on both sides of the series/continued-fraction switch, then it agrees with jStat and with erfc(0) = 1, erfc(−z) = 2 − erfc(z) (definition)", () => {
    expect(erfc(0)).toBe(1);
    for (const z of [0.3, 1, 2.4, 2.5, 2.6, 4, 6]) {
      expect(Math.abs(erfc(z) - jStat.erfc(z))).toBeLessThan(1e-12 + 1e-9 * jStat.erfc(z));
      expect(erfc(-z)).toBeCloseTo(2 - erfc(z), 14);
    }
  });
});

describe("Kupiec proportion-of-failures test", () => {
  it("when 5 exceptions fall in 250 days at 99%, then LR = 1.9568 and p = 0.162, not rejected (Kupiec 1995 formula, worked by hand)", () => {
    // LR = −2[245 ln 0.99 + 5 ln 0.01] + 2[245 ln 0.98 + 5 ln 0.02]
    //    = −2(−2.462333 − 23.025851) + 2(−4.949663 − 19.560115) = 50.976367 − 49.019556 = 1.956811
    const r = kupiecPof(5, 250, 0.01);
    expect(r.statistic).toBeCloseTo(1.956811, 5);
    expect(r.pValue).toBeCloseTo(1 - jStat.chisquare.cdf(r.statistic, 1), 9);
    expect(r.reject).toBe(false);
    expect(r.verdict).toMatch(/consistent with 99% coverage/);
  });

  it("when p = 1% and T = 510, then N is not rejected exactly for 1 < N < 11 (Kupiec regions as reproduced in handbooks, from memory)", () => {
    expect(nonRejected(510, 0.01)).toEqual(range(2, 10));
  });

  it("when p = 1% and T = 1000, then N is not rejected exactly for 4 < N < 17 (Kupiec regions, from memory)", () => {
    expect(nonRejected(1000, 0.01)).toEqual(range(5, 16));
  });

  it("when p = 5% and T = 255, then N is not rejected exactly for 6 < N < 21 (Kupiec regions, from memory)", () => {
    expect(nonRejected(255, 0.05)).toEqual(range(7, 20));
  });

  it("when p = 5% and T = 1000, then N is not rejected exactly for 37 < N < 65 (Kupiec regions, from memory)", () => {
    expect(nonRejected(1000, 0.05)).toEqual(range(38, 64));
  });

  it("when p = 1% and T = 255, then the region is 1..6: the published N < 7 also admits N = 0, but the strict LR rejects it (LR = −2·255·ln 0.99 = 5.13 > 3.84; docs/rules.md#kupiec)", () => {
    expect(nonRejected(255, 0.01)).toEqual(range(1, 6));
    const zero = kupiecPof(0, 255, 0.01);
    expect(zero.statistic).toBeCloseTo(5.1257, 3);
    expect(zero.reject).toBe(true);
    expect(zero.verdict).toMatch(/too few/);
  });

  it("when there are too many exceptions, then the verdict says the VaR looks too low", () => {
    const r = kupiecPof(11, 250, 0.01);
    expect(r.reject).toBe(true);
    expect(r.verdict).toMatch(/too many for 99% coverage/);
  });

  it("when there are no observations, then nothing is rejected; when counts are impossible, then it throws", () => {
    expect(kupiecPof(0, 0)).toMatchObject({ statistic: 0, pValue: 1, reject: false });
    expect(() => kupiecPof(3, 2)).toThrow(RangeError);
    expect(() => kupiecPof(-1, 250)).toThrow(RangeError);
  });
});

describe("Christoffersen independence test", () => {
  it("when the sequence is 0,1,1,0,0,0,1,0, then LR_ind = 0.19645 and independence is not rejected (Christoffersen 1998, worked by hand)", () => {
    // Transitions: n00 = 2, n01 = 2, n10 = 2, n11 = 1; π01 = 1/2, π11 = 1/3, π = 3/7.
    // ln L0 = 4 ln(4/7) + 3 ln(3/7) = −2.238463 − 2.541894 = −4.780357
    // ln L1 = 2 ln(1/2) + 2 ln(1/2) + 2 ln(2/3) + ln(1/3) = −2.772589 − 0.810930 − 1.098612 = −4.682131
    // LR = 2(−4.682131 + 4.780357) = 0.196451
    const seq = hits("01100010");
    expect(transitionCounts(seq)).toEqual({ n00: 2, n01: 2, n10: 2, n11: 1 });
    const r = christoffersenIndependence(seq);
    expect(r.statistic).toBeCloseTo(0.196451, 5);
    expect(r.pValue).toBeCloseTo(chiSquareOneSf(0.196451), 5);
    expect(r.reject).toBe(false);
    expect(r.verdict).toMatch(/no evidence/);
  });

  it("when three exceptions fall on consecutive days out of 20, then LR_ind = 5.2738 and clustering is flagged (Christoffersen 1998, worked by hand)", () => {
    // n00 = 15, n01 = 1, n10 = 1, n11 = 2; π01 = 1/16, π11 = 2/3, π = 3/19.
    // ln L0 = 16 ln(16/19) + 3 ln(3/19) = −2.749604 − 5.537480 = −8.287084
    // ln L1 = 15 ln(15/16) + ln(1/16) + ln(1/3) + 2 ln(2/3) = −0.968078 − 2.772589 − 1.098612 − 0.810930 = −5.650209
    // LR = 2(8.287084 − 5.650209) = 5.273750 > 3.841459
    const r = christoffersenIndependence(hits("00000000001110000000"));
    expect(r.statistic).toBeCloseTo(5.27375, 4);
    expect(r.reject).toBe(true);
    expect(r.verdict).toMatch(/more likely/);
  });

  it("when exceptions alternate 1,0,1,0,1,0, then LR_ind = 6.7301 and the verdict says less likely (Christoffersen 1998, worked by hand)", () => {
    // n10 = 3, n01 = 2, n00 = n11 = 0; π01 = 1, π11 = 0, π = 2/5; 0·ln 0 = 0.
    // ln L0 = 3 ln(3/5) + 2 ln(2/5) = −1.532477 − 1.832581 = −3.365058; ln L1 = 0
    // LR = 6.730117
    const r = christoffersenIndependence(hits("101010"));
    expect(r.statistic).toBeCloseTo(6.730117, 5);
    expect(r.reject).toBe(true);
    expect(r.verdict).toMatch(/less likely/);
  });

  it("when there is no exception, or every day is one, then LR_ind is 0 (0·ln 0 = 0; worked by hand)", () => {
    expect(christoffersenIndependence(hits("0000000000")).statistic).toBe(0);
    expect(christoffersenIndependence(hits("1111")).statistic).toBe(0);
    expect(christoffersenIndependence([]).verdict).toMatch(/Too few/);
  });
});

describe("conditional coverage test", () => {
  it("when three consecutive exceptions fall in 20 days at 99%, then LR_cc = LR_uc + LR_ind = 11.0644 + 5.2738 = 16.3381, p = e^(−LR/2) (Christoffersen 1998, worked by hand)", () => {
    // LR_uc = −2[17 ln 0.99 + 3 ln 0.01] + 2[17 ln 0.85 + 3 ln 0.15] = 27.972732 − 16.908363 = 11.064369
    const r = conditionalCoverage(hits("00000000001110000000"), 0.01);
    expect(r.statistic).toBeCloseTo(16.338119, 4);
    expect(r.pValue).toBeCloseTo(Math.exp(-16.338119 / 2), 8);
    expect(r.reject).toBe(true);
  });

  it("when two isolated exceptions fall in 250 days at 99%, then coverage is not rejected (common practice)", () => {
    const seq = new Array<boolean>(250).fill(false);
    seq[40] = true;
    seq[180] = true;
    const r = conditionalCoverage(seq, 0.01);
    expect(r.statistic).toBeCloseTo(kupiecPof(2, 250).statistic + christoffersenIndependence(seq).statistic, 12);
    expect(r.reject).toBe(false);
    expect(r.verdict).toMatch(/consistent with 99% coverage/);
  });
});
