import jStat from "jstat";
import { binomialCdf, binomialPmf, errorTable, typeOneError, typeTwoError } from "../../shared/backtest/binomial";

// BCBS (1996), Supervisory framework for the use of "backtesting" …, Table 1: 250 observations,
// figures in percent to one decimal. Columns: 99% exact, 99% type 1, 97% exact, 97% type 2.
const TABLE_1: ReadonlyArray<[k: number, exact99: number, typeOne99: number, exact97: number, typeTwo97: number]> = [
  [0, 8.1, 100.0, 0.0, 0.0],
  [1, 20.5, 91.9, 0.4, 0.0],
  [2, 25.7, 71.4, 1.5, 0.4],
  [3, 21.5, 45.7, 3.8, 1.9],
  [4, 13.4, 24.2, 7.2, 5.7],
  [5, 6.7, 10.8, 10.9, 12.8],
  [6, 2.7, 4.1, 13.8, 23.7],
  [7, 1.0, 1.4, 14.9, 37.5],
  [8, 0.3, 0.4, 14.0, 52.4],
];

// BCBS (1996) Table 2, cumulative probability P(X ≤ k) in percent to two decimals.
const TABLE_2_CUMULATIVE: ReadonlyArray<[k: number, percent: number]> = [
  [0, 8.11],
  [1, 28.58],
  [2, 54.32],
  [3, 75.81],
  [4, 89.22],
  [5, 95.88],
  [6, 98.63],
  [7, 99.6],
  [8, 99.89],
  [9, 99.97],
  [10, 99.99],
];

/** Within half a unit of the published last decimal (BCBS 1996 Table 1; docs/rules.md#traffic-light). */
function expectPublished(actualPercent: number, published: number, decimals: number): void {
  const halfUnit = 0.5 * 10 ** -decimals;
  expect(Math.abs(actualPercent - published)).toBeLessThanOrEqual(halfUnit + 1e-12);
}

describe("BCBS 1996 Table 1 (250 observations)", () => {
  describe.each(TABLE_1)("with a cut-off of %i exceptions", (k, exact99, typeOne99, exact97, typeTwo97) => {
    it(`then P(X = k) at 99% coverage is ${exact99}% (BCBS 1996 Table 1)`, () => {
      expectPublished(100 * binomialPmf(k, 250, 0.01), exact99, 1);
    });
    it(`then the type 1 error P(X ≥ k) at 99% coverage is ${typeOne99}% (BCBS 1996 Table 1)`, () => {
      expectPublished(100 * typeOneError(k, 250, 0.01), typeOne99, 1);
    });
    it(`then P(X = k) at 97% coverage is ${exact97}% (BCBS 1996 Table 1)`, () => {
      expectPublished(100 * binomialPmf(k, 250, 0.03), exact97, 1);
    });
    it(`then the type 2 error P(X < k) at 97% coverage is ${typeTwo97}% (BCBS 1996 Table 1)`, () => {
      expectPublished(100 * typeTwoError(k, 250, 0.03), typeTwo97, 1);
    });
  });

  it("when the table is built with errorTable, then its cells match the published 99%/97% columns (BCBS 1996 Table 1)", () => {
    const rows = errorTable(
      250,
      TABLE_1.map((r) => r[0]),
      [0.99, 0.97],
    );
    rows.forEach((row, i) => {
      const [, exact99, typeOne99, exact97, typeTwo97] = TABLE_1[i];
      expectPublished(100 * row.cells[0].exact, exact99, 1);
      expectPublished(100 * row.cells[0].typeOne, typeOne99, 1);
      expectPublished(100 * row.cells[1].exact, exact97, 1);
      expectPublished(100 * row.cells[1].typeTwo, typeTwo97, 1);
    });
  });

  it("when k = 6 at 99%, then the exact probability is 2.7482%, the rounding-boundary cell noted in docs/rules.md#traffic-light (computed)", () => {
    expect(100 * binomialPmf(6, 250, 0.01)).toBeCloseTo(2.7482, 4);
  });
});

