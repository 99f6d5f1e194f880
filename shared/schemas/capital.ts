import { z } from "zod";
import { isoDateSchema, regimeSchema } from "./common";
import { inForceTodaySchema, rollOffSchema, zoneSchema } from "./backtest";
import { bitesFromSchema } from "./determination";
import { snapshotSchema } from "./snapshot";

/**
 * Capital: where the entity's figures may go next (docs/api.md#capital): the zone forecast for a
 * future date, what the next exception would cost, and what-if scenarios. All figures come from the
 * engine (shared/backtest/forecast.ts, what-if.ts, capital.ts) on the current data of the
 * entity's top-of-house portfolio.
 */

/** A determination point: the period end, its last business day, and the day its multiplier is in force from. */
export const determinationPointSchema = bitesFromSchema;

/**
 * What the figures start from: today's data ("current", the reporting office), or the latest
 * signed-off determination ("approved", treasury, which reads approved figures only).
 */
export const startsFromSchema = z.object({
  kind: z.enum(["current", "approved"]),
  /** The signed-off determination's period end (null for current data). */
  quarterEnd: z.string().nullable(),
  asOf: z.string(),
  status: z.enum(["approved", "filed"]).nullable(),
});

/** The determination in force on the as-of date (null before the first). */
export const inForceSummarySchema = inForceTodaySchema.omit({ zoneLabel: true }).nullable();

/** `date`: the future date to forecast (default: the end of the current quarter). */
export const forecastQuerySchema = z.object({ date: isoDateSchema.optional() }).strict();

export const forecastResponseSchema = z.object({
  entity: z.string(),
  portfolio: z.string(),
  regime: regimeSchema,
  currency: z.string(),
  /** The last day with data: the forecast starts from it. */
  asOf: z.string(),
  date: z.string(),
  /** Counted exceptions still inside the window at `date`. */
  knownRemaining: z.number().int(),
  /** Business days between the last day with data and `date` (at most the window). */
  newDays: z.number().int(),
  /** P(counted = k at `date`), each new day an exception with probability 1 − confidence. */
  distribution: z.array(z.object({ exceptions: z.number().int(), probability: z.number() })),
  zones: z.object({ green: z.number(), yellow: z.number(), red: z.number() }),
  ifNoNewException: z.object({
    counted: z.number().int(),
    zone: zoneSchema,
    plusFactor: z.number(),
    addOn: z.number().nullable(),
  }),
  /** Σ P(k) × add-on(k) with today's VaR and stressed VaR; null without capital inputs. */
  expectedAddOn: z.number().nullable(),
  /** What one more exception today would add to the capital requirement; null without capital inputs. */
  nextExceptionCost: z.number().nullable(),
  /** Today's counted exceptions, zone, plus factor and multiplier, for reference. */
  today: z.object({
    counted: z.number().int(),
    zone: zoneSchema,
    plusFactor: z.number(),
    multiplier: z.number(),
    /** False when today's window is short of the rules' observations: the zone is provisional. */
    windowComplete: z.boolean(),
  }),
  rollOffs: z.array(rollOffSchema),
  startsFrom: startsFromSchema,
  inForce: inForceSummarySchema,
  /** The count at `date` is first used by this determination: its multiplier is in force from its effectiveFrom. */
  bitesFrom: determinationPointSchema,
  /** An exception on the next business day would first change the multiplier from this determination on. */
  nextExceptionBitesFrom: determinationPointSchema,
});
export type ForecastResponse = z.infer<typeof forecastResponseSchema>;

/** docs/api.md#capital: { asOf, extraExceptions, varScale, svarScale }; asOf defaults to the last day with data. */
export const whatIfBodySchema = z
  .object({
    asOf: isoDateSchema.optional(),
    extraExceptions: z
      .number()
      .int("A whole number of exceptions")
      .min(0, "Zero or more")
      .max(250, "At most the 250 days of the window")
      .default(0),
    varScale: z.number().min(0, "Zero or more").max(10, "At most 10 ×").default(1),
    svarScale: z.number().min(0, "Zero or more").max(10, "At most 10 ×").default(1),
  })
  .strict();
export type WhatIfBody = z.input<typeof whatIfBodySchema>;

export const whatIfFiguresSchema = z.object({
  zone: zoneSchema,
  counted: z.number().int(),
  plusFactor: z.number(),
  multiplier: z.number(),
  capital: z.number(),
  addOn: z.number(),
});

export const whatIfResponseSchema = z.object({
  entity: z.string(),
  portfolio: z.string(),
  currency: z.string(),
  asOf: z.string(),
  base: whatIfFiguresSchema,
  scenario: whatIfFiguresSchema,
  delta: z.object({
    counted: z.number().int(),
    plusFactor: z.number(),
    multiplier: z.number(),
    capital: z.number(),
    addOn: z.number(),
    zoneChanged: z.boolean(),
  }),
  startsFrom: startsFromSchema,
  /** Exceptions after the as-of date would first count in this determination, in force from its effectiveFrom. */
  bitesFrom: determinationPointSchema,
});
export type WhatIfResponse = z.infer<typeof whatIfResponseSchema>;

/** GET /api/entities/:code/capital/history: the entity's quarters as their snapshots hold them, oldest first. */
export const capitalHistoryItemSchema = snapshotSchema
  .pick({
    quarterEnd: true,
    status: true,
    zone: true,
    counted: true,
    plusFactor: true,
    multiplier: true,
    capital: true,
    addOn: true,
  })
  .extend({
    snapshotId: z.number().int(),
    restatedAfterSignOff: z.boolean(),
    /** False when the quarter's window held fewer observations than the rules ask for: its zone is provisional. */
    windowComplete: z.boolean(),
  });
export type CapitalHistoryItem = z.infer<typeof capitalHistoryItemSchema>;
export const capitalHistorySchema = z.array(capitalHistoryItemSchema);
