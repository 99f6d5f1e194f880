import { z } from "zod";
import { isoDateSchema, portfolioCodeParamSchema } from "./common";

/** An analyst's review of one exception, its evidence, and the CRO's record of the supervisor's decision. */
export const exceptionCauseSchema = z.enum([
  "market_move",
  "model_limitation",
  "data_issue",
  "intraday_trading",
  "pricing",
  "other",
]);
export type ExceptionCause = z.infer<typeof exceptionCauseSchema>;
export const exclusionStatusSchema = z.enum(["none", "requested", "approved", "rejected"]);
export type ExclusionStatus = z.infer<typeof exclusionStatusSchema>;
export const exceptionParamSchema = portfolioCodeParamSchema.extend({ date: isoDateSchema });

/** The analyst's review of one exception; `version` is the one they saw (0 or absent for a first review). */
export const reviewBodySchema = z.strictObject({
  cause: exceptionCauseSchema,
  narrative: z
    .string()
    .trim()
    .min(10, "Explain the exception in at least a sentence (10 characters or more)")
    .max(4000),
  exclusion: z.boolean(),
  version: z.number().int().min(0).optional(),
});
export type ReviewBody = z.infer<typeof reviewBodySchema>;

/** The CRO records what the supervisor decided about an exclusion request. */
export const decisionBodySchema = z.strictObject({
  decision: z.enum(["approved", "rejected"]),
  reference: z.string().trim().min(1, "Give the supervisor's reference for the decision").max(120),
  decidedOn: isoDateSchema,
  version: z.number().int().positive(),
});
export type DecisionBody = z.infer<typeof decisionBodySchema>;
export const evidenceSchema = z.object({
  id: z.number().int(),
  fileName: z.string(),
  contentType: z.string(),
  sizeBytes: z.number().int(),
  sha256: z.string(),
  uploadedBy: z.string(),
  uploadedAt: z.string(),
});
export type Evidence = z.infer<typeof evidenceSchema>;
export const reviewSchema = z.object({
  date: z.string(),
  cause: exceptionCauseSchema,
  narrative: z.string(),
  exclusionStatus: exclusionStatusSchema,
  decisionReference: z.string().nullable(),
  decisionDate: z.string().nullable(),
  decidedBy: z.string().nullable(),
  reviewedBy: z.string(),
  reviewedAt: z.string(),
  version: z.number().int(),
  evidence: z.array(evidenceSchema),
});
export type Review = z.infer<typeof reviewSchema>;
