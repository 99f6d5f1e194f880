import { z } from "zod";

/** The daily data file: required and optional columns, in the order the template writes them. */
export const REQUIRED_COLUMNS = ["portfolio", "date", "actual_pnl", "hypothetical_pnl", "var_99"] as const;
export const OPTIONAL_COLUMNS = [
  "var_975",
  "svar_99",
  "var_10d",
  "svar_10d",
  "es_975",
  "ses",
  "rtpl",
  // FRTB charges (docs/rules.md#frtb-aggregation): IMA default risk charge; standardised SBM, RRAO, DRC; and at
  // the top of house the standardised charge of the desks in the model together.
  "ima_drc",
  "sbm",
  "rrao",
  "sa_drc",
  "sa_ga",
  // Parts of actual_pnl the rule sets treat differently (docs/rules.md#pnl-definition), signed like the P&L.
  "fees_commissions",
  "reserves_adjustments",
  "net_interest_income",
  "intraday_pnl",
  "new_trade_pnl",
] as const;
export const ALL_COLUMNS = [...REQUIRED_COLUMNS, ...OPTIONAL_COLUMNS] as const;
export type CsvColumn = (typeof ALL_COLUMNS)[number];
export const AMOUNT_COLUMNS = ALL_COLUMNS.filter((c) => c !== "portfolio" && c !== "date") as AmountColumn[];
export type AmountColumn = Exclude<CsvColumn, "portfolio" | "date">;

/** The largest daily data file accepted: about 200,000 rows (the server runs with a 256 MB heap). */
export const UPLOAD_MAX_BYTES = 16 * 1024 * 1024;
export const UPLOAD_MAX_LABEL = "16 MB";

/** Risk measures must be positive; P&L may have any sign; SES and the FRTB charges may be zero. */
export const POSITIVE_COLUMNS: ReadonlySet<AmountColumn> = new Set([
  "var_99",
  "var_975",
  "svar_99",
  "var_10d",
  "svar_10d",
  "es_975",
]);

/** Charges that may be zero but never negative. */
export const NOT_NEGATIVE_COLUMNS: ReadonlySet<AmountColumn> = new Set([
  "ses",
  "ima_drc",
  "sbm",
  "rrao",
  "sa_drc",
  "sa_ga",
]);

/**
 * A plain decimal with a dot and an optional minus (no exponent, no thousands separator, no NaN),
 * or empty. At most 13 whole digits (under ten trillion): with the cents that is 15 significant
 * digits, which a double holds exactly, so what is stored is what the file said.
 */
export const AMOUNT_PATTERN = /^(-?\d{1,13}(\.\d{1,8})?)?$/;
const PORTFOLIO_CELL_PATTERN = /^\s*[A-Za-z0-9][A-Za-z0-9_-]{0,39}\s*$/;
const DATE_CELL_PATTERN = /^\s*\d{4}-\d{2}-\d{2}\s*$/;

/** The pattern each cell must match; the schema below is built from these and nothing else. */
export const CELL_PATTERNS: Readonly<Record<CsvColumn, RegExp>> = {
  portfolio: PORTFOLIO_CELL_PATTERN,
  date: DATE_CELL_PATTERN,
  ...(Object.fromEntries(AMOUNT_COLUMNS.map((c) => [c, AMOUNT_PATTERN])) as Record<AmountColumn, RegExp>),
};
const amountCell = z.string().regex(AMOUNT_PATTERN, "not a plain decimal amount");

/**
 * One CSV row as text cells keyed by column: pattern checks only. A row whose cells all match
 * CELL_PATTERNS passes this schema (tests/shared/ingest checks the two agree), so the parser
 * tests the patterns directly and runs the schema on failing rows to list their issues; it then
 * converts the numbers, checks signs and the calendar, and words each problem for a person.
 */
export const observationCellsSchema = z.object({
  portfolio: z.string().regex(PORTFOLIO_CELL_PATTERN, "not a portfolio code"),
  date: z.string().regex(DATE_CELL_PATTERN, "not a date written YYYY-MM-DD"),
  ...(Object.fromEntries(AMOUNT_COLUMNS.map((c) => [c, amountCell.optional()])) as Record<
    AmountColumn,
    z.ZodOptional<typeof amountCell>
  >),
});

/** A row once parsed: amounts in currency units rounded to the cent (DECIMAL(20,2)); empty cells are null. */
export type ObservationRow = { portfolio: string; date: string } & { [K in AmountColumn]?: number | null };

