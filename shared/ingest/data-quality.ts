import { dayNumber, fromDayNumber } from "../backtest/calendar";
import type { FindingKind } from "../schemas/finding";

export interface QualityInput {
  date: string;
  actualPnl: number | null;
  hypotheticalPnl: number | null;
  var99: number | null;
  rtpl?: number | null;
}

export interface QualityFinding {
  kind: FindingKind;
  from: string;
  to: string;
  detail: string;
}

/** VaR repeated this many days or more looks stale (common practice; the threshold is ours). */
export const STALE_VAR_DAYS = 5;
/** A daily P&L beyond this multiple of VaR is checked as a possible outlier (common practice). */
export const OUTLIER_VAR_MULTIPLE = 5;

function isWeekday(day: number): boolean {
  const wd = (((day + 4) % 7) + 7) % 7;
  return wd !== 0 && wd !== 6;
}

/** Groups a sorted list of day numbers into runs of consecutive business days. */
function runs(days: number[], holidays: ReadonlySet<number>): [number, number][] {
  const out: [number, number][] = [];
  for (const d of days) {
    const last = out[out.length - 1];
    if (last) {
      let next = last[1] + 1;
      while (!isWeekday(next) || holidays.has(next)) next++;
      if (next === d) {
        last[1] = d;
        continue;
      }
    }
    out.push([d, d]);
  }
  return out;
}

const span = (a: string, b: string) => (a === b ? a : `${a} to ${b}`);

/**
 * Data-quality checks on one portfolio's current daily series (sorted by date): missing
 * business days, stale VaR, P&L without VaR or VaR without P&L, HPL without RTPL, and outliers.
 */
export function findDataQualityIssues(
  series: readonly QualityInput[],
  holidays: ReadonlySet<string>,
): QualityFinding[] {
  const findings: QualityFinding[] = [];
  if (series.length === 0) return findings;

  // Missing business days between the first and the last reported day.
  const present = new Set<number>();
  for (const o of series) present.add(dayNumber(o.date));
  const holidayDays = new Set([...holidays].map(dayNumber));
  const missing: number[] = [];
  for (let d = dayNumber(series[0].date); d <= dayNumber(series[series.length - 1].date); d++) {
    if (isWeekday(d) && !holidayDays.has(d) && !present.has(d)) missing.push(d);
  }
  for (const [a, b] of runs(missing, holidayDays)) {
    const from = fromDayNumber(a);
    const to = fromDayNumber(b);
    findings.push({
      kind: "missing_day",
      from,
      to,
      detail: `No data for business day${a === b ? "" : "s"} ${span(from, to)}`,
    });
  }

  // VaR unchanged for STALE_VAR_DAYS observations or more.
  let runStart = 0;
  for (let i = 1; i <= series.length; i++) {
    const same = i < series.length && series[i].var99 !== null && series[i].var99 === series[runStart].var99;
    if (same) continue;
    const length = i - runStart;
    if (length >= STALE_VAR_DAYS && series[runStart].var99 !== null) {
      const from = series[runStart].date;
      const to = series[i - 1].date;
      findings.push({
        kind: "stale_var",
        from,
        to,
        detail: `VaR unchanged at ${series[runStart].var99} for ${length} days (${span(from, to)})`,
      });
    }
    runStart = i;
  }

  const perDay = (kind: FindingKind, test: (o: QualityInput) => string | null) => {
    for (const o of series) {
      const detail = test(o);
      if (detail) findings.push({ kind, from: o.date, to: o.date, detail });
    }
  };
  perDay("pnl_without_var", (o) =>
    o.var99 === null && (o.actualPnl !== null || o.hypotheticalPnl !== null)
      ? `P&L reported without VaR on ${o.date}`
      : null,
  );
  perDay("var_without_pnl", (o) => {
    if (o.var99 === null || (o.actualPnl !== null && o.hypotheticalPnl !== null)) return null;
    const missingSeries =
      o.actualPnl === null && o.hypotheticalPnl === null
        ? "actual and hypothetical"
        : o.actualPnl === null
          ? "actual"
          : "hypothetical";
    return `VaR reported without ${missingSeries} P&L on ${o.date}`;
  });
  // FRTB: a day with HPL but no RTPL drops out of the P&L attribution test (docs/rules.md#pla); said, not silent.
  if (series.some((o) => o.rtpl != null))
    perDay("hpl_without_rtpl", (o) =>
      o.hypotheticalPnl !== null && o.rtpl == null
        ? `Hypothetical P&L without risk-theoretical P&L on ${o.date}: the P&L attribution test leaves the day out`
        : null,
    );
  perDay("outlier", (o) => {
    if (o.var99 === null || o.var99 <= 0) return null;
    const worst = Math.max(Math.abs(o.actualPnl ?? 0), Math.abs(o.hypotheticalPnl ?? 0));
    return worst > OUTLIER_VAR_MULTIPLE * o.var99
      ? `P&L of ${worst} on ${o.date} is ${(worst / o.var99).toFixed(1)} × VaR (${o.var99}): check the figures`
      : null;
  });
  return findings;
}
