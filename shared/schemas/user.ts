import { z } from "zod";
import { plainNameSchema, roleSchema, type Role } from "./common";

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
  /** Locked out by failed sign-ins until then (the lockout window's end); null when not locked. Only in the list. */
  lockedUntil: z.string().nullable().default(null),
  /** Row version, sent back with an edit: a stale one is refused (409 stale). */
  version: z.number().int(),
});
export type User = z.infer<typeof userSchema>;
export const userListSchema = z.array(userSchema);

/** The people directory every signed-in reader may see: to show a person by name where a record keeps the e-mail. */
export const personSchema = z.object({ email: z.string(), name: z.string() });
export const peopleSchema = z.array(personSchema);
export type Person = z.infer<typeof personSchema>;

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
