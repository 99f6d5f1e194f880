import { z } from "zod";

/** Data-quality findings: what the checks found in the daily data, and how an analyst closed it. */
export const findingKindSchema = z.enum([
  "missing_day",
  "stale_var",
  "pnl_without_var",
  "var_without_pnl",
  "hpl_without_rtpl",
  "outlier",
]);
export type FindingKind = z.infer<typeof findingKindSchema>;
export const findingStatusSchema = z.enum(["open", "resolved", "explained"]);
export const findingSchema = z.object({
  id: z.number().int(),
  entity: z.string(),
  portfolio: z.string(),
  kind: findingKindSchema,
  from: z.string(),
  to: z.string(),
  detail: z.string(),
  status: findingStatusSchema,
  note: z.string().nullable(),
  closedBy: z.string().nullable(),
  closedAt: z.string().nullable(),
  version: z.number().int(),
});
export type Finding = z.infer<typeof findingSchema>;
export const findingListSchema = z.array(findingSchema);
export const findingsQuerySchema = z.object({
  entity: z.string().max(20).optional(),
  portfolio: z.string().max(40).optional(),
  status: findingStatusSchema.optional(),
});
export const closeFindingBodySchema = z.strictObject({
  status: z.enum(["resolved", "explained"]),
  note: z.string().trim().min(3, "Say in a few words how it was resolved or why it is acceptable").max(2000),
  version: z.number().int().positive(),
});
export type CloseFindingBody = z.infer<typeof closeFindingBodySchema>;
