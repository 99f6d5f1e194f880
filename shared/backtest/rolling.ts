import type { PnlBasis, RegimeId } from "../schemas/common";
import { getRegime, plusFactorFor, STANDARD_WINDOW, zoneFor } from "./regimes";
import type { Zone } from "./types";
import type { ObservationSeries } from "./window";

/**
 * The rolling exception count at every date in one pass (O(n) per portfolio): hits are computed
 * once and a sliding sum adds the day entering and drops the day leaving the window. Zone and plus
 * factor are table lookups by count, so all rule sets share the same hit arrays.
 */

export const ZONE_CODES: readonly Zone[] = ["green", "yellow", "red"];

export interface RollingRequest {
  regime: RegimeId;
  /** Defaults to the regime's basis. */
  pnlBasis?: PnlBasis;
  excludedDates?: Iterable<string>;
}

export type CountArray = Int16Array | Int32Array;

export interface RollingRegimeArrays {
  regime: RegimeId;
  pnlBasis: PnlBasis;
  /** Exceptions in the window ending at each index, before exclusions. */
  actual: CountArray;
  hypothetical: CountArray;
  /** Counted exceptions after the basis and approved exclusions. */
  counted: CountArray;
  /** Index into ZONE_CODES. */
  zone: Uint8Array;
  plusFactor: Float64Array;
}

export interface RollingArrays {
  dates: string[];
  windowSize: number;
  regimes: RollingRegimeArrays[];
}

interface Variant {
  actual: CountArray;
  hypothetical: CountArray;
  netActual: CountArray;
  netHypothetical: CountArray;
  max?: CountArray;
}

function newCounts(n: number, windowSize: number): CountArray {
  return windowSize < 32768 ? new Int16Array(n) : new Int32Array(n);
}

let hitScratchA = new Uint8Array(0);
let hitScratchH = new Uint8Array(0);

function scratch(n: number): [Uint8Array, Uint8Array] {
  if (hitScratchA.length < n) {
    hitScratchA = new Uint8Array(n);
    hitScratchH = new Uint8Array(n);
  }
  return [hitScratchA, hitScratchH];
}

/** The common case: no missing-value rule in play and no exclusions. */
function countPlain(s: ObservationSeries, w: number): Variant {
  const n = s.dates.length;
  const { actual: pa, hypothetical: ph, var: pv } = s;
  const [ha, hh] = scratch(n);
  const ca = newCounts(n, w);
  const ch = newCounts(n, w);
  const cm = newCounts(n, w);
  let a = 0;
  let h = 0;
  for (let i = 0; i < n; i++) {
    const v = pv[i];
    // Exception: the loss strictly exceeds VaR (DESIGN.md §4); NaN (missing) compares false.
    const xa = -pa[i] > v ? 1 : 0;
    const xh = -ph[i] > v ? 1 : 0;
    ha[i] = xa;
    hh[i] = xh;
    a += xa;
    h += xh;
    if (i >= w) {
      a -= ha[i - w];
      h -= hh[i - w];
    }
    ca[i] = a;
    ch[i] = h;
    cm[i] = a > h ? a : h;
  }
  return { actual: ca, hypothetical: ch, netActual: ca, netHypothetical: ch, max: cm };
}