describe("BCBS 1996 Table 2 cumulative column", () => {
  it.each(TABLE_2_CUMULATIVE)(
    "when %i exceptions fall in 250 days, then P(X ≤ k) is %f% (BCBS 1996 Table 2)",
    (k, percent) => {
      expectPublished(100 * binomialCdf(k, 250, 0.01), percent, 2);
    },
  );
});

describe("binomial cross-checked against jStat (independent implementation)", () => {
  const cases: Array<[number, number]> = [];
  for (const n of [250, 500, 1000]) for (const p of [0.01, 0.025, 0.05]) cases.push([n, p]);

  it.each(cases)("when n = %i and p = %f, then pmf and cdf agree with jStat for every k up to the far tail", (n, p) => {
    const upTo = Math.ceil(n * p + 8 * Math.sqrt(n * p * (1 - p)) + 5);
    for (let k = 0; k <= upTo; k++) {
      const pdf = jStat.binomial.pdf(k, n, p);
      expect(Math.abs(binomialPmf(k, n, p) - pdf)).toBeLessThanOrEqual(1e-12 + 1e-9 * pdf);
      // jStat rounds its cdf to 1e-10.
      expect(Math.abs(binomialCdf(k, n, p) - jStat.binomial.cdf(k, n, p))).toBeLessThanOrEqual(2e-10);
    }
  });
});

describe("binomial edge cases and stability", () => {
  it("when n is 5,000 and p is 0.5, then the pmf at the mode is finite and the cdf of the whole support is 1 (worked by hand: C(5000,2500)/2^5000 ≈ 0.011283)", () => {
    expect(binomialPmf(2500, 5000, 0.5)).toBeCloseTo(0.0112832, 6);
    expect(binomialCdf(5000, 5000, 0.5)).toBe(1);
    expect(
      binomialCdf(2499, 5000, 0.5) + binomialPmf(2500, 5000, 0.5) + (1 - binomialCdf(2500, 5000, 0.5)),
    ).toBeCloseTo(1, 12);
  });

  it("when the pmf is summed over the whole support for n = 4,000, then it totals 1 (common practice)", () => {
    let total = 0;
    for (let k = 0; k <= 4000; k++) total += binomialPmf(k, 4000, 0.01);
    expect(total).toBeCloseTo(1, 12);
  });

  it("when k is outside 0..n, then the pmf is 0 and the cdf is 0 or 1 (definition)", () => {
    expect(binomialPmf(-1, 10, 0.1)).toBe(0);
    expect(binomialPmf(11, 10, 0.1)).toBe(0);
    expect(binomialCdf(-1, 10, 0.1)).toBe(0);
    expect(binomialCdf(10, 10, 0.1)).toBe(1);
    expect(typeOneError(0, 10, 0.1)).toBe(1);
    expect(typeOneError(11, 10, 0.1)).toBe(0);
  });

  it("when p is 0 or 1, then all the mass sits on 0 or n (definition)", () => {
    expect(binomialPmf(0, 20, 0)).toBe(1);
    expect(binomialPmf(20, 20, 1)).toBe(1);
    expect(binomialCdf(0, 20, 0)).toBe(1);
    expect(binomialCdf(19, 20, 1)).toBe(0);
  });

  it("when n or p is out of range, then it throws", () => {
    expect(() => binomialPmf(1, -1, 0.1)).toThrow(RangeError);
    expect(() => binomialCdf(1, 10, 1.5)).toThrow(RangeError);
  });

  it("when the cdf is accumulated from the pmf at n = 250, then both routes agree (worked by summation)", () => {
    let cumulative = 0;
    for (let k = 0; k <= 250; k++) {
      cumulative += binomialPmf(k, 250, 0.01);
      expect(binomialCdf(k, 250, 0.01)).toBeCloseTo(cumulative, 13);
      expect(typeOneError(k + 1, 250, 0.01)).toBeCloseTo(1 - cumulative, 13);
    }
  });
});
