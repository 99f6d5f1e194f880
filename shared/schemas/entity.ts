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

/**
 * The jurisdictions whose public holidays the calendar library gives an entity (docs/rules.md#business-days).
 * The United Kingdom is England and Wales (its bank holidays); the United States is the federal holidays.
 */
export const CALENDAR_COUNTRIES = {
  AT: "Austria",
  AU: "Australia",
  BE: "Belgium",
  CA: "Canada",
  CH: "Switzerland",
  DE: "Germany",
  DK: "Denmark",
  ES: "Spain",
  FI: "Finland",
  FR: "France",
  GB: "United Kingdom (England and Wales)",
  HK: "Hong Kong",
  IE: "Ireland",
  IT: "Italy",
  JP: "Japan",
  LU: "Luxembourg",
  NL: "Netherlands",
  NO: "Norway",
  PT: "Portugal",
  SE: "Sweden",
  SG: "Singapore",
  US: "United States (federal holidays)",
} as const;
export type CalendarCountry = keyof typeof CALENDAR_COUNTRIES;
export const countrySchema = z.enum(Object.keys(CALENDAR_COUNTRIES) as [CalendarCountry, ...CalendarCountry[]], {
  error: "Choose a country from the list",
});
/** Where one currency means one country; the euro does not (the same list as the migration that added it). */
const COUNTRY_OF_CURRENCY: Record<string, CalendarCountry> = {
  GBP: "GB",
  USD: "US",
  SGD: "SG",
  CHF: "CH",
  JPY: "JP",
  HKD: "HK",
  CAD: "CA",
  AUD: "AU",
  SEK: "SE",
  NOK: "NO",
  DKK: "DK",
};
/** The country an entity's currency implies, or null when it does not name one (EUR). */
export function defaultCountryOf(currency: string): CalendarCountry | null {
  return COUNTRY_OF_CURRENCY[currency.toUpperCase()] ?? null;
}

const supervisorEmailsSchema = z.array(z.email("Each contact must be a valid e-mail address")).max(10);
export const entitySchema = z.object({
  code: z.string(),
  name: z.string(),
  regime: regimeSchema,
  pnlBasis: pnlBasisSchema,
  currency: z.string(),
  /** Whose public holidays the calendar imports; null until chosen (a euro entity). */
  country: z.string().nullable().default(null),
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
  /**
   * Unset: the currency's country (GBP → GB). A euro entity without one has no public holidays until an admin
   * chooses its country (the calendar panel says so).
   */
  country: countrySchema.optional(),
  qualitativeAddend: z.number().min(0, "Cannot be negative").max(1, "At most 1").optional(),
  supervisorName: plainNameSchema.nullable().optional(),
  supervisorEmails: supervisorEmailsSchema.optional(),
});
export type CreateEntityBody = z.infer<typeof createEntityBodySchema>;
/** Any of the fields of a creation but the code, with the version the admin read. */
export const updateEntityBodySchema = createEntityBodySchema
  .omit({ code: true })
  .partial()
  .extend({ version: z.number().int().positive("Send the entity's version as you read it") })
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
/** "library": a public holiday imported from the calendar library; "bank": one of the bank's own closing days. */
export const holidaySourceSchema = z.enum(["library", "bank"]);
export type HolidaySource = z.infer<typeof holidaySourceSchema>;
export const holidaySchema = z.object({
  date: z.string(),
  name: z.string(),
  source: holidaySourceSchema.default("bank"),
});
export type Holiday = z.infer<typeof holidaySchema>;
export const holidayListSchema = z.array(holidaySchema);
export const createHolidayBodySchema = z.strictObject({ date: isoDateSchema, name: plainNameSchema });
export type CreateHolidayBody = z.infer<typeof createHolidayBodySchema>;
export const holidayParamSchema = z.object({ code: entityCodeSchema, date: isoDateSchema });

/** A year of the library's public holidays, set against the calendar as it stands. */
const importYearSchema = z.coerce
  .number({ error: "A year, e.g. 2026" })
  .int("A year, e.g. 2026")
  .min(2000, "From 2000")
  .max(2100, "Up to 2100");
export const holidayImportQuerySchema = z.object({ year: importYearSchema });
export const holidayImportPreviewSchema = z.object({
  year: z.number().int(),
  country: z.string(),
  countryName: z.string(),
  /** Weekdays the import makes holidays (they stop being business days). */
  add: z.array(z.object({ date: z.string(), name: z.string() })),
  /** Imported days the library no longer lists (they become business days again). */
  remove: z.array(z.object({ date: z.string(), name: z.string() })),
  /** Imported days whose name the library now spells differently (no business day moves). */
  rename: z.array(z.object({ date: z.string(), name: z.string() })),
  /** Library days already kept as the bank's own closing days (left as they are). */
  alreadyBank: z.array(z.object({ date: z.string(), name: z.string() })),
  /** Days that change from business day to holiday or back: add + remove. */
  changes: z.number().int(),
});
export type HolidayImportPreview = z.infer<typeof holidayImportPreviewSchema>;
export const holidayImportBodySchema = z.strictObject({
  year: importYearSchema,
  /** The number of changing days the confirmation stated; a different number now is 409 (the calendar moved). */
  changes: z.number().int().min(0),
});
export type HolidayImportBody = z.infer<typeof holidayImportBodySchema>;
