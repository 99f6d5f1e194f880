/**
 * The invented Larkspur daily data: a deterministic generator (seeded random numbers) with fat
 * tails (Student-t innovations), volatility clusters (GARCH(1,1)) and VaR from a rolling
 * historical simulation over the previous 250 days, so that exceptions come the way they do
 * in life — in bunches after volatility rises, because the VaR learns late.
 * Nothing here is real data.
 */
import type { CsvColumn } from "../../shared/schemas/upload";

/** mulberry32: a small, well-known seeded generator; the same seed gives the same demo. */
export function seededRandom(seed: number): () => number {
  let a = seed >>> 0;
  return () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = a;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}

/** A standard normal draw (Box–Muller). */
export function normal(rand: () => number): number {
  const u = Math.max(rand(), 1e-12);
  return Math.sqrt(-2 * Math.log(u)) * Math.cos(2 * Math.PI * rand());
}

/** Student-t with `df` degrees of freedom, scaled to unit variance. */
function studentT(rand: () => number, df: number): number {
  let chi = 0;
  for (let i = 0; i < df; i++) chi += normal(rand) ** 2;
  return normal(rand) / Math.sqrt(chi / df) / Math.sqrt(df / (df - 2));
}

export interface StressEpisode {
  /** Business days before the last day at which the stress starts. */
  startsDaysBeforeEnd: number;
  days: number;
  /** Volatility multiple during the episode. */
  factor: number;
}

export interface PortfolioSpec {
  code: string;
  seed: number;
  /** Typical daily P&L standard deviation, in the entity's currency. */
  dailyVol: number;
  stress?: StressEpisode;
  /** FRTB desks: how closely the risk-theoretical P&L follows the hypothetical (correlation of the draws). */
  rtplLoading?: number;
  withEs?: boolean;
  /**
   * FRTB desks: a period in which the desk's reported VaR understated its risk (a risk factor left out
   * of the model), counted back from the last day: the desk fails desk backtesting and leaves the model.
   */
  varUnderstated?: { startsDaysBeforeEnd: number; days: number; factor: number };
}

/**
 * FRTB charges against the desk's IMCC (es_975), in proportions of the order the FRTB impact studies
 * report: the standardised charge about 2.3 times IMCC (SBM 1.9, RRAO 0.06, SA DRC 0.35), the IMA default
 * risk charge about 0.18. The bank's own choice of illustration, not a rule.
 */
const CHARGES = { imaDrc: 0.18, sbm: 1.9, rrao: 0.06, saDrc: 0.35 } as const;
/** The top of house's standardised charges of all desks together: SBM and SA DRC diversify, RRAO adds up. */
const TOP_DIVERSIFICATION = { imaDrc: 0.9, sbm: 0.85, rrao: 1, saDrc: 0.9 } as const;

/** The bank's VaR adds a margin over the plain historical-simulation quantile (its model choice; ours is 1.2). */
export const VAR_MARGIN = 1.2;

const WARM_UP = 260; // days simulated before the first reported one, so the first VaR has its 250 days
/**
 * Every book is simulated over the same number of days and the last ones are reported, so the
 * story counted back from the last day does not depend on how many holidays the calendar has.
 * A longer history (the load bench's) is simulated over as many days as it needs.
 */
const SIMULATED_DAYS = 1000 + WARM_UP;

function simulatedLength(reported: number): number {
  return Math.max(SIMULATED_DAYS, reported + WARM_UP);
}

/** k-th largest loss (k from 1) among the values, as a positive amount. */
function kthLoss(values: Float64Array, from: number, to: number, k: number, scratch: Float64Array): number {
  const n = to - from;
  for (let i = 0; i < n; i++) scratch[i] = -values[from + i];
  const view = scratch.subarray(0, n).sort();
  return view[n - k];
}

function meanOfWorst(values: Float64Array, from: number, to: number, k: number, scratch: Float64Array): number {
  const n = to - from;
  for (let i = 0; i < n; i++) scratch[i] = -values[from + i];
  const view = scratch.subarray(0, n).sort();
  let s = 0;
  for (let i = n - k; i < n; i++) s += view[i];
  return s / k;
}

