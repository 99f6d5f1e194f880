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

/** The first twelve hex digits: enough to tell two hashes apart at a glance (the whole one is in the title). */
export function shortHash(hash: string): string {
  return hash.length > 12 ? `${hash.slice(0, 12)}…` : hash;
}
