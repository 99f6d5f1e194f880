import { z } from "zod";
import {
  currencySchema,
  entityCodeSchema,
  isoDateSchema,
  plainNameSchema,
  pnlBasisSchema,
  portfolioCodeSchema,
  portfolioLevelSchema,
  regimeSchema,
  roleSchema,
} from "./common";
import { newPasswordSchema } from "./auth";

// ---- users ----
export const userSchema = z.object({
  id: z.number().int(),
  email: z.string(),
  name: z.string(),
  role: roleSchema,
  disabled: z.boolean(),
  createdAt: z.string(),
  lastSignInAt: z.string().nullable(),
  /** Row version, sent back with an edit: a stale one is refused (409 stale). */
  version: z.number().int(),
});
export type User = z.infer<typeof userSchema>;
export const userListSchema = z.array(userSchema);

export const createUserBodySchema = z.strictObject({
  email: z.string().trim().toLowerCase().pipe(z.email("Enter a valid e-mail address")),
  name: plainNameSchema,
  role: roleSchema,
  password: newPasswordSchema,
});
export type CreateUserBody = z.infer<typeof createUserBodySchema>;

const userVersionSchema = z.number().int().positive("Send the user's version as you read it");

export const updateUserBodySchema = z
  .strictObject({
    name: plainNameSchema.optional(),
    role: roleSchema.optional(),
    disabled: z.boolean().optional(),
    version: userVersionSchema,
  })
  .refine((b) => Object.keys(b).some((k) => k !== "version"), "Nothing to change");
export type UpdateUserBody = z.infer<typeof updateUserBodySchema>;

export const resetPasswordBodySchema = z.strictObject({ password: newPasswordSchema, version: userVersionSchema });
export type ResetPasswordBody = z.infer<typeof resetPasswordBodySchema>;

export const userIdParamSchema = z.object({ id: z.coerce.number().int().positive() });

// ---- entities ----
const supervisorEmailsSchema = z.array(z.email("Each contact must be a valid e-mail address")).max(10);

export const entitySchema = z.object({
  code: z.string(),
  name: z.string(),
  regime: regimeSchema,
  pnlBasis: pnlBasisSchema,
  currency: z.string(),
  qualitativeAddend: z.number(),
  supervisorName: z.string().nullable(),
  supervisorEmails: z.array(z.string()),
  /** Row version, sent back with an edit: a stale one is refused (409). */
  version: z.number().int(),
});
export type Entity = z.infer<typeof entitySchema>;
export const entityListSchema = z.array(entitySchema);

export const createEntityBodySchema = z.strictObject({
  code: entityCodeSchema,
  name: plainNameSchema,
  regime: regimeSchema,
  pnlBasis: pnlBasisSchema.optional(),
  currency: currencySchema,
  qualitativeAddend: z.number().min(0, "Cannot be negative").max(1, "At most 1").optional(),
  supervisorName: plainNameSchema.nullable().optional(),
  supervisorEmails: supervisorEmailsSchema.optional(),
});
export type CreateEntityBody = z.infer<typeof createEntityBodySchema>;

export const updateEntityBodySchema = z
  .strictObject({
    name: plainNameSchema.optional(),
    regime: regimeSchema.optional(),
    pnlBasis: pnlBasisSchema.optional(),
    currency: currencySchema.optional(),
    qualitativeAddend: z.number().min(0, "Cannot be negative").max(1, "At most 1").optional(),
    supervisorName: plainNameSchema.nullable().optional(),
    supervisorEmails: supervisorEmailsSchema.optional(),
    version: z.number().int().positive("Send the entity's version as you read it"),
  })
  .refine((b) => Object.keys(b).some((k) => k !== "version"), "Nothing to change");
export type UpdateEntityBody = z.infer<typeof updateEntityBodySchema>;

export const entityParamSchema = z.object({ code: entityCodeSchema });

// ---- portfolios ----
export const portfolioSchema = z.object({ code: z.string(), name: z.string(), level: portfolioLevelSchema });
export type Portfolio = z.infer<typeof portfolioSchema>;
export const portfolioListSchema = z.array(portfolioSchema);

export const createPortfolioBodySchema = z.strictObject({
  code: portfolioCodeSchema,
  name: plainNameSchema,
  level: portfolioLevelSchema,
});
export type CreatePortfolioBody = z.infer<typeof createPortfolioBodySchema>;

export const updatePortfolioBodySchema = z.strictObject({ name: plainNameSchema });
export const portfolioParamSchema = z.object({ code: entityCodeSchema, portfolio: portfolioCodeSchema });

// ---- holidays ----
export const holidaySchema = z.object({ date: z.string(), name: z.string() });
export type Holiday = z.infer<typeof holidaySchema>;
export const holidayListSchema = z.array(holidaySchema);
export const createHolidayBodySchema = z.strictObject({ date: isoDateSchema, name: plainNameSchema });
export type CreateHolidayBody = z.infer<typeof createHolidayBodySchema>;
export const holidayParamSchema = z.object({ code: entityCodeSchema, date: isoDateSchema });

// ---- regulator assignments ----
export const assignmentSchema = z.object({
  userId: z.number().int(),
  email: z.string(),
  name: z.string(),
  entityCode: z.string(),
});
export type Assignment = z.infer<typeof assignmentSchema>;
export const assignmentListSchema = z.array(assignmentSchema);
export const createAssignmentBodySchema = z.strictObject({
  userId: z.number().int().positive(),
  entityCode: entityCodeSchema,
});
export const assignmentParamSchema = z.object({
  userId: z.coerce.number().int().positive(),
  entityCode: entityCodeSchema,
});

// ---- audit log ----
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
