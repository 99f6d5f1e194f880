import { EngineInputError } from "./errors";
import type { PnlBasis, RegimeId } from "../schemas/common";
import { getRegime, plusFactorFor, STANDARD_WINDOW, zoneFor, type RegimeRules } from "./regimes";
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
  /**
   * Zone and plus factor at each date in one 16-bit code: low byte the index into ZONE_CODES,
   * high byte the plus factor in hundredths (every published step is a whole number of them).
   * Read with zoneAt / plusFactorAt. Two bytes per date keep the hot path close to the bare loop.
   */
  levels: Uint16Array;
}

/** The zone at index i. */
export function zoneAt(r: RollingRegimeArrays, i: number): Zone {
  return ZONE_CODES[r.levels[i] & 0xff];
}

/** The plus factor at index i, exactly as in the regime's table (65 / 100 === 0.65). */
export function plusFactorAt(r: RollingRegimeArrays, i: number): number {
  return (r.levels[i] >> 8) / 100;
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
    levelArrays: number,
    private readonly wide: boolean,
  ) {
    // Counts first (4-byte ones keep the 2-byte level arrays aligned), then the level arrays.
    this.buffer = new ArrayBuffer(n * (countArrays * (wide ? 4 : 2) + levelArrays * 2));
  }
  counts(): CountArray {
    const a = this.wide
      ? new Int32Array(this.buffer, this.offset, this.n)
      : new Int16Array(this.buffer, this.offset, this.n);
    this.offset += a.byteLength;
    return a;
  }
  levels(): Uint16Array {
    const a = new Uint16Array(this.buffer, this.offset, this.n);
    this.offset += a.byteLength;
    return a;
  }
}

const levelTables = new Map<string, Uint16Array>();
const levelTablesByContent = new Map<string, Uint16Array>();

/**
 * Level code (zone | plus factor in hundredths << 8) by count 0..w for one rule set and window
 * (docs/rules.md#rule-sets). Rule sets whose tables coincide get the very same table object, so their
 * outputs can be shared.
 */
function levelTable(regime: RegimeId, w: number): Uint16Array {
  const key = `${regime}:${w}`;
  let t = levelTables.get(key);
  if (!t) {
    const rules = getRegime(regime);
    t = new Uint16Array(w + 1);
    for (let k = 0; k <= w; k++) {
      const pf = plusFactorFor(k, rules, w);
      const hundredths = Math.round(pf * 100);
      if (hundredths / 100 !== pf || hundredths > 255)
        throw new Error(`Plus factor ${pf} of ${regime} is not a whole number of hundredths`);
      t[k] = (hundredths << 8) | ZONE_CODES.indexOf(zoneFor(k, rules, w));
    }
    const content = t.join(",");
    t = levelTablesByContent.get(content) ?? t;
    levelTablesByContent.set(content, t);
    levelTables.set(key, t);
  }
  return t;
}

// Hit flags of the plain pass, reused between calls (the counts are what is returned).
let hitScratchA = new Uint8Array(0);
let hitScratchH = new Uint8Array(0);

function scratch(n: number): [Uint8Array, Uint8Array] {
  if (hitScratchA.length < n) {
    hitScratchA = new Uint8Array(n);
    hitScratchH = new Uint8Array(n);
  }
  return [hitScratchA, hitScratchH];
}

/** Level outputs filled during the counting pass itself (each with its table). */
interface FusedOutputs {
  max0: LookupOutput;
  max1: LookupOutput;
  actual0: LookupOutput;
}

let dummyLevels = new Uint16Array(0);
const dummyTables = new Map<number, Uint16Array>();

/** A write-only sink for fused slots nobody asked for. */
function dummyOutput(n: number, w: number): LookupOutput {
  if (dummyLevels.length < n) dummyLevels = new Uint16Array(n);
  let table = dummyTables.get(w);
  if (!table) dummyTables.set(w, (table = new Uint16Array(w + 1)));
  return { table, out: dummyLevels };
}

/**
 * The common case: no missing-value rule in play and no exclusions. One pass computes the hits,
 * the sliding counts of both series and their maximum, and writes the level codes of up to two
 * rule sets counting the maximum and one counting actual P&L (a table lookup only when the count
 * changes, which is rare).
 */
