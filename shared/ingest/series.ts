import type { Observation } from "../backtest/types";
import type { ParsedRow } from "./parse-csv";

/** A day of a parsed file as the engine reads it: every amount of the file, null where its cell is empty. */
export function observationOf(r: ParsedRow): Observation {
  return {
    date: r.date,
    actualPnl: r.actual_pnl ?? null,
    hypotheticalPnl: r.hypothetical_pnl ?? null,
    var99: r.var_99 ?? null,
    var975: r.var_975 ?? null,
    svar99: r.svar_99 ?? null,
    var10d: r.var_10d ?? null,
    svar10d: r.svar_10d ?? null,
    es975: r.es_975 ?? null,
    ses: r.ses ?? null,
    rtpl: r.rtpl ?? null,
    imaDrc: r.ima_drc ?? null,
    sbm: r.sbm ?? null,
    rrao: r.rrao ?? null,
    saDrc: r.sa_drc ?? null,
    saGa: r.sa_ga ?? null,
    feesCommissions: r.fees_commissions ?? null,
    reservesAdjustments: r.reserves_adjustments ?? null,
    netInterestIncome: r.net_interest_income ?? null,
    intradayPnl: r.intraday_pnl ?? null,
    newTradePnl: r.new_trade_pnl ?? null,
  };
}

/** A parsed file's days as each portfolio's series for the engine, oldest first. */
export function seriesByPortfolio(rows: readonly ParsedRow[]): Map<string, Observation[]> {
  const out = new Map<string, Observation[]>();
  for (const r of rows) {
    let series = out.get(r.portfolio);
    if (!series) out.set(r.portfolio, (series = []));
    series.push(observationOf(r));
  }
  for (const series of out.values()) series.sort((a, b) => (a.date < b.date ? -1 : a.date > b.date ? 1 : 0));
  return out;
}
