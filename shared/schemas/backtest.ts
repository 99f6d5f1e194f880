import { z } from "zod";
import { isoDateSchema, pnlBasisSchema, pnlComponentSchema, regimeSchema } from "./common";
import { reviewSchema } from "./review";

export const zoneSchema = z.enum(["green", "yellow", "red"]);

// ---- requests ----
export const backtestQuerySchema = z.object({ asOf: isoDateSchema.optional() });
export const rollingQuerySchema = z.object({ from: isoDateSchema.optional(), to: isoDateSchema.optional() });
export const testOutcomeSchema = z.object({
  statistic: z.number(),
  pValue: z.number(),
  reject: z.boolean(),
  verdict: z.string(),
});
/** The statistical tests on one series (docs/rules.md#statistics). */
export const seriesTestsSchema = z.object({
  kupiec: testOutcomeSchema,
  independence: testOutcomeSchema,
  conditionalCoverage: testOutcomeSchema,
});

export const pnlMakeUpSchema = z.object({
  supplied: z.number(),
  lines: z.array(
    z.object({
      component: pnlComponentSchema,
      label: z.string(),
      amount: z.number().nullable(),
      removed: z.boolean(),
    }),
  ),
  backtesting: z.number(),
  source: z.string(),
});
export type PnlMakeUpDto = z.infer<typeof pnlMakeUpSchema>;

/** An exception's date and amounts: what the backtest and a snapshot's exception list both carry. */
export const exceptionAmountsSchema = z.object({
  date: z.string(),
  actualPnl: z.number().nullable(),
  hypotheticalPnl: z.number().nullable(),
  var99: z.number().nullable(),
  actual: z.boolean(),
  hypothetical: z.boolean(),
  excluded: z.boolean(),
  excessActual: z.number().nullable(),
  excessHypothetical: z.number().nullable(),
});

export const exceptionDaySchema = exceptionAmountsSchema.extend({
  missing: z.boolean(),
  /** docs/rules.md#pnl-definition: present when the day's file carried the parts of its P&L. */
  actualMakeUp: pnlMakeUpSchema.optional(),
  review: reviewSchema.nullable(),
});
export type ExceptionDayDto = z.infer<typeof exceptionDaySchema>;

export const rollOffSchema = z.object({
  date: z.string(),
  actual: z.boolean(),
  hypothetical: z.boolean(),
  leavesOn: z.string(),
  countAfter: z.number().int(),
  zoneAfter: zoneSchema,
  plusFactorAfter: z.number(),
});
export type RollOffDto = z.infer<typeof rollOffSchema>;

/** The window of business days a backtest covers: its first and last day, how many, and whether it is full. */
export const backtestWindowSchema = z.object({
  start: z.string().nullable(),
  end: z.string().nullable(),
  observations: z.number().int(),
  complete: z.boolean(),
});

/** The window's exceptions on each P&L, the number counted for the zone, and those excluded. */
export const exceptionCountsSchema = z.object({
  actual: z.number().int(),
  hypothetical: z.number().int(),
  counted: z.number().int(),
  excluded: z.number().int(),
});

/** A desk's backtest at one confidence level (MAR32.18–32.19). */
const deskLevelSchema = z.object({
  actual: z.number().int(),
  hypothetical: z.number().int(),
  count: z.number().int(),
  limit: z.number().int(),
  fails: z.boolean(),
  /** Exceptions disregarded by the supervisor's approved exclusions (docs/rules.md#frtb-desks). */
  excludedDays: z.number().int().optional(),
});

export const deskResultSchema = z.object({
  portfolio: z.string(),
  name: z.string(),
  backtest: z.object({
    window: backtestWindowSchema,
    at99: deskLevelSchema,
    at975: deskLevelSchema,
    passes: z.boolean(),
  }),
  pla: z
    .object({
      spearman: z.number(),
      ks: z.number(),
      zone: z.enum(["green", "amber", "red"]),
      observations: z.number().int(),
    })
    .nullable(),
  plaUnavailable: z.string().nullable(),
});
export type DeskResult = z.infer<typeof deskResultSchema>;

export const backtestResponseSchema = z.object({
  portfolio: z.object({ code: z.string(), name: z.string(), level: z.enum(["top", "desk"]) }),
  entity: z.object({ code: z.string(), name: z.string(), currency: z.string() }),
  regime: regimeSchema,
  pnlBasis: pnlBasisSchema,
  asOf: z.string(),
  latestDate: z.string(),
  window: backtestWindowSchema,
  exceptions: exceptionCountsSchema,
  zone: zoneSchema,
  zoneLabel: z.string(),
  plusFactor: z.number(),
  multiplier: z.number(),
  expected: z.number(),
  tests: z.object({ cumulativeProbability: z.number() }).and(seriesTestsSchema),
  testsBySeries: z.object({ actual: seriesTestsSchema, hypothetical: seriesTestsSchema }),
  testedSeries: z.enum(["actual", "hypothetical"]),
  exceptionDays: z.array(exceptionDaySchema),
  dataGaps: z.array(z.string()),
  provisionalBoundaries: z.boolean(),
  rollOffs: z.array(rollOffSchema),
  desks: z.array(deskResultSchema),
  engineVersion: z.string(),
});
export type BacktestResponse = z.infer<typeof backtestResponseSchema>;

export const rollingRowSchema = z.object({
  date: z.string(),
  actual: z.number().int(),
  hypothetical: z.number().int(),
  counted: z.number().int(),
  zone: zoneSchema,
  plusFactor: z.number(),
  complete: z.boolean(),
});
export const rollingResponseSchema = z.array(rollingRowSchema);
export type RollingRowDto = z.infer<typeof rollingRowSchema>;

/**
 * The determination whose multiplier is in force on a date (docs/api.md#determinations): its period
 * end, the day it took effect, its count and zone, and the multiplier with the settings in force
 * that day; `status` says whether the quarter is signed off.
 */
export const inForceTodaySchema = z.object({
  quarterEnd: z.string(),
  effectiveFrom: z.string(),
  counted: z.number().int(),
  zone: zoneSchema,
  zoneLabel: z.string(),
  plusFactor: z.number(),
  multiplier: z.number(),
  status: z.enum(["provisional", "approved", "filed"]),
});
export type InForceToday = z.infer<typeof inForceTodaySchema>;

export const overviewItemSchema = z.object({
  entity: z.string(),
  name: z.string(),
  regime: regimeSchema,
  currency: z.string(),
  portfolio: z.string().nullable(),
  asOf: z.string().nullable(),
  complete: z.boolean(),
  zone: zoneSchema.nullable(),
  zoneLabel: z.string().nullable(),
  counted: z.number().int().nullable(),
  plusFactor: z.number().nullable(),
  /** The multiplier of the rolling count on `asOf`: indicative, as if determined that day. */
  multiplier: z.number().nullable(),
  addOn: z.number().nullable(),
  /** The determination in force today (null before the first quarter end with data). */
  inForce: inForceTodaySchema.nullable(),
  nextRollOff: rollOffSchema.nullable(),
  openReviews: z.number().int(),
  openFindings: z.number().int(),
  /** The entity's newest quarter snapshot and where it stands in the sign-off, if any. */
  quarterClose: z
    .object({
      snapshotId: z.number().int(),
      quarterEnd: z.string(),
      status: z.enum(["draft", "submitted", "approved", "returned", "filed"]),
    })
    .nullable(),
});
export type OverviewItem = z.infer<typeof overviewItemSchema>;
export const overviewResponseSchema = z.array(overviewItemSchema);
