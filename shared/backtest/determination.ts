import type { PnlBasis, RegimeId } from "../schemas/common";
import { addBusinessDays, isBusinessDay, nextBusinessDayOnOrAfter } from "./calendar";
import { EngineInputError } from "./errors";
import { requirementFromInputs, type CapitalInputs } from "./capital";
import { backtestAt } from "./exceptions";
import { getRegime, plusFactorFor, STANDARD_WINDOW, zoneFor } from "./regimes";
import { zoneLabel, type Observation, type Zone } from "./types";
import { assertIsoDate } from "./window";

/**
 * The determination of the multiplier: the count is taken at a point in time and the multiplier
 * that follows stays in force until the next determination. Capital on any date uses the
 * multiplier in force on that date; the rolling count of each day only says where the next
 * determination is heading ("indicative").
 *
 * Rule texts (see docs/rules.md for what was read and what is from memory):
 * - BCBS (1996), supervisory framework for backtesting: exceptions are evaluated at least
 *   quarterly on the most recent twelve months of data (250 business days); the plus factor that
 *   follows applies until the next evaluation.
 * - 12 CFR 217.204(b): each quarter, the exceptions over the most recent 250 business days set
 *   the multiplication factor of Table 1 until the next quarterly determination.
 * - CRR Art. 366(3): the addend follows the overshootings over the most recent 250 business days;
 *   the text fixes no frequency, and authorities read it differently, so the frequency is an
 *   entity setting (quarterly by default).
 * - Basel Framework MAR33.41–33.42 with MAR99: the FRTB m_c follows the same quarterly count.
 */

export type DeterminationFrequency = "quarterly" | "monthly";
export const DEFAULT_FREQUENCY: DeterminationFrequency = "quarterly";

/** The supervisory settings a figure depends on. */
export interface SupervisorySettings {
  pnlBasis: PnlBasis;
  /** The supervisor's qualitative addend to the VaR multiplier (m_c). */
  qualitativeAddend: number;
  /** The addend to the stressed VaR multiplier (m_s); null: the same as the VaR addend (CRR Art. 366 sets both). */
  qualitativeAddendSvar: number | null;
  /** A multiplier the supervisor does not let the figure go below; null: none. */
  multiplierFloor: number | null;
  determinationFrequency: DeterminationFrequency;
}

/** A settings record in force from a date on (the governed, approved records of an entity). */
export interface DatedSettings extends SupervisorySettings {
  id: number | null;
  effectiveFrom: string;
  reference: string;
}

/** The record in force on a date: the approved record with the latest effectiveFrom on or before it. */
export function settingsOn<T extends { effectiveFrom: string }>(records: readonly T[], date: string): T | null {
  let found: T | null = null;
  for (const r of records) {
    if (r.effectiveFrom <= date && (!found || r.effectiveFrom >= found.effectiveFrom)) found = r;
  }
  return found;
}

export interface Multipliers {
  plusFactor: number;
  /** m_c: the VaR multiplier (FRTB: the IMCC multiplier). */
  multiplier: number;
  /** m_s: the stressed VaR multiplier (equal to m_c unless the sVaR addend differs; FRTB: not used). */
  multiplierSvar: number;
}

/** base + plus factor + addend, never below the supervisor's floor. */
export function multipliersFor(
  counted: number,
  regime: RegimeId,
  settings: Pick<SupervisorySettings, "qualitativeAddend" | "qualitativeAddendSvar" | "multiplierFloor">,
  windowSize = STANDARD_WINDOW,
  plusFactorOverride?: number,
): Multipliers {
  const rules = getRegime(regime);
  const plusFactor = plusFactorOverride ?? plusFactorFor(counted, rules, windowSize);
  const floor = settings.multiplierFloor ?? -Infinity;
  const m = (addend: number) => round4(Math.max(rules.baseMultiplier + plusFactor + addend, floor));
  const multiplier = m(settings.qualitativeAddend);
  const multiplierSvar = m(settings.qualitativeAddendSvar ?? settings.qualitativeAddend);
  return { plusFactor, multiplier, multiplierSvar };
}

const round4 = (v: number) => Math.round(v * 10_000) / 10_000;

/** The last calendar day of the month of `date`. */
function monthEnd(year: number, month: number): string {
  const d = new Date(Date.UTC(year, month, 0));
  return d.toISOString().slice(0, 10);
}

