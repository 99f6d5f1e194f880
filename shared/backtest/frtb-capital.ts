import { capitalInputsAt, requirementFromInputs } from "./capital";
import { EngineInputError } from "./errors";
import { deskBacktest, type DeskBacktestResult } from "./frtb-desk";
import { PLA_WINDOW, plaTest, type PlaZone } from "./pla";
import { getRegime } from "./regimes";
import type { Observation } from "./types";
import { assertIsoDate, lastIndexOnOrBefore } from "./window";

/**
 * FRTB capital as the rules aggregate it (docs/rules.md#frtb-aggregation) and the eligibility of
 * each trading desk over time (docs/rules.md#frtb-eligibility).
 *
 * - Basel Framework MAR33.41: C_A = max(IMCC_{t−1} + SES_{t−1}, m_c · IMCC_avg + SES_avg) over the
 *   desks that pass backtesting and sit in the PLA green or amber zone.
 * - MAR33.43: ACR_total = min(IMA_{G,A} + capital surcharge + C_U, SA_all desks)
 *   + max(0, IMA_{G,A} − SA_{G,A}), with IMA_{G,A} = C_A + DRC and C_U the standardised charge of
 *   the desks out of the model.
 * - MAR33.45: capital surcharge = k · max(0, SA_{G,A} − IMA_{G,A}), k = 0.5 · ΣSA(amber desks) / SA_{G,A}.
 */

export type DeskStatus = "in-model" | "amber" | "out-of-model";

// ---- desk eligibility ------------------------------------------------------------------------

export interface DeskPlaStanding {
  /** Days in the last 250 with both HPL and RTPL. */
  observations: number;
  /** Fewer paired days than the 250 the test runs on: no zone (provisional). */
  provisional: boolean;
  zone: PlaZone | null;
  spearman: number | null;
  ks: number | null;
  /** Days in the window with hypothetical P&L but no risk-theoretical P&L (data-quality findings). */
  hplWithoutRtpl: string[];
}

/**
 * A desk's P&L attribution standing at a date: the test over the days of the last 250 that carry
 * both HPL and RTPL (MAR32.34–32.42). With fewer than 250 such days the rule's sample is not there,
 * so no zone is given: the standing is provisional and the desk keeps the status it had.
 */
export function deskPlaStanding(series: readonly Observation[], asOf: string): DeskPlaStanding {
  assertIsoDate(asOf, "asOf");
  const end = lastIndexOnOrBefore(series, asOf);
  const window = end < 0 ? [] : series.slice(Math.max(0, end - PLA_WINDOW + 1), end + 1);
  const paired = window.filter((o) => o.hypotheticalPnl != null && o.rtpl != null);
  const hplWithoutRtpl = window.filter((o) => o.hypotheticalPnl != null && o.rtpl == null).map((o) => o.date);
  if (paired.length < PLA_WINDOW) {
    return {
      observations: paired.length,
      provisional: true,
      zone: null,
      spearman: null,
      ks: null,
      hplWithoutRtpl,
    };
  }
  const r = plaTest(
    paired.map((o) => o.hypotheticalPnl as number),
    paired.map((o) => o.rtpl as number),
  );
  return {
    observations: r.observations,
    provisional: false,
    zone: r.zone,
    spearman: r.spearman,
    ks: r.ks,
    hplWithoutRtpl,
  };
}

export interface DeskStanding {
  code: string;
  status: DeskStatus;
  /** Why the desk has this status, in a sentence. */
  reason: string;
  backtest99: number;
  backtest975: number;
  backtestPasses: boolean;
  plaZone: PlaZone | null;
  plaProvisional: boolean;
  plaObservations: number;
  spearman: number | null;
  ks: number | null;
}

/**
 * The status a desk takes at a determination, from its status before and this quarter's tests:
 * - failing backtesting (more than 12 exceptions at 99% or 30 at 97.5%, MAR32.19) or a PLA red
 *   zone (MAR32.44) puts it out of the model: its positions take the standardised charge;
 * - a desk out of the model returns only once its backtesting over the last 250 days is within
 *   both limits and its PLA zone is green (MAR32.45);
 * - a desk in the model whose PLA zone is amber stays in the model with the capital surcharge
 *   (MAR32.43, MAR33.45); green (or a provisional PLA) leaves it in the model.
 */
