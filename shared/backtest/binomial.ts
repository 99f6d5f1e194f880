import { EngineInputError } from "./errors";
/**
 * Exact binomial probabilities, accurate to ~1e-14 relative for windows of several thousand
 * observations: Loader's saddle-point form (the one R's dbinom uses), which works with the
 * Stirling-formula error and the deviance instead of subtracting huge log-factorials.
 */

const LN_2PI = Math.log(2 * Math.PI);

// ln(n!) − ln(√(2πn)(n/e)^n) for n = 0..15, from n! held exactly in a double.
const STIRLING_ERROR_SMALL: number[] = (() => {
  const out = [0];
  let factorial = 1;
  for (let n = 1; n <= 15; n++) {
    factorial *= n;
    out.push(Math.log(factorial) - (n + 0.5) * Math.log(n) + n - 0.5 * LN_2PI);
  }
  return out;
})();

function stirlingError(n: number): number {
  if (n <= 15) return STIRLING_ERROR_SMALL[n];
  const nn = n * n;
  const S0 = 1 / 12;
  const S1 = 1 / 360;
  const S2 = 1 / 1260;
  const S3 = 1 / 1680;
  const S4 = 1 / 1188;
  if (n > 500) return (S0 - S1 / nn) / n;
  if (n > 80) return (S0 - (S1 - S2 / nn) / nn) / n;
  if (n > 35) return (S0 - (S1 - (S2 - S3 / nn) / nn) / nn) / n;
  return (S0 - (S1 - (S2 - (S3 - S4 / nn) / nn) / nn) / nn) / n;
}

/** Deviance term x·ln(x/m) + m − x, by a series when x is close to m (no cancellation). */
function deviance(x: number, m: number): number {
  if (Math.abs(x - m) < 0.1 * (x + m)) {
    let v = (x - m) / (x + m);
    let s = (x - m) * v;
    let ej = 2 * x * v;
    v *= v;
    for (let j = 1; j < 1000; j++) {
      ej *= v;
      const next = s + ej / (2 * j + 1);
      if (next === s) return next;
      s = next;
    }
    return s;
  }
  return x * Math.log(x / m) + m - x;
}

function assertArguments(n: number, p: number): void {
  if (!Number.isInteger(n) || n < 0) throw new EngineInputError(`n must be a non-negative integer, got ${n}`);
  if (!(p >= 0 && p <= 1)) throw new EngineInputError(`p must lie in [0, 1], got ${p}`);
}

/** ln P(X = k) for X ~ Binomial(n, p); -Infinity outside the support. k must be an integer. */
function logPmf(k: number, n: number, p: number): number {
  if (k < 0 || k > n) return -Infinity;
  if (p === 0) return k === 0 ? 0 : -Infinity;
  if (p === 1) return k === n ? 0 : -Infinity;
  const q = 1 - p;
  if (k === 0) return n * Math.log1p(-p);
  if (k === n) return n * Math.log(p);
  const lc = stirlingError(n) - stirlingError(k) - stirlingError(n - k) - deviance(k, n * p) - deviance(n - k, n * q);
  const lf = LN_2PI + Math.log(k) + Math.log1p(-k / n);
  return lc - 0.5 * lf;
}

/** P(X = k) for X ~ Binomial(n, p). */
export function binomialPmf(k: number, n: number, p: number): number {
  assertArguments(n, p);
  if (!Number.isInteger(k)) return 0;
  return Math.exp(logPmf(k, n, p));
}

/** Σ P(X = i) for i = from..to, summed from the largest term outward and stopped once terms no longer matter. */
function sumRange(from: number, to: number, n: number, p: number): number {
  if (from > to) return 0;
  const mode = Math.min(n, Math.max(0, Math.floor((n + 1) * p)));
  const peak = Math.min(to, Math.max(from, mode));
  let sum = 0;
  // Terms decrease monotonically away from the mode, so each side can stop early.
  for (let i = peak; i >= from; i--) {
    const term = Math.exp(logPmf(i, n, p));
    sum += term;
    if (term <= sum * 1e-17 && i < mode) break;
  }
  for (let i = peak + 1; i <= to; i++) {
    const term = Math.exp(logPmf(i, n, p));
    sum += term;
    if (term <= sum * 1e-17 && i > mode) break;
  }
  return sum;
}

/** P(X ≤ k) for X ~ Binomial(n, p): the Basel cumulative probability (BCBS 1996 Table 2). */
export function binomialCdf(k: number, n: number, p: number): number {
  assertArguments(n, p);
  const kk = Math.floor(k);
  if (kk < 0) return 0;
  if (kk >= n) return 1;
  // Sum the shorter tail: the lower one below the mean, else 1 − the upper one.
  if (kk < n * p) return Math.min(1, sumRange(0, kk, n, p));
  return Math.max(0, 1 - sumRange(kk + 1, n, n, p));
}

/** Type 1 error of cut-off k: P(X ≥ k) when the model is right — rejecting a correct model (BCBS 1996 Table 1). */
export function typeOneError(k: number, n: number, p: number): number {
  assertArguments(n, p);
  const kk = Math.ceil(k);
  if (kk <= 0) return 1;
  if (kk > n) return 0;
  if (kk > n * p) return Math.min(1, sumRange(kk, n, n, p));
  return Math.max(0, 1 - sumRange(0, kk - 1, n, p));
}

/** Type 2 error of cut-off k under an alternative exception rate pAlt: P(X < k) — accepting a wrong model. */
export function typeTwoError(k: number, n: number, pAlt: number): number {
  return 1 - typeOneError(k, n, pAlt);
}

export interface ErrorTableCell {
  /** VaR coverage, e.g. 0.99 (exception probability 1 − coverage). */
  coverage: number;
  /** P(X = k). */
  exact: number;
  /** P(X ≤ k). */
  cumulative: number;
  /** P(X ≥ k): the type 1 error if this coverage is the true one. */
  typeOne: number;
  /** P(X < k): the type 2 error if this coverage is an alternative. */
  typeTwo: number;
}

export interface ErrorTableRow {
  cutoff: number;
  cells: ErrorTableCell[];
}

/**
 * The layout of BCBS 1996 Table 1: for each cut-off, the exact probability and both error types
 * under each coverage level (the first coverage is usually the model's, the others alternatives).
 */
export function errorTable(n: number, cutoffs: readonly number[], coverages: readonly number[]): ErrorTableRow[] {
  return cutoffs.map((cutoff) => ({
    cutoff,
    cells: coverages.map((coverage) => {
      const p = 1 - coverage;
      const typeOne = typeOneError(cutoff, n, p);
      return {
        coverage,
        exact: binomialPmf(cutoff, n, p),
        cumulative: binomialCdf(cutoff, n, p),
        typeOne,
        typeTwo: 1 - typeOne,
      };
    }),
  }));
}