/** Month ends from the month of `from` to the month of `to`, in order. */
function monthEndsBetween(from: string, to: string): string[] {
  const out: string[] = [];
  let y = Number(from.slice(0, 4));
  let m = Number(from.slice(5, 7));
  const endY = Number(to.slice(0, 4));
  const endM = Number(to.slice(5, 7));
  while (y < endY || (y === endY && m <= endM)) {
    out.push(monthEnd(y, m));
    m++;
    if (m > 12) {
      m = 1;
      y++;
    }
  }
  return out;
}

const isQuarterEnd = (date: string) => ["03", "06", "09", "12"].includes(date.slice(5, 7));

/** The last business day on or before `date` in the entity's calendar. */
export function lastBusinessDayOnOrBefore(date: string, holidays: ReadonlySet<string>): string {
  return isBusinessDay(date, holidays) ? date : addBusinessDays(date, -1, holidays);
}

/** The period end (calendar month or quarter end) whose determination is the first to include `date`. */
export function periodEndCovering(date: string, frequency: DeterminationFrequency): string {
  assertIsoDate(date, "date");
  const y = Number(date.slice(0, 4));
  const m = Number(date.slice(5, 7));
  return monthEnd(y, frequency === "monthly" ? m : Math.ceil(m / 3) * 3);
}

export interface DeterminationPoint {
  /** The calendar period end (a quarter end under the quarterly frequency). */
  periodEnd: string;
  /** Its last business day: the as-of date of the count. */
  asOf: string;
  /** The next business day: the multiplier of this determination is in force from then. */
  effectiveFrom: string;
}

/** Where a period end's determination sits on the entity's calendar. */
export function determinationPoint(periodEnd: string, holidays: ReadonlySet<string>): DeterminationPoint {
  const asOf = lastBusinessDayOnOrBefore(periodEnd, holidays);
  return { periodEnd, asOf, effectiveFrom: addBusinessDays(asOf, 1, holidays) };
}

/**
 * The determination that will first count an exception on `date` (its as-of on or after it), so
 * the one from which a change on that day bites. The frequency is the one in force on that day.
 */
export function determinationCounting(
  date: string,
  frequency: DeterminationFrequency,
  holidays: ReadonlySet<string>,
): DeterminationPoint {
  const point = determinationPoint(periodEndCovering(date, frequency), holidays);
  if (point.asOf >= date) return point;
  // `date` falls after its period's last business day (a weekend or holiday at the period end):
  // the first business day after it belongs to the next period.
  return determinationPoint(periodEndCovering(nextBusinessDayOnOrAfter(date, holidays), frequency), holidays);
}

export interface Determination extends DeterminationPoint, Multipliers {
  /** The day before the next determination is in force; null while none follows. */
  effectiveTo: string | null;
  counted: number;
  actual: number;
  hypothetical: number;
  zone: Zone;
  zoneLabel: string;
  windowStart: string | null;
  windowObservations: number;
  windowComplete: boolean;
  /** The settings the determination used: those in force on its as-of date. */
  settings: DatedSettings;
}

export interface DeterminationOptions {
  regime: RegimeId;
  holidays: ReadonlySet<string>;
  excludedDates?: Iterable<string>;
  /** The entity's approved settings records (any order). */
  settings: readonly DatedSettings[];
  /** Used before the first record is in force. */
  fallback: DatedSettings;
}

/** The settings in force on a date, or the fallback before the first record. */
export function settingsInForce(opts: Pick<DeterminationOptions, "settings" | "fallback">, date: string) {
  return settingsOn(opts.settings, date) ?? opts.fallback;
}

/** One period end's determination, counted on the data on or before its last business day. */
export function determineAt(
  series: readonly Observation[],
  point: DeterminationPoint,
  opts: DeterminationOptions,
): Omit<Determination, "effectiveTo"> {
  const settings = settingsInForce(opts, point.asOf);
  const bt = backtestAt(series, {
    regime: opts.regime,
    pnlBasis: settings.pnlBasis,
    asOf: point.asOf,
    excludedDates: opts.excludedDates,
  });
  const m = multipliersFor(bt.exceptions.counted, opts.regime, settings, bt.windowSize);
  return {
    ...point,
    ...m,
    counted: bt.exceptions.counted,
    actual: bt.exceptions.actual,
    hypothetical: bt.exceptions.hypothetical,
    zone: bt.zone,
    zoneLabel: bt.zoneLabel,
    windowStart: bt.window.start,
    windowObservations: bt.window.observations,
    windowComplete: bt.window.complete,
    settings,
  };
}

