import type { SnapshotEvent } from "@shared/schemas/snapshot";

/** What happened to a snapshot, for its history. */
export const snapshotEventLabels: Record<SnapshotEvent["action"], string> = {
  prepared: "Prepared",
  recomputed: "Prepared again",
  submitted: "Submitted for sign-off",
  approved: "Approved",
  returned: "Returned",
  filed: "Filed with the supervisor",
  restated: "Input day restated",
};