export function nextDeskStatus(
  previous: DeskStatus | null,
  backtest: Pick<DeskBacktestResult, "passes" | "at99" | "at975">,
  pla: Pick<DeskPlaStanding, "zone" | "provisional" | "observations">,
): { status: DeskStatus; reason: string } {
  if (!backtest.passes) {
    const which = backtest.at99.fails
      ? `${backtest.at99.count} exceptions at 99% (limit ${backtest.at99.limit})`
      : `${backtest.at975.count} exceptions at 97.5% (limit ${backtest.at975.limit})`;
    return { status: "out-of-model", reason: `Fails desk backtesting: ${which} (MAR32.19).` };
  }
  if (pla.zone === "red") return { status: "out-of-model", reason: "PLA red zone (MAR32.44)." };
  if (previous === "out-of-model") {
    if (pla.zone === "green")
      return { status: "in-model", reason: "Returns: backtesting within limits and PLA green (MAR32.45)." };
    return {
      status: "out-of-model",
      reason: pla.provisional
        ? `Stays out: a return needs a PLA green zone and the PLA has ${pla.observations} of 250 days (MAR32.45).`
        : "Stays out: a return needs a PLA green zone; it is amber (MAR32.45).",
    };
  }
  if (pla.zone === "amber")
    return { status: "amber", reason: "PLA amber zone: in the model with the capital surcharge (MAR33.45)." };
  if (pla.zone === "green") return { status: "in-model", reason: "Backtesting within limits and PLA green." };
  const kept = previous ?? "in-model";
  return {
    status: kept,
    reason: `PLA provisional (${pla.observations} of 250 days with HPL and RTPL): the desk keeps its status.`,
  };
}

/** A desk's standing at a determination's as-of date, given its status before. */
export function deskStandingAt(
  code: string,
  series: readonly Observation[],
  asOf: string,
  previous: DeskStatus | null,
  excluded?: ReadonlySet<string>,
): DeskStanding {
  const backtest = deskBacktest(series, asOf, excluded);
  const pla = deskPlaStanding(series, asOf);
  const next = nextDeskStatus(previous, backtest, pla);
  return {
    code,
    ...next,
    backtest99: backtest.at99.count,
    backtest975: backtest.at975.count,
    backtestPasses: backtest.passes,
    plaZone: pla.zone,
    plaProvisional: pla.provisional,
    plaObservations: pla.observations,
    spearman: pla.spearman,
    ks: pla.ks,
  };
}

export interface DeskStatusPoint {
  asOf: string;
  desks: DeskStanding[];
}

/**
 * Each desk's status at each determination (as-of dates in order), each one from the status the
 * determination before left it in. A desk with no data on or before an as-of date is left out of
 * that determination. `frozen` holds the standings a signed-off quarter froze (by as-of date and
 * desk code): they stand as signed off, and the next determination starts from them.
 */
export function deskStatusHistory(
  desks: readonly { code: string; series: readonly Observation[]; excluded?: ReadonlySet<string> }[],
  asOfDates: readonly string[],
  frozen: ReadonlyMap<string, ReadonlyMap<string, DeskStanding>> = new Map(),
): DeskStatusPoint[] {
  const previous = new Map<string, DeskStatus>();
  const out: DeskStatusPoint[] = [];
  for (const asOf of asOfDates) {
    const standings: DeskStanding[] = [];
    for (const d of desks) {
      if (lastIndexOnOrBefore(d.series, asOf) < 0) continue;
      const s =
        frozen.get(asOf)?.get(d.code) ??
        deskStandingAt(d.code, d.series, asOf, previous.get(d.code) ?? null, d.excluded);
      previous.set(d.code, s.status);
      standings.push(s);
    }
    out.push({ asOf, desks: standings });
  }
  return out;
}

// ---- the aggregation -------------------------------------------------------------------------

export interface FrtbDeskInput {
  code: string;
  status: DeskStatus;
  series: readonly Observation[];
}

export interface FrtbDeskCapital {
  code: string;
  status: DeskStatus;
  /** The desk's standardised charge on the as-of date: SBM + RRAO + SA DRC (MAR20.2); null when not supplied. */
  sa: number | null;
  imcc: number | null;
  ses: number | null;
  imaDrc: number | null;
}