/**
 * Every determination the data allows: one per period end (a quarter end, or a month end where
 * the frequency in force is monthly) whose last business day has data, from the first period end
 * on or after the first observation. A period whose last business day has no data yet has no
 * determination: the multiplier of the one before stays in force.
 */
export function determinationsFor(series: readonly Observation[], opts: DeterminationOptions): Determination[] {
  if (series.length === 0) return [];
  const first = series[0].date;
  const last = series[series.length - 1].date;
  const out: Omit<Determination, "effectiveTo">[] = [];
  for (const end of monthEndsBetween(first, last)) {
    const point = determinationPoint(end, opts.holidays);
    if (point.asOf > last || point.asOf < first) continue;
    const frequency = settingsInForce(opts, point.asOf).determinationFrequency;
    if (frequency === "quarterly" && !isQuarterEnd(end)) continue;
    out.push(determineAt(series, point, opts));
  }
  return withSpans(out);
}

/** effectiveTo of each determination: the calendar day before the next one is in force. */
export function withSpans<T extends { effectiveFrom: string }>(
  rows: readonly T[],
): (T & { effectiveTo: string | null })[] {
  return rows.map((d, i) => {
    const next = rows[i + 1];
    if (!next) return { ...d, effectiveTo: null };
    const day = new Date(`${next.effectiveFrom}T00:00:00Z`);
    day.setUTCDate(day.getUTCDate() - 1);
    return { ...d, effectiveTo: day.toISOString().slice(0, 10) };
  });
}

/** The determination in force on a date (effectiveFrom on or before it), or null before the first. */
export function inForceOn<T extends { effectiveFrom: string }>(determinations: readonly T[], date: string): T | null {
  assertIsoDate(date, "date");
  let found: T | null = null;
  for (const d of determinations) if (d.effectiveFrom <= date) found = d;
  return found;
}

/** The rolling count on a date, as if determined that day: where the next determination is heading. */
export function indicativeAt(
  series: readonly Observation[],
  date: string,
  opts: DeterminationOptions,
): { asOf: string; counted: number; zone: Zone; zoneLabel: string; windowComplete: boolean } & Multipliers {
  const settings = settingsInForce(opts, date);
  const bt = backtestAt(series, {
    regime: opts.regime,
    pnlBasis: settings.pnlBasis,
    asOf: date,
    excludedDates: opts.excludedDates,
  });
  if (bt.window.end === null)
    throw new EngineInputError(`No observation on or before ${date}, so there is no indicative count`, { date });
  return {
    asOf: bt.window.end,
    counted: bt.exceptions.counted,
    zone: zoneFor(bt.exceptions.counted, opts.regime, bt.windowSize),
    zoneLabel: zoneLabel(bt.zone, opts.regime),
    windowComplete: bt.window.complete,
    ...multipliersFor(bt.exceptions.counted, opts.regime, settings, bt.windowSize),
  };
}

/**
 * The requirement and add-on for a plus factor under the settings: m_c on VaR and m_s on stressed
 * VaR (CRR Art. 366: separate addends), the floor applied to both; the add-on is the part the plus
 * factor causes (requirement less the requirement with a plus factor of 0).
 */
export function capitalUnder(
  inputs: CapitalInputs,
  regime: RegimeId,
  plusFactor: number,
  settings: Pick<SupervisorySettings, "qualitativeAddend" | "qualitativeAddendSvar" | "multiplierFloor">,
): { requirement: number; addOn: number } {
  const rules = getRegime(regime);
  const withPlus = multipliersFor(0, regime, settings, STANDARD_WINDOW, plusFactor);
  const without = multipliersFor(0, regime, settings, STANDARD_WINDOW, 0);
  const requirement = requirementFromInputs(inputs, rules, withPlus.multiplier, withPlus.multiplierSvar).requirement;
  const base = requirementFromInputs(inputs, rules, without.multiplier, without.multiplierSvar).requirement;
  return { requirement, addOn: Math.max(0, requirement - base) };
}
