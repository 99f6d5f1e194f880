import { z } from "zod";
import { entityCodeSchema, isoDateSchema, regimeSchema, pnlBasisSchema } from "./common";
import {
  backtestWindowSchema,
  exceptionAmountsSchema,
  exceptionCountsSchema,
  seriesTestsSchema,
  zoneSchema,
} from "./backtest";
import { settingsInForceSchema } from "./determination";
import { exceptionCauseSchema, exclusionStatusSchema } from "./review";
import { frtbFiguresSchema } from "./frtb";

/**
 * Quarter snapshots: the figures of one entity at one quarter end, frozen for sign-off.
 * draft → submitted → approved | returned (→ draft again); approved → filed (with the pack).
 */
export const SNAPSHOT_STATUSES = ["draft", "submitted", "approved", "returned", "filed"] as const;
export const snapshotStatusSchema = z.enum(SNAPSHOT_STATUSES);
export type SnapshotStatus = z.infer<typeof snapshotStatusSchema>;

/** Statuses whose figures are signed off and never change. */
export const SIGNED_OFF: ReadonlySet<SnapshotStatus> = new Set(["approved", "filed"]);

export const quarterEndSchema = isoDateSchema.refine(
  (d) => /-(03-31|06-30|09-30|12-31)$/.test(d),
  "A quarter ends on 31 March, 30 June, 30 September or 31 December",
);

export const createSnapshotSchema = z
  .object({
    entity: entityCodeSchema,
    quarterEnd: quarterEndSchema,
    /** The id of a filed snapshot of the same entity and quarter that this one amends (docs/api.md#amendments). */
    amends: z.number().int().positive().optional(),
  })
  .strict();
export type CreateSnapshotBody = z.infer<typeof createSnapshotSchema>;

/** submit / approve: an optional comment; `version` (the row version the client read) guards against a stale screen. */
export const snapshotActionSchema = z
  .object({ comment: z.string().trim().max(2000).optional(), version: z.number().int().positive().optional() })
  .strict();
export type SnapshotActionBody = z.infer<typeof snapshotActionSchema>;

/** return: the reviewer must say why. */
export const returnSnapshotSchema = z
  .object({
    comment: z.string().trim().min(1, "Say why the snapshot goes back").max(2000),
    version: z.number().int().positive().optional(),
  })
  .strict();
export type ReturnSnapshotBody = z.infer<typeof returnSnapshotSchema>;

export const snapshotListQuerySchema = z.object({ entity: entityCodeSchema.optional() }).strict();

/** One desk of an FRTB entity at the quarter end. */
export const snapshotDeskSchema = z.object({
  portfolio: z.string(),
  /** Exceptions in the last 250 days at 99% and 97.5% (MAR32), and whether the desk passes both. */
  exceptions99: z.number().int(),
  exceptions975: z.number().int(),
  passes: z.boolean(),
  plaZone: z.enum(["green", "amber", "red"]).nullable(),
});

/** One business day of the window as the pack and the return data read it (frozen with the figures). */
export const snapshotDaySchema = z.object({
  date: z.string(),
  actual: z.number().nullable(),
  hypothetical: z.number().nullable(),
  /** One-day 99% VaR, the figure backtested. */
  var99: z.number().nullable(),
  /** The capital VaR and stressed VaR (10-day: var_10d, or the one-day figure × √10; docs/rules.md#capital). */
  varCapital: z.number().nullable(),
  svarCapital: z.number().nullable(),
  /** FRTB: expected shortfall at 97.5%. */
  es: z.number().nullable(),
});
export type SnapshotDay = z.infer<typeof snapshotDaySchema>;

/** An exception of the window with its amounts and, as they stood when the figures were prepared, its review. */
export const snapshotExceptionSchema = exceptionAmountsSchema.extend({
  cause: exceptionCauseSchema.nullable(),
  narrative: z.string().nullable(),
  exclusionStatus: exclusionStatusSchema,
  decisionReference: z.string().nullable(),
  decisionDate: z.string().nullable(),
});
export type SnapshotException = z.infer<typeof snapshotExceptionSchema>;

