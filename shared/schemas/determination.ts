import { z } from "zod";
import { isoDateSchema, pnlBasisSchema, plainNameSchema } from "./common";
import { zoneSchema } from "./backtest";
import { frtbFiguresSchema, frtbStatusPointSchema } from "./frtb";

/**
 * Determinations of the multiplier and the figures in force (shared/backtest/determination.ts),
 * and the governed, dated supervisory settings they use (docs/api.md).
 */

export const determinationStatusSchema = z.enum(["provisional", "approved", "filed"]);
export type DeterminationStatus = z.infer<typeof determinationStatusSchema>;
export const determinationFrequencySchema = z.enum(["quarterly", "monthly"]);

export const settingsValuesSchema = z.object({
  pnlBasis: pnlBasisSchema,
  qualitativeAddend: z.number(),
  qualitativeAddendSvar: z.number().nullable(),
  multiplierFloor: z.number().nullable(),
  determinationFrequency: determinationFrequencySchema,
});

/** The settings record in force on a figure's day (id null: the entity's own columns, before it had an approved record). */
export const settingsInForceSchema = settingsValuesSchema.extend({
  id: z.number().int().nullable(),
  effectiveFrom: z.string(),
  reference: z.string(),
});

export const determinationSchema = z.object({
  /** The period end (a calendar quarter end under the quarterly frequency). */
  quarterEnd: z.string(),
  /** Its last business day: the date the count was taken on. */
  asOf: z.string(),
  effectiveFrom: z.string(),
  effectiveTo: z.string().nullable(),
  counted: z.number().int(),
  actual: z.number().int(),
  hypothetical: z.number().int(),
  zone: zoneSchema,
  zoneLabel: z.string(),
  plusFactor: z.number(),
  /** m_c (FRTB: the IMCC multiplier). */
  multiplier: z.number(),
  /** m_s: the stressed VaR multiplier (differs from m_c only with separate addends). */
  multiplierSvar: z.number(),
  windowComplete: z.boolean(),
  status: determinationStatusSchema,
  snapshotId: z.number().int().nullable(),
  settings: settingsInForceSchema,
});
export type DeterminationDto = z.infer<typeof determinationSchema>;
export const determinationListSchema = z.array(determinationSchema);

export const capitalQuerySchema = z.object({ date: isoDateSchema.optional() }).strict();

/** A count and what it sets: the zone, the plus factor and both multipliers. */
const COUNT_AND_MULTIPLIERS = {
  counted: true,
  zone: true,
  zoneLabel: true,
  plusFactor: true,
  multiplier: true,
  multiplierSvar: true,
} as const;

const indicativeSchema = determinationSchema.pick({ asOf: true, ...COUNT_AND_MULTIPLIERS, windowComplete: true });

/** Where a change (an exception on a day) would first count: the determination and the day it bites from. */
export const bitesFromSchema = z.object({ quarterEnd: z.string(), asOf: z.string(), effectiveFrom: z.string() });
export type BitesFrom = z.infer<typeof bitesFromSchema>;

export const capitalOnDateSchema = z.object({
  entity: z.string(),
  currency: z.string(),
  date: z.string(),
  /** The determination in force on `date`; null before the first. */
  inForce: determinationSchema
    .pick({
      quarterEnd: true,
      asOf: true,
      effectiveFrom: true,
      effectiveTo: true,
      ...COUNT_AND_MULTIPLIERS,
      status: true,
      snapshotId: true,
    })
    .nullable(),
  /** The rolling count on `date`, as if determined that day. */
  indicative: indicativeSchema,
  /** Capital on `date` with the multiplier in force; null when the data holds no capital input. */
  requirement: z.number().nullable(),
  addOn: z.number().nullable(),
  /** With the indicative multiplier instead, for comparison. */
  indicativeRequirement: z.number().nullable(),
  capitalNote: z.string().nullable(),
  /** The next determination: an exception after `date` changes the multiplier from its effectiveFrom. */
  nextDetermination: bitesFromSchema,
  settings: settingsInForceSchema,
  /**
   * FRTB entities: the MAR33 aggregation on `date` with m_c in force and the desks' statuses of the
   * determination in force (docs/rules.md#frtb-aggregation); null for other rule sets or without
   * the inputs (`frtbNote` says why).
   */
  frtb: frtbFiguresSchema.nullable().optional(),
  frtbNote: z.string().nullable().optional(),
  /** FRTB entities: each desk's status at each determination, oldest first. */
  frtbTimeline: z.array(frtbStatusPointSchema).optional(),
});
export type CapitalOnDate = z.infer<typeof capitalOnDateSchema>;

// ---- Supervisory settings ----

const addendSchema = z.number().min(0, "At least 0").max(3, "At most 3");

export const proposeSettingsSchema = z
  .object({
    effectiveFrom: isoDateSchema,
    reference: plainNameSchema.pipe(z.string().max(200, "At most 200 characters")),
    qualitativeAddend: addendSchema.optional(),
    qualitativeAddendSvar: addendSchema.nullable().optional(),
    pnlBasis: pnlBasisSchema.optional(),
    multiplierFloor: z.number().min(0, "At least 0").max(10, "At most 10").nullable().optional(),
    determinationFrequency: determinationFrequencySchema.optional(),
  })
  .strict();
export type ProposeSettingsBody = z.input<typeof proposeSettingsSchema>;

export const settingsDecisionSchema = z
  .object({ comment: z.string().trim().max(500, "At most 500 characters").optional() })
  .strict();

export const settingsIdParamSchema = z.object({ id: z.coerce.number().int().positive() });

export const settingsRecordSchema = settingsValuesSchema.extend({
  id: z.number().int(),
  entity: z.string(),
  effectiveFrom: z.string(),
  reference: z.string(),
  status: z.enum(["proposed", "approved", "rejected"]),
  /** The proposer's e-mail and name (null for a record made with the entity or by the migration). */
  proposedBy: z.string().nullable(),
  proposedByName: z.string().nullable(),
  proposedAt: z.string().nullable(),
  decidedBy: z.string().nullable(),
  decidedByName: z.string().nullable(),
  decidedAt: z.string().nullable(),
  decisionComment: z.string().nullable(),
  /** Whether this record is the one in force today. */
  inForceToday: z.boolean(),
});
export type SettingsRecord = z.infer<typeof settingsRecordSchema>;
export const settingsListSchema = z.array(settingsRecordSchema);
