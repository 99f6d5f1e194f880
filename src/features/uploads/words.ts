import type { UploadPreview } from "@shared/schemas/upload";

/** The first twelve hex digits: enough to tell files apart at a glance. */
export function shortSha(sha256: string): string {
  return sha256.slice(0, 12);
}

export const uploadStatusLabels: Record<UploadPreview["status"], string> = {
  preview: "Awaiting commit",
  committed: "Committed",
  discarded: "Discarded",
};
