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
import { type Role } from "./common";

// ---- users ----
export const userSchema = z.object({
  id: z.number().int(),
  email: z.string(),
  name: z.string(),
  role: roleSchema,
  disabled: z.boolean(),
  createdAt: z.string(),
  lastSignInAt: z.string().nullable(),
  /** False until the person has set their first password from their invitation link. */
  passwordSet: z.boolean(),
  /** Row version, sent back with an edit: a stale one is refused (409 stale). */
  version: z.number().int(),
});
export type User = z.infer<typeof userSchema>;
export const userListSchema = z.array(userSchema);

export const createUserBodySchema = z.strictObject({
  email: z.string().trim().toLowerCase().pipe(z.email("Enter a valid e-mail address")),
  name: plainNameSchema,
  role: roleSchema,
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

/** Sends a user a new one-time link to set their password (a first invitation again, or a reset); never a password. */
export const passwordLinkBodySchema = z.strictObject({ version: userVersionSchema });
export type PasswordLinkBody = z.infer<typeof passwordLinkBodySchema>;

// ---- separation of duties: who may grant what ----
/** Granting or removing these roles needs a second administrator's approval. */
export const APPROVAL_ROLES: readonly Role[] = ["cro", "admin"];

/** Whether moving a person from `from` (null: a new person) to `to` grants or removes a role that needs approval. */
export function needsSecondAdmin(from: Role | null, to: Role): boolean {
  if (from === to) return false;
  return APPROVAL_ROLES.includes(to) || (from !== null && APPROVAL_ROLES.includes(from));
}

export const roleRequestSchema = z.object({
  id: z.number().int(),
  /** `invite`: a new person, invited once approved; `change`: an existing user's role. */
  kind: z.enum(["invite", "change"]),
  userId: z.number().int().nullable(),
  email: z.string(),
  name: z.string(),
  fromRole: roleSchema.nullable(),
  toRole: roleSchema,
  status: z.enum(["pending", "approved", "rejected"]),
  proposedBy: z.object({ id: z.number().int(), name: z.string(), email: z.string() }),
  proposedAt: z.string(),
  decidedBy: z.object({ id: z.number().int(), name: z.string(), email: z.string() }).nullable(),
  decidedAt: z.string().nullable(),
});
export type RoleRequest = z.infer<typeof roleRequestSchema>;
export const roleRequestListSchema = z.array(roleRequestSchema);

export const proposeRoleBodySchema = z.strictObject({
  userId: z.number().int().positive(),
  role: roleSchema,
  version: userVersionSchema,
});
export type ProposeRoleBody = z.infer<typeof proposeRoleBodySchema>;
export const roleRequestIdParamSchema = z.object({ id: z.coerce.number().int().positive() });

/** What inviting someone did: the link went out, or the grant waits for a second administrator first. */
export const createUserResultSchema = z.discriminatedUnion("outcome", [
  z.object({
    outcome: z.literal("invited"),
    user: userSchema,
    invitation: z.object({ expiresAt: z.string() }),
  }),
  z.object({ outcome: z.literal("awaiting_approval"), request: roleRequestSchema }),
]);
export type CreateUserResult = z.infer<typeof createUserResultSchema>;

/** A set-password link not used yet: still open, or expired (then the admin sends a new one). */
export const pendingInvitationSchema = z.object({
  id: z.number().int(),
  userId: z.number().int(),
  email: z.string(),
  name: z.string(),
  role: roleSchema,
  purpose: z.enum(["invite", "reset"]),
  createdBy: z.string().nullable(),
  createdAt: z.string(),
  expiresAt: z.string(),
  expired: z.boolean(),
});
export type PendingInvitation = z.infer<typeof pendingInvitationSchema>;
export const pendingInvitationListSchema = z.array(pendingInvitationSchema);

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
