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
} from "./common";

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
export const holidaySchema = z.object({ date: z.string(), name: z.string() });
export type Holiday = z.infer<typeof holidaySchema>;
export const holidayListSchema = z.array(holidaySchema);
export const createHolidayBodySchema = z.strictObject({ date: isoDateSchema, name: plainNameSchema });
export type CreateHolidayBody = z.infer<typeof createHolidayBodySchema>;
export const holidayParamSchema = z.object({ code: entityCodeSchema, date: isoDateSchema });