function countPlain(s: ObservationSeries, w: number, arena: Arena, fused: FusedOutputs): Variant {
  const n = s.dates.length;
  const { actual: pa, hypothetical: ph, var: pv } = s;
  const [ha, hh] = scratch(n);
  const ca = arena.counts();
  const ch = arena.counts();
  const cm = arena.counts();
  const tm0 = fused.max0.table;
  const om0 = fused.max0.out;
  const tm1 = fused.max1.table;
  const om1 = fused.max1.out;
  const ta0 = fused.actual0.table;
  const oa0 = fused.actual0.out;
  let a = 0;
  let h = 0;
  let lastMax = -1;
  let lastActual = -1;
  let m0 = 0;
  let m1 = 0;
  let a0 = 0;
  for (let i = 0; i < n; i++) {
    const v = pv[i];
    // Exception: the loss strictly exceeds VaR (docs/rules.md#exception); NaN (missing) compares false.
    const xa = -pa[i] > v ? 1 : 0;
    const xh = -ph[i] > v ? 1 : 0;
    ha[i] = xa;
    hh[i] = xh;
    // The day w observations back leaves the window as this one enters.
    if (i >= w) {
      a += xa - ha[i - w];
      h += xh - hh[i - w];
    } else {
      a += xa;
      h += xh;
    }
    ca[i] = a;
    ch[i] = h;
    const m = a > h ? a : h;
    cm[i] = m;
    if (m !== lastMax) {
      lastMax = m;
      m0 = tm0[m];
      m1 = tm1[m];
    }
    if (a !== lastActual) {
      lastActual = a;
      a0 = ta0[a];
    }
    om0[i] = m0;
    om1[i] = m1;
    oa0[i] = a0;
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
  table: Uint16Array;
  out: Uint16Array;
}

/** Fills one level array from its counts (a table lookup only when the count changes). */
function writeLookup(counted: CountArray, { table, out }: LookupOutput): void {
  let last = -1;
  let code = 0;
  for (let i = 0; i < counted.length; i++) {
    const c = counted[i];
    if (c !== last) {
      last = c;
      code = table[c];
    }
    out[i] = code;
  }
}

/**
 * Rolling counts, zones and plus factors for several rule sets over one series (O(n)).
 * Requests without exclusions share one counting pass; zone and plus factor are a table lookup
 * by count, and rule sets that count the same series with the same table (Basel 2.5 and the EU
 * have identical steps) share one output array, filled in one pass per counted series. The
 * arrays are read-only views and may be shared between entries.
 */
export function rollingArrays(
  series: ObservationSeries,
  requests: readonly RollingRequest[],
  windowSize = STANDARD_WINDOW,
): RollingArrays {
  const n = series.dates.length;
  const w = windowSize;
  if (!Number.isInteger(w) || w < 1) throw new EngineInputError(`windowSize must be a positive integer, got ${w}`);
  const arena = new Arena(n, 3, requests.length, w >= 32768);

  interface Resolved {
    rules: RegimeRules;
    basis: PnlBasis;
    table: Uint16Array;
    kind: "plain" | "missing" | "masked";
    mask: Uint8Array | null;
  }
  const resolved: Resolved[] = requests.map((req) => {
    const rules = getRegime(req.regime);
    const mask = excludedMask(series.dates, req.excludedDates);
    const missingCounts = rules.missingCountsAsException && series.hasMissing;
    return {
      rules,
      basis: req.pnlBasis ?? rules.defaultPnlBasis,
      table: levelTable(rules.id, w),
      kind: mask ? "masked" : missingCounts ? "missing" : "plain",
      mask,
    };
  });

  // Level arrays of the plain pass, one per distinct (basis, table); the first few are fused into it.
  const plainLevels = new Map<string, LookupOutput>();
  const tableIds = new Map<Uint16Array, number>();
  const plainKey = (r: Resolved): string => {
    let id = tableIds.get(r.table);
    if (id === undefined) tableIds.set(r.table, (id = tableIds.size));
    return `${r.basis}:${id}`;
  };
  let plain: Variant | null = null;
  if (resolved.some((r) => r.kind === "plain")) {
    const maxOutputs: LookupOutput[] = [];
    const actualOutputs: LookupOutput[] = [];
    for (const r of resolved) {
      if (r.kind !== "plain") continue;
      const key = plainKey(r);
      if (plainLevels.has(key)) continue;
      const o = { table: r.table, out: arena.levels() };
      plainLevels.set(key, o);
      if (r.basis === "max") maxOutputs.push(o);
      else if (r.basis === "actual") actualOutputs.push(o);
    }
    const dummy = dummyOutput(n, w);
    plain = countPlain(series, w, arena, {
      max0: maxOutputs[0] ?? dummy,
      max1: maxOutputs[1] ?? dummy,
      actual0: actualOutputs[0] ?? dummy,
    });
    const fused = new Set([maxOutputs[0], maxOutputs[1], actualOutputs[0]]);
    for (const r of resolved) {
      if (r.kind !== "plain") continue;
      const o = plainLevels.get(plainKey(r))!;
      if (!fused.has(o)) {
        writeLookup(countedFor(plain, r.basis, n, w), o);
        fused.add(o);
      }
    }
  }

  let withMissing: Variant | null = null;
  const out: RollingRegimeArrays[] = [];
  for (const r of resolved) {
    let variant: Variant;
    let levels: Uint16Array;
    if (r.kind === "plain") {
      variant = plain!;
      levels = plainLevels.get(plainKey(r))!.out;
    } else {
      variant =
        r.kind === "masked"
          ? countGeneral(series, w, r.rules.missingCountsAsException && series.hasMissing, r.mask)
          : (withMissing ??= countGeneral(series, w, true, null));
      levels = arena.levels();
      writeLookup(countedFor(variant, r.basis, n, w), { table: r.table, out: levels });
    }
    out.push({
      regime: r.rules.id,
      pnlBasis: r.basis,
      actual: variant.actual,
      hypothetical: variant.hypothetical,
      counted: countedFor(variant, r.basis, n, w),
      levels,
    });
  }
  return { dates: series.dates, windowSize: w, regimes: out };
}
