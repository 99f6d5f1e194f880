import type { BacktestResponse, RollingRowDto } from "../../../shared/schemas/backtest";
import { col, type Column, type Table } from "../../kit/table-export";

type ExceptionDay = BacktestResponse["exceptionDays"][number];

const exceptionColumns: Column<ExceptionDay>[] = [
  col.date("Date", (d) => d.date),
  col.money("Actual P&L", (d) => d.actualPnl),
  col.money("Hypothetical P&L", (d) => d.hypotheticalPnl),
  col.money("VaR 99%", (d) => d.var99),
  col.yesNo("Exception on actual", (d) => d.actual),
  col.yesNo("Exception on hypothetical", (d) => d.hypothetical),
  col.money("Excess on actual", (d) => d.excessActual),
  col.money("Excess on hypothetical", (d) => d.excessHypothetical),
  col.yesNo("Excluded", (d) => d.excluded),
  col.yesNo("Missing data", (d) => d.missing),
  col.text("Cause", (d) => d.review?.cause),
  col.text("Explanation", (d) => d.review?.narrative),
  col.text("Exclusion", (d) => d.review?.exclusionStatus),
  col.text("Decision reference", (d) => d.review?.decisionReference),
  col.date("Decision date", (d) => d.review?.decisionDate),
  col.text("Decided by", (d) => d.review?.decidedBy),
  col.text("Reviewed by", (d) => d.review?.reviewedBy),
  col.datetime("Reviewed at", (d) => d.review?.reviewedAt),
];

/** The window's exception days with their reviews, as the Backtest screen lists them. */
export function exceptionsTable(backtest: BacktestResponse): Table<ExceptionDay> {
  return {
    title: `Exceptions ${backtest.portfolio.code} ${backtest.asOf}`,
    columns: exceptionColumns,
    rows: backtest.exceptionDays,
    currency: backtest.entity.currency,
  };
}

const rollingColumns: Column<RollingRowDto>[] = [
  col.date("Date", (r) => r.date),
  col.integer("Exceptions on actual (250 days)", (r) => r.actual),
  col.integer("Exceptions on hypothetical (250 days)", (r) => r.hypothetical),
  col.integer("Counted", (r) => r.counted),
  col.text("Zone", (r) => r.zone),
  col.factor("Plus factor", (r) => r.plusFactor),
  col.yesNo("Full window", (r) => r.complete),
];

/** The rolling 250-day count of each day. */
export function rollingTable(portfolio: string, rows: RollingRowDto[]): Table<RollingRowDto> {
  const span = rows.length ? ` ${rows[0].date} to ${rows.at(-1)!.date}` : "";
  return { title: `Rolling count ${portfolio}${span}`, columns: rollingColumns, rows };
}
