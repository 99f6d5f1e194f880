import { z } from "zod";

/**
 * FRTB capital as MAR33.41–33.45 aggregate it, and each desk's status (docs/api.md#capital,
 * docs/rules.md#frtb-aggregation, #frtb-eligibility). Every figure comes from
 * shared/backtest/frtb-capital.ts; amounts rounded to the cent, k to six places.
 */
export const deskStatusSchema = z.enum(["in-model", "amber", "out-of-model"]);
export type DeskStatusDto = z.infer<typeof deskStatusSchema>;
export const plaZoneSchema = z.enum(["green", "amber", "red"]);

export const frtbDeskSchema = z.object({
  code: z.string(),
  status: deskStatusSchema,
  /** Counted exceptions over the last 250 days at 99% and 97.5% (MAR32.19). */
  backtest99: z.number().int(),
  backtest975: z.number().int(),
  /** Null while the PLA has fewer than 250 days with HPL and RTPL (provisional). */
  plaZone: plaZoneSchema.nullable(),
  plaObservations: z.number().int(),
  reason: z.string(),
  /** The desk's standardised charge on the date (SBM + RRAO + SA DRC); null when not supplied. */
  sa: z.number().nullable(),
});

export const frtbFiguresSchema = z.object({
  /** The quarter whose determination set the desks' statuses; null before the first. */
  statusQuarterEnd: z.string().nullable(),
  multiplier: z.number(),
  imccPrev: z.number(),
  imccAvg: z.number(),
  sesPrev: z.number(),
  sesAvg: z.number(),
  binding: z.enum(["previous", "average"]),
  ca: z.number(),
  drc: z.number(),
  imaGA: z.number(),
  cU: z.number(),
  saAll: z.number(),
  saGA: z.number(),
  saAmber: z.number(),
  k: z.number(),
  surcharge: z.number(),
  acrTotal: z.number(),
  sources: z.object({
    imcc: z.enum(["top", "desks"]),
    drc: z.enum(["top", "desks", "none"]),
    saAll: z.enum(["top", "desks"]),
    saGA: z.enum(["top", "desks"]),
  }),
  desks: z.array(frtbDeskSchema),
  /** Figures the upstream engine did not supply, and the rule used instead. */
  notes: z.array(z.string()),
});
export type FrtbFigures = z.infer<typeof frtbFiguresSchema>;

/** One determination's desk statuses (the timeline on Capital). */
export const frtbStatusPointSchema = z.object({
  quarterEnd: z.string(),
  asOf: z.string(),
  effectiveFrom: z.string(),
  desks: z.array(frtbDeskSchema.omit({ sa: true })),
});
export type FrtbStatusPoint = z.infer<typeof frtbStatusPointSchema>;
