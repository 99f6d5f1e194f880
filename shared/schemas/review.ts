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

/** Each cause in words, as the screens and the pack name it. */
export const causeLabels: Record<ExceptionCause, string> = {
  market_move: "Market move",
  model_limitation: "Model limitation",
  data_issue: "Data issue",
  intraday_trading: "Intraday trading",
  pricing: "Pricing",
  other: "Other",
};
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

/** Today's date in UTC, the calendar the server keeps. */
const todayUtc = () => new Date().toISOString().slice(0, 10);

/** The CRO records what the supervisor decided about an exclusion request. */
export const decisionBodySchema = z.strictObject({
  decision: z.enum(["approved", "rejected"]),
  reference: z.string().trim().min(1, "Give the supervisor's reference for the decision").max(120),
  // A decision is recorded once the supervisor has taken it: never on a date still to come.
  decidedOn: isoDateSchema.refine((d) => d <= todayUtc(), "The supervisor's decision cannot be dated in the future"),
  /** Required when a decision is already recorded: the new record supersedes it, and says why. */
  correctionReason: z
    .string()
    .trim()
    .min(5, "Say in a few words why the recorded decision is corrected")
    .max(500, "At most 500 characters")
    .optional(),
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
/** One recorded decision; a correction names the one it supersedes. Both stay. */
export const exclusionDecisionSchema = z.object({
  id: z.number().int(),
  decision: z.enum(["approved", "rejected"]),
  reference: z.string(),
  decidedOn: z.string(),
  recordedBy: z.string().nullable(),
  recordedAt: z.string(),
  supersedes: z.number().int().nullable(),
  correctionReason: z.string().nullable(),
  /** Whether a later record corrected this one. */
  superseded: z.boolean(),
});
export type ExclusionDecision = z.infer<typeof exclusionDecisionSchema>;
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
  /** Every decision recorded on the exclusion request, oldest first (absent where none was ever asked). */
  decisions: z.array(exclusionDecisionSchema).optional(),
});
export type Review = z.infer<typeof reviewSchema>;