export interface FrtbAggregation {
  asOf: string;
  multiplier: number;
  imccPrev: number;
  imccAvg: number;
  sesPrev: number;
  sesAvg: number;
  /** Which side of C_A's max binds. */
  binding: "previous" | "average";
  ca: number;
  drc: number;
  imaGA: number;
  cU: number;
  saAll: number;
  saGA: number;
  /** ΣSA of the amber desks (k's numerator before the 0.5). */
  saAmber: number;
  k: number;
  surcharge: number;
  acrTotal: number;
  /** Where each figure came from: "top" (the top of house supplied it) or "desks" (the desks' own figures added up). */
  sources: { imcc: "top" | "desks"; drc: "top" | "desks" | "none"; saAll: "top" | "desks"; saGA: "top" | "desks" };
  desks: FrtbDeskCapital[];
  /** Figures the upstream engine did not supply, and the rule used instead. */
  notes: string[];
}

/** The value of a field on the last observation on or before asOf that carries it (within the last 60 observations). */
function latest(series: readonly Observation[], asOf: string, value: (o: Observation) => number | null): number | null {
  const end = lastIndexOnOrBefore(series, asOf);
  for (let i = end; i >= 0 && i > end - 60; i--) {
    const v = value(series[i]);
    if (v != null) return v;
  }
  return null;
}

/** SBM + RRAO + SA DRC of an observation (MAR20.2: the standardised charge is their simple sum); null when none is given. */
export function standardisedCharge(o: Observation): number | null {
  if (o.sbm == null && o.rrao == null && o.saDrc == null) return null;
  return (o.sbm ?? 0) + (o.rrao ?? 0) + (o.saDrc ?? 0);
}

/** The day-by-day sum of the desks' IMCC (es975) and SES: a stand-in for the figure of the desks together. */
function summedSeries(desks: readonly FrtbDeskInput[], asOf: string): Observation[] {
  const byDate = new Map<string, { es: number | null; ses: number | null }>();
  for (const d of desks) {
    for (const o of d.series) {
      if (o.date > asOf) break;
      const row = byDate.get(o.date) ?? { es: null, ses: null };
      if (o.es975 != null) row.es = (row.es ?? 0) + o.es975;
      if (o.ses != null) row.ses = (row.ses ?? 0) + o.ses;
      byDate.set(o.date, row);
    }
  }
  return [...byDate.entries()]
    .sort(([a], [b]) => (a < b ? -1 : 1))
    .map(([date, v]) => ({ date, actualPnl: null, hypotheticalPnl: null, var99: null, es975: v.es, ses: v.ses }));
}

const sumOf = (values: readonly (number | null)[]) => values.reduce<number>((a, v) => a + (v ?? 0), 0);

/**
 * The aggregate capital requirement for market risk (MAR33.41–33.45) at a date, every
 * intermediate figure returned. `multiplier` is m_c (MAR33.42). The top of house's es_975, ses and
 * ima_drc are the figures of the desks in the model together when every desk is in the model;
 * its standardised figures are those of all desks, and its sa_ga (where supplied) that of the
 * desks in the model. Where a figure of several desks together is not supplied, the desks' own
 * figures are added up and a note says so (docs/rules.md#frtb-aggregation).
 */