interface SimulatedBook {
  hpl: Float64Array;
  apl: Float64Array;
  rtpl: Float64Array;
  sigma: Float64Array;
}

function simulateBook(spec: PortfolioSpec, total: number): SimulatedBook {
  const rand = seededRandom(spec.seed);
  const hpl = new Float64Array(total);
  const apl = new Float64Array(total);
  const rtpl = new Float64Array(total);
  const sigma = new Float64Array(total);
  const alpha = 0.07;
  const beta = 0.9;
  const omega = 1 - alpha - beta; // long-run variance 1
  let variance = 1;
  let lastShock = 0;
  const stressFrom = spec.stress ? total - spec.stress.startsDaysBeforeEnd : Infinity;
  const stressTo = spec.stress ? stressFrom + spec.stress.days : -Infinity;
  const loading = spec.rtplLoading ?? 0.97;
  for (let t = 0; t < total; t++) {
    variance = omega + alpha * lastShock * lastShock + beta * variance;
    const stressed = t >= stressFrom && t < stressTo ? spec.stress!.factor : 1;
    const s = Math.sqrt(variance) * stressed;
    const z = studentT(rand, 5);
    lastShock = z * Math.sqrt(variance);
    sigma[t] = s;
    hpl[t] = spec.dailyVol * (s * z + 0.04);
    // Actual P&L adds fees, commissions and intraday trading: small, mostly positive.
    apl[t] = hpl[t] + spec.dailyVol * (0.06 + 0.12 * normal(rand));
    // RTPL: the same risk, measured by the risk model's factors only; the loading sets how closely.
    rtpl[t] = spec.dailyVol * (s * (loading * z + Math.sqrt(1 - loading * loading) * studentT(rand, 5)) + 0.04);
  }
  return { hpl, apl, rtpl, sigma };
}

export type DemoRow = Partial<Record<CsvColumn, string | number | null>>;

const money = (x: number) => Math.round(x * 100) / 100;

/**
 * The book's size from day to day (positions are traded): a slow cycle, a faster one and a little
 * noise, from its own seeded stream so that the P&L draws stay the same.
 */
function positionsFor(seed: number, total: number): Float64Array {
  const rand = seededRandom(seed ^ 0x0b00c);
  const out = new Float64Array(total);
  for (let t = 0; t < total; t++)
    out[t] = 1 + 0.06 * Math.sin(t / 37) + 0.025 * Math.sin(t / 5.3) + 0.01 * normal(rand);
  return out;
}

/**
 * Risk measures from a rolling historical simulation: today's positions revalued on the last 250
 * days' moves (so VaR moves with the book every day, as it does in life).
 */
function rowsFor(
  code: string,
  seed: number,
  book: SimulatedBook,
  dates: string[],
  withEs: boolean,
  withRtpl: boolean,
  stressSample: Float64Array,
  spec?: Pick<PortfolioSpec, "varUnderstated"> & { charges?: boolean },
): DemoRow[] {
  const rows: DemoRow[] = [];
  const scratch = new Float64Array(250);
  const total = book.hpl.length;
  const offset = total - dates.length;
  const sVarBase = kthLoss(stressSample, 0, 250, 3, scratch);
  const position = positionsFor(seed, total);
  const under = spec?.varUnderstated;
  const underFrom = under ? dates.length - under.startsDaysBeforeEnd : Infinity;
  const underTo = under ? underFrom + under.days : -Infinity;
  for (let i = 0; i < dates.length; i++) {
    const t = offset + i;
    const size = position[t];
    // The risk measures see a smaller book while the model understates (the P&L does not).
    const risk = size * (i >= underFrom && i < underTo ? (under as { factor: number }).factor : 1);
    // 99%: the 3rd worst of 250 days; 97.5%: the 7th worst (common practice for a 250-day HS), with the margin.
    const var99 = VAR_MARGIN * risk * kthLoss(book.hpl, t - 250, t, 3, scratch);
    const var975 = VAR_MARGIN * risk * kthLoss(book.hpl, t - 250, t, 7, scratch);
    const row: DemoRow = {
      portfolio: code,
      date: dates[i],
      actual_pnl: money(book.apl[t] * size),
      hypothetical_pnl: money(book.hpl[t] * size),
      var_99: money(var99),
      var_975: money(var975),
      svar_99: money(Math.max(sVarBase * risk, var99 * 1.1)),
    };
    if (withEs) {
      const es = risk * meanOfWorst(book.hpl, t - 250, t, 6, scratch);
      row.es_975 = money(es);
      row.ses = money(es * (0.15 + 0.02 * Math.sin(t / 17)));
      if (spec?.charges) {
        row.ima_drc = money(es * CHARGES.imaDrc);
        row.sbm = money(es * CHARGES.sbm * (1 + 0.03 * Math.sin(t / 23)));
        row.rrao = money(es * CHARGES.rrao);
        row.sa_drc = money(es * CHARGES.saDrc);
      }
    }
    if (withRtpl) row.rtpl = money(book.rtpl[t] * size);
    rows.push(row);
  }
  return rows;
}

