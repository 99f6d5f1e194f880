import { z } from "zod";

/** The file formats every table can be taken out in (`GET /api/findings.csv`, `…/exceptions.xlsx`). */
export const exportFormatSchema = z.enum(["csv", "xlsx"], {
  error: "A table downloads as .csv or .xlsx",
});
export type ExportFormat = z.infer<typeof exportFormatSchema>;

export const exportFormatParamSchema = z.object({ format: exportFormatSchema });
