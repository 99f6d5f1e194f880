import { z } from "zod";

/**
 * "Waiting for me": what the signed-in person has to do next, across every entity and quarter.
 * Each item links to the client screen where it is done (`href`, a path of this application).
 */
export const queueKindSchema = z.enum([
  // the chief risk officer's
  "snapshot_submitted",
  "exclusion_request",
  "settings_proposal",
  "approved_not_filed",
  "notice_to_send",
  // the analysts'
  "snapshot_returned",
  "amendment_to_prepare",
  "unexplained_exception",
  "open_finding",
  "quarter_without_snapshot",
  "notice_to_draft",
  // an administrator's: a role change another administrator proposed
  "role_request",
  // a supervisor's: a filed pack not yet acknowledged
  "filing_to_acknowledge",
]);
export type QueueKind = z.infer<typeof queueKindSchema>;

export const queueItemSchema = z.object({
  kind: queueKindSchema,
  /** The entity's code; empty for an item that belongs to no entity (a role request). */
  entity: z.string(),
  title: z.string(),
  href: z.string(),
  /** The date it is due by, when a rule sets one (YYYY-MM-DD). */
  due: z.string().optional(),
});
export type QueueItem = z.infer<typeof queueItemSchema>;
export const queueSchema = z.array(queueItemSchema);
