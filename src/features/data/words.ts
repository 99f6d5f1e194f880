import type { FindingKind, UploadPreview } from "@shared/schemas/upload";

/** The first twelve hex digits: enough to tell files apart at a glance. */
export function shortSha(sha256: string): string {
  return sha256.slice(0, 12);
}

export const findingKindLabels: Record<FindingKind, string> = {
  missing_day: "Missing business days",
  stale_var: "Stale VaR",
  pnl_without_var: "P&L without VaR",
  var_without_pnl: "VaR without P&L",
  outlier: "Outlier",
};

export const findingStatusLabels = { open: "Open", resolved: "Resolved", explained: "Explained" } as const;

export const uploadStatusLabels: Record<UploadPreview["status"], string> = {
  preview: "Awaiting commit",
  committed: "Committed",
  discarded: "Discarded",
};