export function frtbAggregation(
  top: readonly Observation[],
  desks: readonly FrtbDeskInput[],
  asOf: string,
  multiplier: number,
): FrtbAggregation {
  assertIsoDate(asOf, "asOf");
  if (!(multiplier >= 1))
    throw new EngineInputError(`m_c must be at least 1, got ${multiplier}`, { field: "multiplier" });
  const notes: string[] = [];
  const eligible = desks.filter((d) => d.status !== "out-of-model");
  const out = desks.filter((d) => d.status === "out-of-model");
  const amber = desks.filter((d) => d.status === "amber");
  const allIn = out.length === 0;

  const deskFigures: FrtbDeskCapital[] = desks.map((d) => ({
    code: d.code,
    status: d.status,
    sa: latest(d.series, asOf, standardisedCharge),
    imcc: latest(d.series, asOf, (o) => o.es975 ?? null),
    ses: latest(d.series, asOf, (o) => o.ses ?? null),
    imaDrc: latest(d.series, asOf, (o) => o.imaDrc ?? null),
  }));
  const figuresOf = (code: string) => deskFigures.find((f) => f.code === code) as FrtbDeskCapital;

  // MAR33.41: C_A over the desks in the model (none in the model: C_A is 0).
  const topHasEs = latest(top, asOf, (o) => o.es975 ?? null) != null;
  const noneIn = desks.length > 0 && eligible.length === 0;
  const imccFromTop = desks.length === 0 || (allIn && topHasEs);
  if (!imccFromTop && !noneIn)
    notes.push(
      "IMCC and SES of the desks in the model together are not supplied: C_A adds up the desks' own figures (expected shortfall does not fall when desks are added up, so the sum does not understate).",
    );
  let imccPrev = 0;
  let imccAvg = 0;
  let sesPrev = 0;
  let sesAvg = 0;
  let ca = 0;
  let binding: "previous" | "average" = "previous";
  if (!noneIn) {
    const inputs = capitalInputsAt(imccFromTop ? top : summedSeries(eligible, asOf), "frtb", asOf);
    const r = requirementFromInputs(inputs, getRegime("frtb"), multiplier);
    imccPrev = inputs.esPrev ?? 0;
    imccAvg = inputs.esAvg60 ?? 0;
    sesPrev = inputs.sesPrev ?? 0;
    sesAvg = inputs.sesAvg60 ?? 0;
    ca = r.requirement;
    binding = r.binding;
  }

  // MAR33.43: IMA_{G,A} = C_A + DRC of the desks in the model.
  const topDrc = latest(top, asOf, (o) => o.imaDrc ?? null);
  let drc = 0;
  let drcSource: FrtbAggregation["sources"]["drc"] = "none";
  if (allIn && topDrc != null) {
    drc = topDrc;
    drcSource = "top";
  } else if (eligible.some((d) => figuresOf(d.code).imaDrc != null)) {
    drc = sumOf(eligible.map((d) => figuresOf(d.code).imaDrc));
    drcSource = "desks";
    notes.push(
      "The default risk charge of the desks in the model together is not supplied: DRC adds up the desks' own.",
    );
  } else if (eligible.length > 0) {
    notes.push("No IMA default risk charge (ima_drc) is supplied: DRC is taken as 0.");
  }
  const imaGA = ca + drc;

  // MAR33.43: SA_all desks, SA_{G,A}, C_U.
  const topSa = latest(top, asOf, standardisedCharge);
  const deskSaSum = (list: readonly FrtbDeskInput[]) => sumOf(list.map((d) => figuresOf(d.code).sa));
  for (const d of deskFigures)
    if (d.sa == null && d.status !== "in-model")
      notes.push(`${d.code} (${d.status}) has no standardised figures (sbm, rrao, sa_drc): they count as 0.`);
  let saAll: number;
  let saAllSource: "top" | "desks" = "top";
  if (topSa != null) saAll = topSa;
  else if (deskFigures.some((d) => d.sa != null)) {
    saAll = deskSaSum(desks);
    saAllSource = "desks";
    notes.push(
      "The standardised charge of all desks together is not supplied at the top of house: SA_all adds up the desks' own.",
    );
  } else {
    throw new EngineInputError(
      `No standardised figures (sbm, rrao, sa_drc) on or before ${asOf}: the aggregate capital requirement needs the standardised charge of all desks (MAR33.43)`,
      { date: asOf, field: "sbm" },
    );
  }
  const topSaGa = latest(top, asOf, (o) => o.saGa ?? null);
  let saGA: number;
  let saGASource: "top" | "desks" = "top";
  if (allIn) saGA = saAll;
  else if (topSaGa != null) saGA = topSaGa;
  else {
    saGA = deskSaSum(eligible);
    saGASource = "desks";
    notes.push(
      "The standardised charge of the desks in the model together (sa_ga) is not supplied: SA_G,A adds up the desks' own.",
    );
  }
  const cU = deskSaSum(out);
  if (out.length > 0)
    notes.push(
      "C_U adds up the standardised charges of the desks out of the model (no figure of those desks together is supplied).",
    );

  // MAR33.45: k = 0.5 · ΣSA(amber) / SA_{G,A}; surcharge = k · max(0, SA_{G,A} − IMA_{G,A}).
  const saAmber = deskSaSum(amber);
  const k = amber.length > 0 && saGA > 0 ? (0.5 * saAmber) / saGA : 0;
  const surcharge = k * Math.max(0, saGA - imaGA);
  const acrTotal = Math.min(imaGA + surcharge + cU, saAll) + Math.max(0, imaGA - saGA);

  return {
    asOf,
    multiplier,
    imccPrev,
    imccAvg,
    sesPrev,
    sesAvg,
    binding,
    ca,
    drc,
    imaGA,
    cU,
    saAll,
    saGA,
    saAmber,
    k,
    surcharge,
    acrTotal,
    sources: { imcc: imccFromTop ? "top" : "desks", drc: drcSource, saAll: saAllSource, saGA: saGASource },
    desks: deskFigures,
    notes,
  };
}

