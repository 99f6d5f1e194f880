import { z } from "zod";
import { isoDateSchema } from "./common";

export const auditEventSchema = z.object({
  id: z.number().int(),
  at: z.string(),
  actorEmail: z.string().nullable(),
  /** The person's name as the users table now has it (the signed record keeps the e-mail). */
  actorName: z.string().nullable().default(null),
  action: z.string(),
  target: z.string().nullable(),
  /** The target in words ("LKS-EU Q3 2026 snapshot", a person's name); null when the stored text says it already. */
  targetWords: z.string().nullable().default(null),
  ip: z.string().nullable(),
  before: z.unknown().nullable(),
  after: z.unknown().nullable(),
});
export type AuditEvent = z.infer<typeof auditEventSchema>;
export const auditPageSchema = z.object({ items: z.array(auditEventSchema), total: z.number().int() });
/** What the audit log is narrowed to: the action's start, the person's e-mail, a span of days (UTC). */
export const auditFilterSchema = z
  .object({
    action: z.string().max(60).optional(),
    actor: z.string().trim().max(190).optional(),
    from: isoDateSchema.optional(),
    to: isoDateSchema.optional(),
  })
  .refine((f) => !f.from || !f.to || f.from <= f.to, { message: "The first day comes after the last", path: ["to"] });
export type AuditFilter = z.infer<typeof auditFilterSchema>;
export const auditQuerySchema = z.intersection(
  auditFilterSchema,
  z.object({
    limit: z.coerce.number().int().min(1).max(200).default(50),
    offset: z.coerce.number().int().min(0).default(0),
  }),
);
export type AuditQuery = z.infer<typeof auditQuerySchema>;
/** An export holds at most this many events; a wider filter is refused with a message to narrow it. */
export const AUDIT_EXPORT_MAX = 50_000;

/** GET /api/audit-events/verify: the signed audit chain checked from its first event to its signed head. */
export const auditVerifySchema = z.object({
  valid: z.boolean(),
  /** How many events the signed chain holds. */
  events: z.number().int(),
  problems: z.array(
    z.object({ eventId: z.number().int().nullable(), seq: z.number().int().nullable(), detail: z.string() }),
  ),
  /** In words: what was checked, or the first thing that does not hold and how many more there are. */
  detail: z.string(),
});
export type AuditVerify = z.infer<typeof auditVerifySchema>;
