import type { BacktestResponse, RollingRowDto } from "../../../shared/schemas/backtest";
import type { Column, Table } from "../../kit/table-export";

type ExceptionDay = BacktestResponse["exceptionDays"][number];

const exceptionColumns: Column<ExceptionDay>[] = [
  { header: "Date", kind: "date", value: (d) => d.date },
  { header: "Actual P&L", kind: "money", value: (d) => d.actualPnl },
  { header: "Hypothetical P&L", kind: "money", value: (d) => d.hypotheticalPnl },
  { header: "VaR 99%", kind: "money", value: (d) => d.var99 },
  { header: "Exception on actual", kind: "yes-no", value: (d) => d.actual },
  { header: "Exception on hypothetical", kind: "yes-no", value: (d) => d.hypothetical },
  { header: "Excess on actual", kind: "money", value: (d) => d.excessActual },
  { header: "Excess on hypothetical", kind: "money", value: (d) => d.excessHypothetical },
  { header: "Excluded", kind: "yes-no", value: (d) => d.excluded },
  { header: "Missing data", kind: "yes-no", value: (d) => d.missing },
  { header: "Cause", kind: "text", value: (d) => d.review?.cause },
  { header: "Explanation", kind: "text", value: (d) => d.review?.narrative },
  { header: "Exclusion", kind: "text", value: (d) => d.review?.exclusionStatus },
  { header: "Decision reference", kind: "text", value: (d) => d.review?.decisionReference },
  { header: "Decision date", kind: "date", value: (d) => d.review?.decisionDate },
  { header: "Decided by", kind: "text", value: (d) => d.review?.decidedBy },
  { header: "Reviewed by", kind: "text", value: (d) => d.review?.reviewedBy },
  { header: "Reviewed at", kind: "datetime", value: (d) => d.review?.reviewedAt },
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
  { header: "Date", kind: "date", value: (r) => r.date },
  { header: "Exceptions on actual (250 days)", kind: "integer", value: (r) => r.actual },
  { header: "Exceptions on hypothetical (250 days)", kind: "integer", value: (r) => r.hypothetical },
  { header: "Counted", kind: "integer", value: (r) => r.counted },
  { header: "Zone", kind: "text", value: (r) => r.zone },
  { header: "Plus factor", kind: "number", decimals: 2, value: (r) => r.plusFactor },
  { header: "Full window", kind: "yes-no", value: (r) => r.complete },
];

/** The rolling 250-day count of each day. */
export function rollingTable(portfolio: string, rows: RollingRowDto[]): Table<RollingRowDto> {
  const span = rows.length ? ` ${rows[0].date} to ${rows.at(-1)!.date}` : "";
  return { title: `Rolling count ${portfolio}${span}`, columns: rollingColumns, rows };
}
