import type { FindingKind } from "@shared/schemas/finding";

export const findingKindLabels: Record<FindingKind, string> = {
  missing_day: "Missing business days",
  stale_var: "Stale VaR",
  pnl_without_var: "P&L without VaR",
  var_without_pnl: "VaR without P&L",
  hpl_without_rtpl: "HPL without RTPL",
  outlier: "Outlier",
};

export const findingStatusLabels = { open: "Open", resolved: "Resolved", explained: "Explained" } as const;