/** A fixed stressed period for sVaR: 250 draws at 2.4 times normal volatility. */
function stressSampleFor(spec: PortfolioSpec): Float64Array {
  const rand = seededRandom(spec.seed ^ 0x5eed);
  const out = new Float64Array(250);
  for (let i = 0; i < 250; i++) out[i] = spec.dailyVol * 2.4 * studentT(rand, 4);
  return out;
}

/** Daily rows of one portfolio on the given business dates (oldest first). */
export function generatePortfolioRows(spec: PortfolioSpec, dates: string[]): DemoRow[] {
  const book = simulateBook(spec, simulatedLength(dates.length));
  return rowsFor(
    spec.code,
    spec.seed,
    book,
    dates,
    spec.withEs ?? false,
    spec.rtplLoading !== undefined,
    stressSampleFor(spec),
  );
}

/**
 * A top-of-house book made of desks: its P&L is the desks' sum and its risk measures come from
 * the same historical simulation on that sum. Returns the top rows and each desk's rows.
 */
export function generateDeskedRows(
  top: { code: string; seed: number },
  desks: PortfolioSpec[],
  dates: string[],
): DemoRow[] {
  const total = simulatedLength(dates.length);
  const books = desks.map((d) => simulateBook(d, total));
  const sum: SimulatedBook = {
    hpl: new Float64Array(total),
    apl: new Float64Array(total),
    rtpl: new Float64Array(total),
    sigma: new Float64Array(total),
  };
  for (const b of books) {
    for (let t = 0; t < total; t++) {
      sum.hpl[t] += b.hpl[t];
      sum.apl[t] += b.apl[t];
      sum.rtpl[t] += b.rtpl[t];
    }
  }
  const topVol = Math.sqrt(desks.reduce((s, d) => s + d.dailyVol ** 2, 0));
  const rows = rowsFor(
    top.code,
    top.seed,
    sum,
    dates,
    true,
    true,
    stressSampleFor({ code: top.code, seed: top.seed, dailyVol: topVol }),
  );
  const deskRows = desks.map((d, i) =>
    rowsFor(d.code, d.seed, books[i], dates, true, true, stressSampleFor(d), { ...d, charges: true }),
  );
  // The top of house carries the standardised charges of all desks together and the IMA DRC of all desks.
  rows.forEach((row, i) => {
    const sum = (c: "ima_drc" | "sbm" | "rrao" | "sa_drc") => deskRows.reduce((s, r) => s + Number(r[i][c] ?? 0), 0);
    row.ima_drc = money(sum("ima_drc") * TOP_DIVERSIFICATION.imaDrc);
    row.sbm = money(sum("sbm") * TOP_DIVERSIFICATION.sbm);
    row.rrao = money(sum("rrao") * TOP_DIVERSIFICATION.rrao);
    row.sa_drc = money(sum("sa_drc") * TOP_DIVERSIFICATION.saDrc);
  });
  for (const r of deskRows) rows.push(...r);
  return rows;
}