// ---- the scope of the bank-wide backtest ---------------------------------------------------------

/** Two P&L figures are the same within this much (each desk's amount is rounded to the cent). */
const SCOPE_TOLERANCE = 1;

export interface TopScope {
  /** Days of the window on which the top of house and every desk reported actual P&L. */
  daysCompared: number;
  /** Days on which the top's P&L is the sum of the desks in the model. */
  matchesInModel: number;
  /** Days on which it is the sum of all desks. */
  matchesAll: number;
  /** Desks out of the model (the scope question arises only when there are some). */
  outOfModel: string[];
}

/**
 * Which desks the top-of-house P&L covers over the 250 days up to `asOf`, and only after `after` (the
 * quarter end whose determination set the statuses: before it, other statuses stood) (docs/rules.md#frtb-scope).
 * The bank-wide backtest runs on the desks in the model (MAR32, from memory: backtesting at the level
 * of all desks in the scope of the internal model); P&L adds up, so the sums show what the upstream
 * engine sent. VaR does not add up, so Quartermark cannot rebuild it: it can only say what it sees.
 */
export function topOfHouseScope(
  top: readonly Observation[],
  desks: readonly { code: string; status: DeskStatus; series: readonly Observation[] }[],
  asOf: string,
  after = "",
): TopScope {
  const end = lastIndexOnOrBefore(top, asOf);
  const byDate = desks.map((d) => ({ d, pnl: new Map(d.series.map((o) => [o.date, o.actualPnl])) }));
  let daysCompared = 0;
  let matchesInModel = 0;
  let matchesAll = 0;
  for (let i = Math.max(0, end - 249); i <= end; i++) {
    const o = top[i];
    if (o.actualPnl == null || o.date <= after) continue;
    let all = 0;
    let inModel = 0;
    let complete = true;
    for (const { d, pnl } of byDate) {
      const v = pnl.get(o.date);
      if (v == null) {
        complete = false;
        break;
      }
      all += v;
      if (d.status !== "out-of-model") inModel += v;
    }
    if (!complete) continue;
    daysCompared++;
    if (Math.abs(o.actualPnl - inModel) <= SCOPE_TOLERANCE) matchesInModel++;
    if (Math.abs(o.actualPnl - all) <= SCOPE_TOLERANCE) matchesAll++;
  }
  const outOfModel = desks.filter((d) => d.status === "out-of-model").map((d) => d.code);
  return { daysCompared, matchesInModel, matchesAll, outOfModel };
}

/** What the screen and the pack say about the scope, when there is something to say. */
export function topScopeNote(scope: TopScope): string | null {
  if (scope.outOfModel.length === 0 || scope.daysCompared === 0) return null;
  const out = scope.outOfModel.join(", ");
  const most = (n: number) => n >= scope.daysCompared * 0.95;
  if (most(scope.matchesInModel))
    return (
      `The top-of-house P&L is the sum of the desks in the model on ${scope.matchesInModel} of the ` +
      `${scope.daysCompared} days compared: the bank-wide backtest runs on them, without ${out}.`
    );
  if (most(scope.matchesAll))
    return (
      `The top-of-house P&L is the sum of all desks on ${scope.matchesAll} of the ${scope.daysCompared} days ` +
      `compared, ` +
      `including ${out}, which ${scope.outOfModel.length > 1 ? "are" : "is"} out of the model: the bank-wide ` +
      `backtest should cover the desks in the model only. Ask the risk system for a top of house without ${out}.`
    );
  return (
    `The top-of-house P&L is neither the sum of the desks in the model nor of all desks on most of the ` +
    `${scope.daysCompared} days compared: check which desks the top of house covers.`
  );
}
