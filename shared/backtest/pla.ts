import { sampleRankCorrelation } from "simple-statistics";
import { EngineInputError } from "./errors";
import { lastIndexOnOrBefore } from "./window";
import type { Observation } from "./types";

/**
 * FRTB P&L attribution test (Basel Framework MAR32.34–32.42): Spearman rank correlation and the
 * Kolmogorov–Smirnov statistic of hypothetical P&L (HPL) against risk-theoretical P&L (RTPL) over
 * the last 250 days.
 */

export type PlaZone = "green" | "amber" | "red";

export const PLA_WINDOW = 250;
// MAR32.42: green if correlation > 0.80 and KS < 0.09; red if correlation < 0.70 or KS > 0.12.
export const PLA_THRESHOLDS = { greenCorrelation: 0.8, redCorrelation: 0.7, greenKs: 0.09, redKs: 0.12 } as const;

export interface PlaResult {
  spearman: number;
  ks: number;
  zone: PlaZone;
  observations: number;
}

/** Spearman rank correlation with average ranks for ties (Pearson correlation of the mid-ranks). */
export function spearmanCorrelation(x: readonly number[], y: readonly number[]): number {
  if (x.length !== y.length)
    throw new EngineInputError(`The two series differ in length (${x.length} and ${y.length})`);
  if (x.length < 2) return NaN;
  return sampleRankCorrelation([...x], [...y]);
}

/** Two-sample Kolmogorov–Smirnov statistic: max |F_x − F_y| over the pooled points. */
export function ksStatistic(x: readonly number[], y: readonly number[]): number {
  if (x.length === 0 || y.length === 0) return NaN;
  const a = Float64Array.from(x).sort();
  const b = Float64Array.from(y).sort();
  let i = 0;
  let j = 0;
  const na = a.length;
  const nb = b.length;
  // Work in whole numbers (i·nb − j·na) and divide once, so a gap of exactly 0.12 stays 0.12.
  let widest = 0;
  while (i < na && j < nb) {
    // Step past every copy of the next pooled value on both sides before comparing the CDFs.
    const v = a[i] <= b[j] ? a[i] : b[j];
    while (i < na && a[i] === v) i++;
    while (j < nb && b[j] === v) j++;
    const gap = Math.abs(i * nb - j * na);
    if (gap > widest) widest = gap;
  }
  return widest / (na * nb);
}

/** Equalities at a threshold fall to amber (MAR32.42). An undefined correlation is red. */
export function plaZone(spearman: number, ks: number): PlaZone {
  const t = PLA_THRESHOLDS;
  if (Number.isNaN(spearman) || Number.isNaN(ks)) return "red";
  if (spearman < t.redCorrelation || ks > t.redKs) return "red";
  if (spearman > t.greenCorrelation && ks < t.greenKs) return "green";
  return "amber";
}

/** The test over the last 250 pairs (the two arrays are aligned day by day, most recent last). */
export function plaTest(hpl: readonly number[], rtpl: readonly number[]): PlaResult {
  if (hpl.length !== rtpl.length) {
    throw new EngineInputError(
      `HPL has ${hpl.length} days and RTPL ${rtpl.length}; the P&L attribution test needs them day by day`,
    );
  }
  for (let i = 0; i < hpl.length; i++) {
    if (!Number.isFinite(hpl[i]) || !Number.isFinite(rtpl[i])) {
      throw new EngineInputError(`Day ${i + 1} of the P&L attribution input is not a finite number`);
    }
  }
  const from = Math.max(0, hpl.length - PLA_WINDOW);
  const h = hpl.slice(from);
  const r = rtpl.slice(from);
  const spearman = spearmanCorrelation(h, r);
  const ks = ksStatistic(h, r);
  return { spearman, ks, zone: plaZone(spearman, ks), observations: h.length };
}

/**
 * A desk's P&L attribution test at an as-of date: the last 250 observations on or before it, the
 * days with both HPL and RTPL reported paired in order. Null when fewer than two such days exist.
 */
export function deskPla(observations: readonly Observation[], asOf: string): PlaResult | null {
  const end = lastIndexOnOrBefore(observations, asOf);
  if (end < 0) return null;
  const window = observations.slice(Math.max(0, end - PLA_WINDOW + 1), end + 1);
  const paired = window.filter((o) => o.hypotheticalPnl != null && o.rtpl != null);
  if (paired.length < 2) return null;
  return plaTest(
    paired.map((o) => o.hypotheticalPnl as number),
    paired.map((o) => o.rtpl as number),
  );
}