/** The capital formula's inputs and terms at the quarter end (docs/rules.md#capital). */
export const snapshotCapitalDetailSchema = z.object({
  formula: z.enum(["var-svar", "es-ses"]),
  previousDate: z.string(),
  averagedObservations: z.number().int(),
  varPrev: z.number().nullable(),
  varAvg60: z.number().nullable(),
  svarPrev: z.number().nullable(),
  svarAvg60: z.number().nullable(),
  svarWeeks: z.number().int().nullable(),
  esPrev: z.number().nullable(),
  esAvg60: z.number().nullable(),
  sesPrev: z.number().nullable(),
  sesAvg60: z.number().nullable(),
  varTerm: z.number().nullable(),
  svarTerm: z.number().nullable(),
  esTerm: z.number().nullable(),
  sesTerm: z.number().nullable(),
  binding: z.enum(["previous", "average"]),
  warnings: z.array(z.string()),
});
export type SnapshotCapitalDetail = z.infer<typeof snapshotCapitalDetailSchema>;

/** The figures frozen in a snapshot: computed by the engine (shared/backtest) at the quarter end. */
export const snapshotFiguresSchema = z.object({
  portfolio: z.string(),
  regime: regimeSchema,
  pnlBasis: pnlBasisSchema,
  currency: z.string(),
  /** The last day with data on or before the quarter end. */
  asOf: z.string(),
  window: backtestWindowSchema,
  exceptions: exceptionCountsSchema,
  exceptionDates: z.array(z.string()),
  zone: zoneSchema,
  zoneLabel: z.string(),
  plusFactor: z.number(),
  qualitativeAddend: z.number(),
  multiplier: z.number(),
  /** m_s, the stressed VaR multiplier (absent in snapshots made before it was kept: then m_c). */
  multiplierSvar: z.number().optional(),
  /** The supervisory settings record the figures used (absent in older snapshots). */
  settings: settingsInForceSchema.optional(),
  expected: z.number(),
  cumulativeProbability: z.number(),
  /** Capital requirement and the part the plus factor adds; null when the data holds no capital input. */
  capital: z.number().nullable(),
  addOn: z.number().nullable(),
  capitalNote: z.string().nullable(),
  desks: z.array(snapshotDeskSchema),
  // What the pack and the return data read besides the headline figures; absent in snapshots made
  // before they were kept (the pack then says so).
  /** The multiplier before the plus factor and addend, and the day the determination is in force from. */
  determination: z.object({ baseMultiplier: z.number(), effectiveFrom: z.string() }).optional(),
  /** The statistical tests on the counted series (docs/rules.md#statistics). */
  tests: z.object({ series: z.enum(["actual", "hypothetical"]), ...seriesTestsSchema.shape }).optional(),
  capitalDetail: snapshotCapitalDetailSchema.nullable().optional(),
  exceptionDetail: z.array(snapshotExceptionSchema).optional(),
  days: z.array(snapshotDaySchema).optional(),
  /**
   * Values of the return the product does not hold (IRC, CRM, specific risk, standardised
   * charges), entered by the analyst before submitting and sealed with the figures
   * (docs/rules.md#return-data); a key absent or null is not entered yet.
   */
  analystInputs: z.record(z.string(), z.number().nullable()).optional(),
  /**
   * FRTB: the MAR33 aggregation at the quarter's last business day with the desks' statuses this
   * quarter's determination set (absent in snapshots made before it was kept; null without its
   * inputs, `frtbNote` says why).
   */
  frtb: frtbFiguresSchema.nullable().optional(),
  frtbNote: z.string().nullable().optional(),
});
export type SnapshotFigures = z.infer<typeof snapshotFiguresSchema>;

export const snapshotEventSchema = z.object({
  at: z.string(),
  by: z.string(),
  action: z.enum(["prepared", "recomputed", "submitted", "approved", "returned", "filed", "restated"]),
  comment: z.string().nullable(),
});
export type SnapshotEvent = z.infer<typeof snapshotEventSchema>;

/** A value of an amendment's before/after table: a number, a word (the zone), or nothing. */
const amendedValueSchema = z.union([z.number(), z.string()]).nullable();

