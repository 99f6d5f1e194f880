import { z } from "zod";

export const auditEventSchema = z.object({
  id: z.number().int(),
  at: z.string(),
  actorEmail: z.string().nullable(),
  action: z.string(),
  target: z.string().nullable(),
  ip: z.string().nullable(),
  before: z.unknown().nullable(),
  after: z.unknown().nullable(),
});
export type AuditEvent = z.infer<typeof auditEventSchema>;
export const auditPageSchema = z.object({ items: z.array(auditEventSchema), total: z.number().int() });
export const auditQuerySchema = z.object({
  limit: z.coerce.number().int().min(1).max(200).default(50),
  offset: z.coerce.number().int().min(0).default(0),
  action: z.string().max(60).optional(),
});
export type AuditQuery = z.infer<typeof auditQuerySchema>;

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
