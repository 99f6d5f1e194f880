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

/** Rules for a new password set by an admin. */
export const newPasswordSchema = passwordSchema.refine((s) => s.length >= 12, "At least 12 characters");

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
