import type { SnapshotStatus } from "@shared/schemas/snapshot";

/** Where a snapshot stands, in our own words (Quarter close and Capital both show it). */
export const snapshotStatusLabels: Record<SnapshotStatus, string> = {
  draft: "Draft",
  submitted: "Submitted for sign-off",
  approved: "Approved",
  returned: "Returned",
  filed: "Filed",
};
