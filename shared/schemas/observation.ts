import { z } from "zod";
import { isoDateSchema } from "./common";

/** The daily P&L and VaR as stored (the current version of each day), read back. */
export const observationsQuerySchema = z.object({ from: isoDateSchema.optional(), to: isoDateSchema.optional() });
export const observationSchema = z.object({
  date: z.string(),
  /** The file's actual P&L, as supplied. */
  actualPnl: z.number().nullable(),
  /** The actual P&L the entity's rule set backtests (docs/rules.md#pnl-definition): the same without parts. */
  backtestActualPnl: z.number().nullable(),
  hypotheticalPnl: z.number().nullable(),
  var99: z.number().nullable(),
  var975: z.number().nullable(),
  svar99: z.number().nullable(),
  var10d: z.number().nullable(),
  svar10d: z.number().nullable(),
  es975: z.number().nullable(),
  ses: z.number().nullable(),
  rtpl: z.number().nullable(),
  imaDrc: z.number().nullable(),
  sbm: z.number().nullable(),
  rrao: z.number().nullable(),
  saDrc: z.number().nullable(),
  saGa: z.number().nullable(),
  feesCommissions: z.number().nullable(),
  reservesAdjustments: z.number().nullable(),
  netInterestIncome: z.number().nullable(),
  intradayPnl: z.number().nullable(),
  newTradePnl: z.number().nullable(),
  version: z.number().int(),
});
export type ObservationDto = z.infer<typeof observationSchema>;
export const observationListSchema = z.array(observationSchema);
