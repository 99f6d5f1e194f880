import { z } from "zod";
import { entityCodeSchema, idSchema } from "./common";

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
  userId: idSchema,
  entityCode: entityCodeSchema,
});
