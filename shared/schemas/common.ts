import { z } from "zod";

export const roleSchema = z.enum(["analyst", "cro", "treasury", "regulator", "admin"]);
export type Role = z.infer<typeof roleSchema>;

export const regimeSchema = z.enum(["basel", "us", "eu", "frtb"]);
export type RegimeId = z.infer<typeof regimeSchema>;

/** Parts of a day's actual P&L that the rule sets treat differently (docs/rules.md#pnl-definition). */
export const PNL_COMPONENTS = [
  "feesCommissions",
  "reservesAdjustments",
  "netInterestIncome",
  "intradayPnl",
  "newTradePnl",
] as const;
export const pnlComponentSchema = z.enum(PNL_COMPONENTS);

/** The risk figures a day's file carries beside its P&L: VaR, stressed VaR, ES and the FRTB charges. */
export const RISK_MEASURES = [
  "var99",
  "var975",
  "svar99",
  "var10d",
  "svar10d",
  "es975",
  "ses",
  "rtpl",
  "imaDrc",
  "sbm",
  "rrao",
  "saDrc",
  "saGa",
] as const;

/** One `z.number().nullable()` field per key: an amount that may be missing. */
export function nullableNumbers<K extends string>(keys: readonly K[]): { [P in K]: z.ZodNullable<z.ZodNumber> } {
  return Object.fromEntries(keys.map((key) => [key, z.number().nullable()])) as {
    [P in K]: z.ZodNullable<z.ZodNumber>;
  };
}

export const pnlBasisSchema = z.enum(["actual", "hypothetical", "max"]);
export type PnlBasis = z.infer<typeof pnlBasisSchema>;

export const portfolioLevelSchema = z.enum(["top", "desk"]);
export type PortfolioLevel = z.infer<typeof portfolioLevelSchema>;

/** ISO business date, YYYY-MM-DD, and a real calendar day. */
export const isoDateSchema = z
  .string()
  .regex(/^\d{4}-\d{2}-\d{2}$/, "Use the date format YYYY-MM-DD")
  .refine((s) => {
    const d = new Date(`${s}T00:00:00Z`);
    return !Number.isNaN(d.getTime()) && d.toISOString().slice(0, 10) === s;
  }, "Not a real calendar date");

/** A code people type: trimmed, 2 to `max` characters, capitals and digits first. */
const codeSchema = (max: number, pattern: RegExp, rule: string) =>
  z.string().trim().min(2, "At least 2 characters").max(max, `At most ${max} characters`).regex(pattern, rule);

export const entityCodeSchema = codeSchema(20, /^[A-Z0-9][A-Z0-9-]*$/, "Capital letters, digits and hyphens only");

export const portfolioCodeSchema = codeSchema(
  40,
  /^[A-Z0-9][A-Z0-9_-]*$/,
  "Capital letters, digits, hyphens and underscores only",
);

export const currencySchema = z
  .string()
  .trim()
  .regex(/^[A-Z]{3}$/, "A three-letter ISO 4217 code such as EUR");

/** Free text shown on screen and in packs: one line, no control characters. */
export const plainNameSchema = z
  .string()
  .trim()
  .min(1, "Required")
  .max(120, "At most 120 characters")
  // eslint-disable-next-line no-control-regex -- control characters are exactly what is refused
  .refine((s) => !/[\u0000-\u001f\u007f]/.test(s), "No line breaks or control characters");

/**
 * A numeric id as an address writes it: plain decimal digits, no sign, no leading zero, no
 * spaces, no exponent or hex (Number() would read "1e1", "0x10", " 1" and "01" as 10, 16, 1, 1).
 */
export const idSchema = z
  .string()
  .regex(/^[1-9][0-9]{0,14}$/, "An id is a whole number written in plain digits (no sign, spaces or leading zero)")
  .transform(Number);
/** The one schema of a numeric id in an address (/api/…/:id). */
export const idParamSchema = z.object({ id: idSchema });
/** An entity's code in an address (/api/entities/:code/…). */
export const entityCodeParamSchema = z.object({ code: entityCodeSchema });
/** A portfolio's code in an address (/api/portfolios/:code/…), read in capitals. */
export const portfolioCodeParamSchema = z.object({
  code: z
    .string()
    .trim()
    .min(1)
    .max(40)
    .transform((s) => s.toUpperCase()),
});

export const apiErrorSchema = z.object({
  error: z.object({
    code: z.string(),
    message: z.string(),
    details: z.unknown().optional(),
  }),
});
export type ApiErrorBody = z.infer<typeof apiErrorSchema>;

/** The standing caution on every screen and every pack (docs/architecture.md#caution). */
export const CAUTION =
  "Figures are decision support. The supervisor, the applicable rules and the approved model documentation govern; qualified staff review every figure before filing.";
