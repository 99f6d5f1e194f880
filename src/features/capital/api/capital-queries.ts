import { queryOptions } from "@tanstack/react-query";
import type { z } from "zod";
import {
  forecastResponseSchema,
  whatIfResponseSchema,
  type whatIfBodySchema,
  capitalHistorySchema,
} from "@shared/schemas/capital";
import { capitalOnDateSchema } from "@shared/schemas/determination";
import { api, withQuery } from "@/lib/api-client";
import { getQuery } from "@/lib/queries";

/** A what-if as the form sends it: parsed by the shared schema, so every default is filled in and the key is stable. */
export type WhatIfInputs = z.output<typeof whatIfBodySchema>;

const base = (code: string) => `/api/entities/${encodeURIComponent(code)}/capital`;

/**
 * Every key of the Capital screen, from the broadest to one what-if. They all start with "capital",
 * so the shared "every figure" rule (lib/query-scope: all but "auth") refreshes them after an
 * upload, a sign-off or a rule-set change.
 */
export const capitalKeys = {
  all: () => ["capital"] as const,
  entity: (code: string) => [...capitalKeys.all(), code] as const,
  history: (code: string) => [...capitalKeys.entity(code), "history"] as const,
  forecast: (code: string, date?: string) => [...capitalKeys.entity(code), "forecast", date ?? "default"] as const,
  whatIf: (code: string, inputs: WhatIfInputs) => [...capitalKeys.entity(code), "what-if", inputs] as const,
  onDate: (code: string) => [...capitalKeys.entity(code), "on-date"] as const,
};

export const capitalQueries = {
  /** Each quarter's figures as its snapshot holds them, oldest first (treasury receives only signed-off quarters). */
  history: (code: string) => getQuery(capitalKeys.history(code), `${base(code)}/history`, capitalHistorySchema),
  /** The zone forecast for `date`; without it the server forecasts the end of the current quarter. */
  forecast: (code: string, date?: string) =>
    getQuery(capitalKeys.forecast(code, date), withQuery(`${base(code)}/forecast`, { date }), forecastResponseSchema),
  /** Capital today with the determination in force; for FRTB entities the MAR33 aggregation and the desks' timeline. */
  onDate: (code: string) => getQuery(capitalKeys.onDate(code), base(code), capitalOnDateSchema),
  /**
   * A what-if is a query keyed by its inputs, not a mutation: the POST only carries the parameters
   * and changes nothing on the server. As a query the answer is cached per scenario (going back to
   * one costs no request) and goes stale with every other figure when new data or a sign-off
   * arrives, so a scenario on screen is never silently computed on yesterday's data.
   */
  whatIf: (code: string, inputs: WhatIfInputs) =>
    queryOptions({
      queryKey: capitalKeys.whatIf(code, inputs),
      queryFn: () => api.post(`${base(code)}/what-if`, inputs, whatIfResponseSchema),
    }),
};
