import { overviewResponseSchema } from "@shared/schemas/backtest";
import { getQuery } from "@/lib/queries";

export const overviewQueries = {
  root: () => ["overview"] as const,
  /** Where each entity stands today (analyst and CRO only; other roles get 403 and never ask). */
  list: () => getQuery([...overviewQueries.root(), "list"], "/api/overview", overviewResponseSchema),
};
