import { z } from "zod";
import { plainNameSchema, roleSchema } from "./common";
import { newPasswordSchema } from "./auth";

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