export const rowErrorSchema = z.object({ line: z.number().int(), column: z.string(), message: z.string() });
export type RowError = z.infer<typeof rowErrorSchema>;

export const uploadStatusSchema = z.enum(["preview", "committed", "discarded"]);

/** A quarter that a snapshot has signed off: approved (sealed) or filed with the supervisor. */
export const signedOffQuarterSchema = z.object({
  entity: z.string(),
  quarterEnd: z.string(),
  status: z.enum(["approved", "filed"]),
});
export type SignedOffQuarter = z.infer<typeof signedOffQuarterSchema>;

/** A day the file restates: each changed cell as stored → as in the file, and the signed-off quarter it lies in. */
export const restatedDaySchema = z.object({
  portfolio: z.string(),
  date: z.string(),
  changes: z.array(z.object({ column: z.string(), from: z.number().nullable(), to: z.number().nullable() })),
  signedOff: signedOffQuarterSchema.nullable(),
});
export type RestatedDayView = z.infer<typeof restatedDaySchema>;

/** How many restated days a preview lists cell by cell (the count of all is `restatements`). */
export const RESTATED_DAYS_SHOWN = 200;

export const uploadPreviewSchema = z.object({
  id: z.number().int(),
  status: uploadStatusSchema,
  fileName: z.string(),
  sha256: z.string(),
  rows: z.number().int(),
  valid: z.number().int(),
  invalid: z.number().int(),
  /** Rows that add a day not stored before. */
  newRows: z.number().int(),
  /** Rows that change a day already stored (a new version; the old one is kept). */
  restatements: z.number().int(),
  /** Rows identical to what is stored: nothing to write. */
  unchanged: z.number().int(),
  errors: z.array(rowErrorSchema),
  errorCount: z.number().int(),
  portfolios: z.array(z.string()),
  from: z.string().nullable(),
  to: z.string().nullable(),
  uploadedBy: z.string(),
  uploadedAt: z.string(),
  committedAt: z.string().nullable(),
  /** Who committed it: the who of every version it wrote (committedAt is their when). */
  committedBy: z.string().nullable(),
  inserted: z.number().int().nullable(),
  /** The first RESTATED_DAYS_SHOWN restated days, old → new per changed cell (as at the preview). */
  restatedDays: z.array(restatedDaySchema).default([]),
  /** Restated days that lie in a signed-off quarter (as at the preview); committing them needs `confirmSignedOff`. */
  signedOffRestatements: z.number().int().default(0),
  /** Those quarters, each with how many of its days the file restates. */
  signedOffQuarters: z.array(signedOffQuarterSchema.extend({ days: z.number().int() })).default([]),
  /** When a waiting preview can no longer be committed (then it must be uploaded again); null once decided. */
  expiresAt: z.string().nullable().default(null),
  expired: z.boolean().default(false),
});
export type UploadPreview = z.infer<typeof uploadPreviewSchema>;
export const uploadListSchema = z.array(uploadPreviewSchema.omit({ errors: true, restatedDays: true }));
export type UploadSummary = z.infer<typeof uploadListSchema>[number];

export const commitUploadBodySchema = z
  .strictObject({
    /** Required (true) when the file restates a day in an approved or filed quarter: 409 `signed_off_restatement` otherwise. */
    confirmSignedOff: z.boolean().optional(),
  })
  .default({});
export type CommitUploadBody = z.infer<typeof commitUploadBodySchema>;

export const commitResultSchema = z.object({
  id: z.number().int(),
  status: z.literal("committed"),
  /** Versions written: one per new day and one per restated day. */
  inserted: z.number().int(),
  restated: z.number().int(),
  unchanged: z.number().int(),
});
export type CommitResult = z.infer<typeof commitResultSchema>;

export const uploadRowsQuerySchema = z.object({
  offset: z.coerce.number().int().min(0).default(0),
  limit: z.coerce.number().int().min(1).max(500).default(100),
  invalidOnly: z
    .enum(["true", "false"])
    .default("false")
    .transform((s) => s === "true"),
});
export const uploadRowSchema = z.object({
  line: z.number().int(),
  cells: z.record(z.string(), z.string()),
  errors: z.array(rowErrorSchema),
});
export const uploadRowsPageSchema = z.object({
  columns: z.array(z.string()),
  rows: z.array(uploadRowSchema),
  total: z.number().int(),
});
export type UploadRowsPage = z.infer<typeof uploadRowsPageSchema>;
