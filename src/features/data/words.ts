import type { FindingKind, UploadPreview } from "@shared/schemas/upload";
import { formatCount } from "@/lib/format";

/** A file size in the unit people read it in: 812 bytes, 48.2 kB, 6.1 MB. */
export function formatBytes(bytes: number): string {
  if (bytes < 1000) return `${formatCount(bytes)} bytes`;
  if (bytes < 1_000_000) return `${(bytes / 1000).toLocaleString("en-GB", { maximumFractionDigits: 1 })} kB`;
  return `${(bytes / 1_000_000).toLocaleString("en-GB", { minimumFractionDigits: 1, maximumFractionDigits: 1 })} MB`;
}

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
