import { z } from "zod";
import { PNL_COMPONENTS, RISK_MEASURES, isoDateSchema, nullableNumbers } from "./common";

/** The daily P&L and VaR as stored (the current version of each day), read back. */
export const observationsQuerySchema = z.object({ from: isoDateSchema.optional(), to: isoDateSchema.optional() });
export const observationSchema = z.object({
  date: z.string(),
  /** The file's actual P&L, as supplied. */
  actualPnl: z.number().nullable(),
  /** The actual P&L the entity's rule set backtests (docs/rules.md#pnl-definition): the same without parts. */
  backtestActualPnl: z.number().nullable(),
  hypotheticalPnl: z.number().nullable(),
  ...nullableNumbers(RISK_MEASURES),
  ...nullableNumbers(PNL_COMPONENTS),
  version: z.number().int(),
});
export type ObservationDto = z.infer<typeof observationSchema>;
export const observationListSchema = z.array(observationSchema);
