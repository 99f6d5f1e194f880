import { addBusinessDays } from "../../shared/backtest/calendar";
import type { Observation } from "../../shared/backtest/types";

/** Business dates starting on `first` (a business day), weekdays only unless holidays are given. */
export function businessDates(
  count: number,
  first = "2025-01-02",
  holidays: ReadonlySet<string> = new Set(),
): string[] {
  const out: string[] = [];
  let d = first;
  for (let i = 0; i < count; i++) {
    out.push(d);
    d = addBusinessDays(d, 1, holidays);
  }
  return out;
}

export interface SeriesSpec {
  days: number;
  /** Indices with an actual-P&L exception. */
  actualAt?: readonly number[];
  /** Indices with a hypothetical-P&L exception. */
  hypotheticalAt?: readonly number[];
  var99?: number;
  first?: string;
  extra?: Partial<Observation>;
}

/**
 * A plain series: VaR 100 every day, P&L +10 (no exception) except on the listed days, where the
 * loss is 150 (an exception of 50 beyond VaR).
 */
export function buildSeries(spec: SeriesSpec): Observation[] {
  const v = spec.var99 ?? 100;
  const a = new Set(spec.actualAt ?? []);
  const h = new Set(spec.hypotheticalAt ?? []);
  return businessDates(spec.days, spec.first).map((date, i) => ({
    date,
    actualPnl: a.has(i) ? -1.5 * v : 10,
    hypotheticalPnl: h.has(i) ? -1.5 * v : 10,
    var99: v,
    ...spec.extra,
  }));
}