/** One figure an amendment changed, before (the filed snapshot) and after (the amendment). */
export const amendmentChangeSchema = z.object({
  key: z.string(),
  label: z.string(),
  /** headline: the determination and capital; return: a field of the return data (docs/rules.md#return-data). */
  group: z.enum(["headline", "return"]),
  templateRow: z.string().optional(),
  unit: z.enum(["amount", "count", "factor", "text"]),
  before: amendedValueSchema,
  after: amendedValueSchema,
});
export type AmendmentChange = z.infer<typeof amendmentChangeSchema>;

/** An exception of the window that the amendment added, removed or changed. */
export const amendmentExceptionSchema = z.object({
  date: z.string(),
  change: z.enum(["added", "removed", "changed"]),
  /** In words, what changed: "actual P&L -1,200 → -900; no longer an exception on actual P&L". */
  detail: z.string(),
});
export type AmendmentException = z.infer<typeof amendmentExceptionSchema>;

/**
 * What an amendment changes, computed by the engine (shared/backtest/amendment.ts) when the
 * amendment is prepared and frozen with it: the filed snapshot it amends (its seal and filing),
 * every figure that changed, the exceptions added, removed or changed, and the capital impact.
 */
export const amendmentRecordSchema = z.object({
  amends: z.number().int(),
  original: z.object({
    snapshotId: z.number().int(),
    hash: z.string(),
    approvedAt: z.string().nullable(),
    filingId: z.number().int().nullable(),
    filedAt: z.string().nullable(),
    filedBy: z.string().nullable(),
    packSha256: z.string().nullable(),
  }),
  /** The restatement flag of the filed snapshot when the amendment was prepared: why it is amended. */
  reason: z.string(),
  changes: z.array(amendmentChangeSchema),
  exceptions: z.array(amendmentExceptionSchema),
  capitalImpact: z.object({
    before: z.number().nullable(),
    after: z.number().nullable(),
    /** after − before; null when either side has no capital figure. */
    change: z.number().nullable(),
    currency: z.string(),
  }),
});
export type AmendmentRecord = z.infer<typeof amendmentRecordSchema>;

export const snapshotSchema = z.object({
  id: z.number().int(),
  entity: z.string(),
  entityName: z.string(),
  quarterEnd: z.string(),
  status: snapshotStatusSchema,
  // The headline figures at the top level (docs/api.md#snapshots), the whole set under `figures`.
  zone: zoneSchema,
  counted: z.number().int(),
  plusFactor: z.number(),
  multiplier: z.number(),
  capital: z.number().nullable(),
  addOn: z.number().nullable(),
  figures: snapshotFiguresSchema,
  inputsSha256: z.string(),
  engineVersion: z.string(),
  preparedBy: z.string(),
  preparedAt: z.string(),
  submittedBy: z.string().nullable(),
  submittedAt: z.string().nullable(),
  approvedBy: z.string().nullable(),
  approvedAt: z.string().nullable(),
  history: z.array(snapshotEventSchema),
  prevHash: z.string().nullable(),
  hash: z.string().nullable(),
  /**
   * Set when a day inside the snapshot's window was restated after sign-off: the figures stay as
   * approved. `resolvedBy`: the filed amendment that corrected the quarter (null while none is filed).
   */
  restatedAfterSignOff: z
    .object({
      at: z.string(),
      detail: z.string(),
      resolvedBy: z.object({ snapshotId: z.number().int(), filedAt: z.string().nullable() }).nullable().optional(),
    })
    .nullable(),
  /** The id of the filed snapshot this one amends (null for a quarter's original snapshot). */
  amends: z.number().int().nullable(),
  /** The id of the snapshot that amends this one, whatever its status (null while none is prepared). */
  amendedBy: z.number().int().nullable(),
  /** An amendment's before/after, frozen when it was prepared (null for an original). */
  amendment: amendmentRecordSchema.nullable(),
  /** Open data-quality findings inside the quarter now (they block submit and approve). */
  openFindings: z.number().int(),
  version: z.number().int(),
});
export type Snapshot = z.infer<typeof snapshotSchema>;

/**
 * The headline of the frozen figures, as a list item carries them: what the list shows and the
 * window's span, without the window's days, the exceptions, the desks or the capital details
 * (GET /api/snapshots/:id has everything).
 */
