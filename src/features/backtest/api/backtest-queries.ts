import { observationListSchema } from "@shared/schemas/observation";
import { backtestResponseSchema, rollingResponseSchema } from "@shared/schemas/backtest";
import { capitalOnDateSchema } from "@shared/schemas/determination";
import { withQuery } from "@/lib/api-client";
import { getQuery } from "@/lib/queries";

const base = (code: string) => `/api/portfolios/${encodeURIComponent(code)}`;

export const backtestQueries = {
  root: () => ["backtest"] as const,
  /** The engine's backtest at an as-of date; `undefined` asks for the latest day with data. */
  detail: (code: string, asOf?: string) =>
    getQuery(
      [...backtestQueries.root(), "detail", code, asOf ?? "latest"],
      withQuery(`${base(code)}/backtest`, { asOf }),
      backtestResponseSchema,
    ),
  /** Counted exceptions, zone and plus factor on every date of the portfolio's history. */
  rolling: (code: string) =>
    getQuery([...backtestQueries.root(), "rolling", code], `${base(code)}/rolling`, rollingResponseSchema),
  /**
   * The entity's multiplier in force on a date (the last determination's) beside the indicative one
   * of the rolling count; `undefined` asks for today.
   */
  inForce: (entity: string, date?: string) =>
    getQuery(
      [...backtestQueries.root(), "in-force", entity, date ?? "today"],
      withQuery(`/api/entities/${encodeURIComponent(entity)}/capital`, { date }),
      capitalOnDateSchema,
    ),
  /** The daily P&L and VaR as stored (current versions), for the chart. */
  observations: (code: string, from?: string, to?: string) =>
    getQuery(
      [...backtestQueries.root(), "observations", code, from ?? "", to ?? ""],
      withQuery(`${base(code)}/observations`, { from, to }),
      observationListSchema,
    ),
};
