import { z } from "zod";
import { roleSchema } from "./common";

/** bcrypt reads only the first 72 bytes; longer passwords are refused rather than silently cut. */
export const passwordSchema = z
  .string()
  .min(1, "Enter a password")
  .refine(
    (s) => new TextEncoder().encode(s).length <= 72,
    "Passwords are limited to 72 bytes (bcrypt ignores anything longer)",
  );

/**
 * A new password as it arrives: a string of sane size. The rule itself (length, common and
 * breached patterns, the owner's own words) needs to know whose password it is and runs in the
 * service with `newPasswordSchema` (`shared/password/policy.ts`).
 */
const newPasswordInputSchema = z.string().min(1, "Enter a new password").max(200, "Too long");

/** Changing one's own password: the current one proves it is the person, not just their open session. */
export const changePasswordBodySchema = z.strictObject({
  currentPassword: passwordSchema,
  newPassword: newPasswordInputSchema,
});
export type ChangePasswordBody = z.infer<typeof changePasswordBodySchema>;

/** A set-password link's token: 32 random bytes in base64url (only its SHA-256 is stored). */
export const invitationTokenSchema = z
  .string()
  .regex(/^[A-Za-z0-9_-]{43}$/, "This link is not complete. Open it again from the e-mail, or copy all of it.");

export const invitationLookupBodySchema = z.strictObject({ token: invitationTokenSchema });

/** What the set-password screen shows about an open link: whose it is and until when it works. */
export const invitationSchema = z.object({
  purpose: z.enum(["invite", "reset"]),
  email: z.string(),
  name: z.string(),
  role: roleSchema,
  expiresAt: z.string(),
});
export type Invitation = z.infer<typeof invitationSchema>;

export const acceptInvitationBodySchema = z.strictObject({
  token: invitationTokenSchema,
  password: newPasswordInputSchema,
});
export type AcceptInvitationBody = z.infer<typeof acceptInvitationBodySchema>;

export const loginBodySchema = z.object({
  email: z.string().trim().toLowerCase().pipe(z.email("Enter a valid e-mail address")),
  password: passwordSchema,
});
export type LoginBody = z.infer<typeof loginBodySchema>;

export const sessionUserSchema = z.object({
  id: z.number().int(),
  email: z.string(),
  name: z.string(),
  role: roleSchema,
});
export type SessionUser = z.infer<typeof sessionUserSchema>;

export const meResponseSchema = z.object({ user: sessionUserSchema });

/** The session probe: always 200, with the user or null, so a first visit logs no error. */
export const sessionResponseSchema = z.object({ user: sessionUserSchema.nullable() });
