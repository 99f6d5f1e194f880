import { EngineInputError } from "./errors";
import type { TestOutcome } from "./types";

/** 5% critical values of χ²(1) and χ²(2) (docs/rules.md#statistics). */
export const CHI2_1_CRITICAL_5PCT = 3.841459;
export const CHI2_2_CRITICAL_5PCT = 5.991465;
const SIGNIFICANCE = 0.05;

/** x·ln(y) with the convention 0·ln 0 = 0 used by both likelihood ratios. */
function xLogY(x: number, y: number): number {
  return x === 0 ? 0 : x * Math.log(y);
}

/**
 * Complementary error function, accurate to ~1e-15 relative: a positive-term series for small z
 * (no cancellation) and a Lentz continued fraction for the tail.
 */
export function erfc(z: number): number {
  if (Number.isNaN(z)) return NaN;
  if (z < 0) return 2 - erfc(-z);
  if (z < 2.5) {
    // erf(z) = 2/√π · e^{-z²} · Σ (2z²)^n z / (1·3·…·(2n+1))
    const z2 = z * z;
    let term = z;
    let sum = z;
    for (let n = 1; n < 200; n++) {
      term *= (2 * z2) / (2 * n + 1);
      sum += term;
      if (term < sum * 1e-17) break;
    }
    return 1 - (2 / Math.sqrt(Math.PI)) * Math.exp(-z2) * sum;
  }
  // erfc(z) = e^{-z²}/√π · 1/(z + (1/2)/(z + 1/(z + (3/2)/(z + …))))
  const tiny = 1e-300;
  let f = z;
  let c = z;
  let d = 0;
  for (let n = 1; n < 500; n++) {
    const a = n / 2;
    d = z + a * d;
    d = Math.abs(d) < tiny ? tiny : d;
    c = z + a / c;
    c = Math.abs(c) < tiny ? tiny : c;
    d = 1 / d;
    const delta = c * d;
    f *= delta;
    if (Math.abs(delta - 1) < 1e-16) break;
  }
  return Math.exp(-z * z) / (Math.sqrt(Math.PI) * f);
}

/** P(χ²(1) ≥ x) = erfc(√(x/2)). */
export function chiSquareOneSf(x: number): number {
  if (!(x > 0)) return 1;
  return erfc(Math.sqrt(x / 2));
}

/** P(χ²(2) ≥ x) = e^{-x/2}. */
export function chiSquareTwoSf(x: number): number {
  if (!(x > 0)) return 1;
  return Math.exp(-x / 2);
}

function percent(value: number): string {
  return `${Number((value * 100).toFixed(2))}%`;
}

function assertCount(name: string, value: number): void {
  if (!Number.isInteger(value) || value < 0)
    throw new EngineInputError(`${name} must be a non-negative integer, got ${value}`);
}

/**
 * Kupiec (1995) proportion-of-failures test:
 * LR_uc = −2 ln[(1−p)^(T−x) p^x] + 2 ln[(1−x/T)^(T−x) (x/T)^x], χ²(1).
 */
export function kupiecPof(exceptions: number, n: number, p = 0.01): TestOutcome {
  assertCount("exceptions", exceptions);
  assertCount("n", n);
  if (exceptions > n) throw new EngineInputError(`exceptions (${exceptions}) cannot exceed observations (${n})`);
  if (n === 0) {
    return {
      statistic: 0,
      pValue: 1,
      reject: false,
      verdict: "No observations, so the exception rate cannot be tested.",
    };
  }
  const x = exceptions;
  const rate = x / n;
  const statistic = Math.max(
    0,
    -2 * (xLogY(n - x, 1 - p) + xLogY(x, p)) + 2 * (xLogY(n - x, 1 - rate) + xLogY(x, rate)),
  );
  const pValue = chiSquareOneSf(statistic);
  const reject = pValue < SIGNIFICANCE;
  const expected = Number((n * p).toFixed(2));
  const coverage = percent(1 - p);
  const what = `${x} exception${x === 1 ? "" : "s"} in ${n} days (${expected} expected)`;
  const are = x === 1 ? "is" : "are";
  const verdict = !reject
    ? `At the 5% level, ${what} ${are} consistent with ${coverage} coverage.`
    : rate > p
      ? `At the 5% level, ${what} ${are} too many for ${coverage} coverage: the VaR looks too low.`
      : `At the 5% level, ${what} ${are} too few for ${coverage} coverage: the VaR looks too high.`;
  return { statistic, pValue, reject, verdict };
}

