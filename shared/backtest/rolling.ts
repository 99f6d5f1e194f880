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
  /**
   * Plus factor in hundredths (every published step is a whole number of hundredths); read it
   * with plusFactorAt. One byte per date keeps the hot path close to the bare loop.
   */
  plusFactorHundredths: Uint8Array;
}

/** The plus factor at index i, exactly as in the regime's table (65 / 100 === 0.65). */
export function plusFactorAt(r: RollingRegimeArrays, i: number): number {
  return r.plusFactorHundredths[i] / 100;
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

/** Carves many equal-length arrays out of one allocation (one per call instead of one per array). */
class Arena {
  private offset = 0;
  private readonly buffer: ArrayBuffer;
  constructor(
    private readonly n: number,
    countArrays: number,
    byteArrays: number,
    private readonly wide: boolean,
  ) {
    const countBytes = wide ? 4 : 2;
    // Counts first (aligned), then the one-byte arrays.
    this.buffer = new ArrayBuffer(n * (countArrays * countBytes + byteArrays));
  }
  counts(): CountArray {
    const a = this.wide ? new Int32Array(this.buffer, this.offset, this.n) : new Int16Array(this.buffer, this.offset, this.n);
    this.offset += a.byteLength;
    return a;
  }
  bytes(): Uint8Array {
    const a = new Uint8Array(this.buffer, this.offset, this.n);
    this.offset += this.n;
    return a;
  }
}

interface LookupTables {
  zone: Uint8Array;
  plusHundredths: Uint8Array;
}

const lookupCache = new Map<string, LookupTables>();

/** Zone code and plus factor by count 0..w for one rule set and window (REFERENCE.md §2). */
function lookupTables(regime: RegimeId, w: number): LookupTables {
  const key = `${regime}:${w}`;
  let t = lookupCache.get(key);
  if (!t) {
    const rules = getRegime(regime);
    t = { zone: new Uint8Array(w + 1), plusHundredths: new Uint8Array(w + 1) };
    for (let k = 0; k <= w; k++) {
      t.zone[k] = ZONE_CODES.indexOf(zoneFor(k, rules, w));
      const pf = plusFactorFor(k, rules, w);
      const hundredths = Math.round(pf * 100);
      if (hundredths / 100 !== pf || hundredths > 255) throw new Error(`Plus factor ${pf} of ${regime} is not a whole number of hundredths`);
      t.plusHundredths[k] = hundredths;
    }
    // Rule sets whose tables coincide get the very same table object, so their outputs are shared.
    t = { zone: internTable(t.zone), plusHundredths: internTable(t.plusHundredths) };
    lookupCache.set(key, t);
  }
  return t;
}

const tablesByContent = new Map<string, Uint8Array>();
function internTable(table: Uint8Array): Uint8Array {
  const key = table.join(",");
  const found = tablesByContent.get(key);
  if (found) return found;
  tablesByContent.set(key, table);
  return table;
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
function countPlain(s: ObservationSeries, w: number, arena: Arena): Variant {
  const n = s.dates.length;
  const { actual: pa, hypothetical: ph, var: pv } = s;
  const [ha, hh] = scratch(n);
  const ca = arena.counts();
  const ch = arena.counts();
  const cm = arena.counts();
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

interface LookupOutput {
  table: Uint8Array;
  out: Uint8Array;
}

/** Writes up to three lookups per pass over the counts. */
function writeLookups(counted: CountArray, outputs: readonly LookupOutput[]): void {
  const n = counted.length;
  for (let o = 0; o < outputs.length; o += 3) {
    const left = outputs.length - o;
    const t0 = outputs[o].table;
    const o0 = outputs[o].out;
    if (left >= 3) {
      const t1 = outputs[o + 1].table;
      const o1 = outputs[o + 1].out;
      const t2 = outputs[o + 2].table;
      const o2 = outputs[o + 2].out;
      for (let i = 0; i < n; i++) {
        const c = counted[i];
        o0[i] = t0[c];
        o1[i] = t1[c];
        o2[i] = t2[c];
      }
    } else if (left === 2) {
      const t1 = outputs[o + 1].table;
      const o1 = outputs[o + 1].out;
      for (let i = 0; i < n; i++) {
        const c = counted[i];
        o0[i] = t0[c];
        o1[i] = t1[c];
      }
    } else {
      for (let i = 0; i < n; i++) o0[i] = t0[counted[i]];
    }
  }
}

/**
 * Rolling counts, zones and plus factors for several rule sets over one series (O(n)).
 * Requests without exclusions share one counting pass; zone and plus factor are table lookups by
 * count, and rule sets that count the same series with the same table (Basel 2.5 and the EU have
 * identical steps, all four share the 5/10 zone boundaries at 250) share one output array, filled
 * in one pass per counted series. The arrays are read-only views and may be shared between entries.
 */
export function rollingArrays(series: ObservationSeries, requests: readonly RollingRequest[], windowSize = STANDARD_WINDOW): RollingArrays {
  const n = series.dates.length;
  const w = windowSize;
  if (!Number.isInteger(w) || w < 1) throw new RangeError(`windowSize must be a positive integer, got ${w}`);
  const arena = new Arena(n, 3, 2 * requests.length, w >= 32768);
  let plain: Variant | null = null;
  let frtbPlain: Variant | null = null;

  // Outputs keyed by (counted array, table): one array per distinct lookup.
  const groups = new Map<CountArray, Map<Uint8Array, Uint8Array>>();
  const outputFor = (counted: CountArray, table: Uint8Array): Uint8Array => {
    let byTable = groups.get(counted);
    if (!byTable) groups.set(counted, (byTable = new Map()));
    let out = byTable.get(table);
    if (!out) byTable.set(table, (out = arena.bytes()));
    return out;
  };

  const out: RollingRegimeArrays[] = [];
  for (const req of requests) {
    const rules = getRegime(req.regime);
    const basis = req.pnlBasis ?? rules.defaultPnlBasis;
    const missingCounts = rules.missingCountsAsException && series.hasMissing;
    const mask = excludedMask(series.dates, req.excludedDates);
    let variant: Variant;
    if (mask) variant = countGeneral(series, w, missingCounts, mask);
    else if (missingCounts) variant = frtbPlain ??= countGeneral(series, w, true, null);
    else variant = plain ??= countPlain(series, w, arena);
    const counted = countedFor(variant, basis, n, w);
    const tables = lookupTables(rules.id, w);
    out.push({
      regime: rules.id,
      pnlBasis: basis,
      actual: variant.actual,
      hypothetical: variant.hypothetical,
      counted,
      zone: outputFor(counted, tables.zone),
      plusFactorHundredths: outputFor(counted, tables.plusHundredths),
    });
  }
  for (const [counted, byTable] of groups) {
    writeLookups(counted, [...byTable].map(([table, o]) => ({ table, out: o })));
  }
  return { dates: series.dates, windowSize: w, regimes: out };
}