/** With the FRTB missing-value rule and/or exclusions: raw and net counts kept apart. */
function countGeneral(s: ObservationSeries, w: number, missingCounts: boolean, excluded: Uint8Array | null): Variant {
  const n = s.dates.length;
  const { actual: pa, hypothetical: ph, var: pv } = s;
  const ha = new Uint8Array(n);
  const hh = new Uint8Array(n);
  const ea = new Uint8Array(n);
  const eh = new Uint8Array(n);
  const ca = newCounts(n, w);
  const ch = newCounts(n, w);
  const na = newCounts(n, w);
  const nh = newCounts(n, w);
  let a = 0;
  let h = 0;
  let xa = 0;
  let xh = 0;
  for (let i = 0; i < n; i++) {
    const v = pv[i];
    const pnlA = pa[i];
    const pnlH = ph[i];
    let hitA = -pnlA > v ? 1 : 0;
    let hitH = -pnlH > v ? 1 : 0;
    if (missingCounts) {
      // MAR32.5(2): a day with P&L or VaR missing counts as an exception.
      if (pnlA !== pnlA || v !== v) hitA = 1;
      if (pnlH !== pnlH || v !== v) hitH = 1;
    }
    const ex = excluded !== null && excluded[i] === 1;
    ha[i] = hitA;
    hh[i] = hitH;
    ea[i] = ex ? hitA : 0;
    eh[i] = ex ? hitH : 0;
    a += hitA;
    h += hitH;
    xa += ea[i];
    xh += eh[i];
    if (i >= w) {
      a -= ha[i - w];
      h -= hh[i - w];
      xa -= ea[i - w];
      xh -= eh[i - w];
    }
    ca[i] = a;
    ch[i] = h;
    na[i] = a - xa;
    nh[i] = h - xh;
  }
  return { actual: ca, hypothetical: ch, netActual: na, netHypothetical: nh };
}

function countedFor(variant: Variant, basis: PnlBasis, n: number, w: number): CountArray {
  if (basis === "actual") return variant.netActual;
  if (basis === "hypothetical") return variant.netHypothetical;
  if (!variant.max) {
    const m = newCounts(n, w);
    const a = variant.netActual;
    const h = variant.netHypothetical;
    for (let i = 0; i < n; i++) m[i] = a[i] > h[i] ? a[i] : h[i];
    variant.max = m;
  }
  return variant.max;
}

function excludedMask(dates: readonly string[], excludedDates: Iterable<string> | undefined): Uint8Array | null {
  if (!excludedDates) return null;
  const set = excludedDates instanceof Set ? (excludedDates as Set<string>) : new Set(excludedDates);
  if (set.size === 0) return null;
  const mask = new Uint8Array(dates.length);
  let any = false;
  for (let i = 0; i < dates.length; i++) {
    if (set.has(dates[i])) {
      mask[i] = 1;
      any = true;
    }
  }
  return any ? mask : null;
}

/**
 * Rolling counts, zones and plus factors for several rule sets over one series. Requests without
 * exclusions share one pass over the data.
 */
export function rollingArrays(series: ObservationSeries, requests: readonly RollingRequest[], windowSize = STANDARD_WINDOW): RollingArrays {
  const n = series.dates.length;
  const w = windowSize;
  let plain: Variant | null = null;
  let frtbPlain: Variant | null = null;
  const out: RollingRegimeArrays[] = [];
  for (const req of requests) {
    const rules = getRegime(req.regime);
    const basis = req.pnlBasis ?? rules.defaultPnlBasis;
    const missingCounts = rules.missingCountsAsException && series.hasMissing;
    const mask = excludedMask(series.dates, req.excludedDates);
    let variant: Variant;
    if (mask) variant = countGeneral(series, w, missingCounts, mask);
    else if (missingCounts) variant = frtbPlain ??= countGeneral(series, w, true, null);
    else variant = plain ??= countPlain(series, w);
    const counted = countedFor(variant, basis, n, w);

    // Lookup tables by count: zone code and plus factor (REFERENCE.md §2).
    const zoneTable = new Uint8Array(w + 1);
    const plusTable = new Float64Array(w + 1);
    for (let k = 0; k <= w; k++) {
      zoneTable[k] = ZONE_CODES.indexOf(zoneFor(k, rules, w));
      plusTable[k] = plusFactorFor(k, rules, w);
    }
    const zone = new Uint8Array(n);
    const plusFactor = new Float64Array(n);
    for (let i = 0; i < n; i++) {
      const c = counted[i];
      zone[i] = zoneTable[c];
      plusFactor[i] = plusTable[c];
    }
    out.push({ regime: rules.id, pnlBasis: basis, actual: variant.actual, hypothetical: variant.hypothetical, counted, zone, plusFactor });
  }
  return { dates: series.dates, windowSize: w, regimes: out };
}
