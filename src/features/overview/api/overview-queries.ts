import { queryOptions } from "@tanstack/react-query";
import { overviewResponseSchema } from "@shared/schemas/backtest";
import { api } from "@/lib/api-client";

export const overviewQueries = {
  root: () => ["overview"] as const,
  /** Where each entity stands today (analyst and CRO only; other roles get 403 and never ask). */
  list: () =>
    queryOptions({
      queryKey: [...overviewQueries.root(), "list"] as const,
      queryFn: () => api.get("/api/overview", overviewResponseSchema),
    }),
};