export const snapshotHeadlineFiguresSchema = snapshotFiguresSchema.pick({
  portfolio: true,
  regime: true,
  pnlBasis: true,
  currency: true,
  asOf: true,
  window: true,
  exceptions: true,
  zone: true,
  zoneLabel: true,
  plusFactor: true,
  qualitativeAddend: true,
  multiplier: true,
  multiplierSvar: true,
  expected: true,
  cumulativeProbability: true,
  capital: true,
  addOn: true,
  capitalNote: true,
});
export type SnapshotHeadlineFigures = z.infer<typeof snapshotHeadlineFiguresSchema>;
/** The keys of the headline figures, in the order a list item carries them. */
export const SNAPSHOT_HEADLINE_KEYS = Object.keys(
  snapshotHeadlineFiguresSchema.shape,
) as (keyof SnapshotHeadlineFigures)[];

/** One snapshot in GET /api/snapshots: everything but its history, its amendment and the heavy part of its figures. */
export const snapshotListItemSchema = snapshotSchema
  .omit({ figures: true, history: true, amendment: true })
  .extend({ figures: snapshotHeadlineFiguresSchema });
export type SnapshotListItem = z.infer<typeof snapshotListItemSchema>;
export const snapshotListSchema = z.array(snapshotListItemSchema);

export const snapshotVerifySchema = z.object({
  valid: z.boolean(),
  hash: z.string().nullable(),
  prevHash: z.string().nullable(),
  /** In words: what was checked, or what does not match. */
  detail: z.string(),
});
export type SnapshotVerify = z.infer<typeof snapshotVerifySchema>;

/** One thing wrong in an entity's signed snapshot chain, in words, with the link and snapshot it concerns. */
export const chainProblemSchema = z.object({
  seq: z.number().int().nullable(),
  snapshotId: z.number().int().nullable(),
  detail: z.string(),
});
export type ChainProblem = z.infer<typeof chainProblemSchema>;

/** GET /api/entities/:code/chain/verify: the whole signed chain of an entity checked. */
export const chainVerifySchema = z.object({
  entity: z.string(),
  valid: z.boolean(),
  /** How many signed links the chain holds. */
  links: z.number().int(),
  problems: z.array(chainProblemSchema),
  /** In words: what was checked, or the first thing that does not hold and how many more there are. */
  detail: z.string(),
});
export type ChainVerify = z.infer<typeof chainVerifySchema>;

/** PUT /api/snapshots/:id/return-inputs: the analyst's values for the return, in the entity's currency. */
export const returnInputsBodySchema = z
  .object({
    values: z.record(
      z.string(),
      z
        .number({ message: "Enter an amount in the entity's currency, or leave it empty" })
        .finite()
        .min(0, "An amount of the return is never negative")
        .max(1e15, "That amount is larger than any return holds")
        .nullable(),
    ),
    version: z.number().int().positive(),
  })
  .strict();
export type ReturnInputsBody = z.infer<typeof returnInputsBodySchema>;

export const returnFieldSchema = z.object({
  key: z.string(),
  label: z.string(),
  templateRow: z.string().optional(),
  value: z.number().nullable(),
  unit: z.enum(["amount", "count", "factor"]),
  currency: z.string().optional(),
  source: z.string(),
  analystInput: z.literal(true).optional(),
});
export const snapshotReturnSchema = z.object({
  regime: regimeSchema,
  quarterEnd: z.string(),
  asOf: z.string(),
  currency: z.string(),
  fields: z.array(returnFieldSchema),
  backtesting: z
    .object({
      window: z.object({ start: z.string().nullable(), end: z.string().nullable(), observations: z.number().int() }),
      days: z.array(
        z.object({
          date: z.string(),
          actual: z.number().nullable(),
          hypothetical: z.number().nullable(),
          var99: z.number().nullable(),
        }),
      ),
      exceptions: z.array(
        z.object({
          date: z.string(),
          actual: z.number().nullable(),
          hypothetical: z.number().nullable(),
          var99: z.number().nullable(),
          cause: z.string().nullable(),
          excluded: z.boolean(),
        }),
      ),
    })
    .nullable(),
});
export type SnapshotReturn = z.infer<typeof snapshotReturnSchema>;