export interface TransitionCounts {
  n00: number;
  n01: number;
  n10: number;
  n11: number;
}

/** n_ij = days in state j after a day in state i, over the T−1 transitions (Christoffersen 1998). */
export function transitionCounts(hits: readonly boolean[]): TransitionCounts {
  const t = { n00: 0, n01: 0, n10: 0, n11: 0 };
  for (let i = 1; i < hits.length; i++) {
    if (hits[i - 1]) {
      if (hits[i]) t.n11++;
      else t.n10++;
    } else if (hits[i]) t.n01++;
    else t.n00++;
  }
  return t;
}

function independenceStatistic(hits: readonly boolean[]): {
  statistic: number;
  counts: TransitionCounts;
  pi01: number;
  pi11: number;
} {
  const counts = transitionCounts(hits);
  const { n00, n01, n10, n11 } = counts;
  const total = n00 + n01 + n10 + n11;
  if (total === 0) return { statistic: 0, counts, pi01: 0, pi11: 0 };
  const pi01 = n00 + n01 > 0 ? n01 / (n00 + n01) : 0;
  const pi11 = n10 + n11 > 0 ? n11 / (n10 + n11) : 0;
  const pi = (n01 + n11) / total;
  const restricted = xLogY(n00 + n10, 1 - pi) + xLogY(n01 + n11, pi);
  const unrestricted = xLogY(n00, 1 - pi01) + xLogY(n01, pi01) + xLogY(n10, 1 - pi11) + xLogY(n11, pi11);
  return { statistic: Math.max(0, -2 * restricted + 2 * unrestricted), counts, pi01, pi11 };
}

/**
 * Christoffersen (1998) independence test: does an exception today change the chance of one
 * tomorrow? LR_ind over the first-order Markov transition counts, χ²(1).
 */
export function christoffersenIndependence(hits: readonly boolean[]): TestOutcome {
  const { statistic, pi01, pi11 } = independenceStatistic(hits);
  const pValue = chiSquareOneSf(statistic);
  const reject = pValue < SIGNIFICANCE;
  const verdict =
    hits.length < 2
      ? "Too few days to test whether exceptions cluster."
      : !reject
        ? "At the 5% level, there is no evidence that exceptions cluster on consecutive days."
        : pi11 > pi01
          ? "At the 5% level, exceptions are not independent: an exception makes another the next day more likely."
          : "At the 5% level, exceptions are not independent: an exception makes another the next day less likely.";
  return { statistic, pValue, reject, verdict };
}

/** Christoffersen (1998) conditional coverage: LR_cc = LR_uc + LR_ind, χ²(2), p-value e^{−LR/2}. */
export function conditionalCoverage(hits: readonly boolean[], p = 0.01): TestOutcome {
  let x = 0;
  for (const h of hits) if (h) x++;
  const uc = kupiecPof(x, hits.length, p).statistic;
  const ind = independenceStatistic(hits).statistic;
  const statistic = uc + ind;
  const pValue = chiSquareTwoSf(statistic);
  const reject = pValue < SIGNIFICANCE;
  const coverage = percent(1 - p);
  const verdict =
    hits.length === 0
      ? "No observations, so coverage cannot be tested."
      : !reject
        ? `At the 5% level, the number and the timing of exceptions are together consistent with ${coverage} coverage.`
        : `At the 5% level, the number and the timing of exceptions together are not consistent with ${coverage} coverage.`;
  return { statistic, pValue, reject, verdict };
}
