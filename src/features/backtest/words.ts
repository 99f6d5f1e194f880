import type { PnlBasis } from "@shared/schemas/common";

/** A p-value with four places; below that, "< 0.0001". */
export function formatPValue(p: number): string {
  if (p < 0.0001) return "< 0.0001";
  return p.toLocaleString("en-GB", { minimumFractionDigits: 4, maximumFractionDigits: 4 });
}

export function formatStatistic(s: number): string {
  return s.toLocaleString("en-GB", { minimumFractionDigits: 3, maximumFractionDigits: 3 });
}

export const basisLabels: Record<PnlBasis, string> = {
  actual: "actual P&L",
  hypothetical: "hypothetical P&L",
  max: "the higher of actual and hypothetical",
};
