import type { SnapshotModel } from "../../models/snapshot";
import type { SnapshotEvent } from "../../../shared/schemas/snapshot";
import type { SignedIn } from "../../kit/actor";

/** One line of a snapshot's history: who did what, when, with their comment. */
export function snapshotEvent(
  actor: SignedIn,
  action: SnapshotEvent["action"],
  comment?: string | null,
): SnapshotEvent {
  return {
    at: new Date().toISOString(),
    by: actor.user.email,
    action,
    comment: comment?.trim() ? comment.trim() : null,
  };
}

export function withEvent(row: SnapshotModel, e: SnapshotEvent): string {
  return JSON.stringify([...(JSON.parse(row.historyJson) as SnapshotEvent[]), e]);
}
