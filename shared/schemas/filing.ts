import { z } from "zod";
import { zoneSchema } from "./backtest";

/** A signed-off snapshot's pack as sent to the supervisor (docs/api.md#filings). */
export const filingSchema = z.object({
  id: z.number().int(),
  snapshotId: z.number().int(),
  entity: z.string(),
  entityName: z.string(),
  quarterEnd: z.string(),
  zone: zoneSchema,
  counted: z.number().int(),
  multiplier: z.number(),
  fileName: z.string(),
  /** sha256 of the PDF exactly as sent: a supervisor checks the file they hold against it. */
  sha256: z.string(),
  recipients: z.array(z.string()),
  /**
   * "sent": every recipient's mail server took the pack. "partial": some did, others refused it or
   * are still waiting (the CRO can send to the rest). "pending": it reached nobody yet; the delivery
   * loop sends it as soon as the mail server answers.
   */
  delivery: z.enum(["pending", "partial", "sent"]),
  /** Each recipient's state and the mail server's last answer for them. */
  deliveries: z.array(
    z.object({
      recipient: z.string(),
      status: z.enum(["pending", "sending", "accepted", "refused", "unknown"]),
      detail: z.string().nullable(),
      attempts: z.number().int(),
      acceptedAt: z.string().nullable(),
    }),
  ),
  /** What happened, in words: "Sent to a@x; refused by b@y: 550 …". */
  summary: z.string(),
  /** The one Message-ID of the filing's message, fixed before anything is sent. */
  messageId: z.string().nullable(),
  /** Who filed it. */
  sentBy: z.string(),
  sentAt: z.string().nullable(),
  /** Why the last attempt failed, while some recipient still waits for the mail server. */
  lastError: z.string().nullable(),
  acknowledgedBy: z.string().nullable(),
  acknowledgedAt: z.string().nullable(),
  /** The filed snapshot's seal (its hash in the entity's signed chain). */
  snapshotHash: z.string().nullable(),
  /** Snapshot ids: the snapshot this filing's snapshot amends, and the one that amends it (docs/api.md#amendments). */
  amends: z.number().int().nullable(),
  amendedBy: z.number().int().nullable(),
});
export type Filing = z.infer<typeof filingSchema>;
export const filingListSchema = z.array(filingSchema);
export const filingVerifySchema = z.object({
  valid: z.boolean(),
  sha256: z.string(),
  snapshotHash: z.string().nullable(),
  detail: z.string(),
});
export type FilingVerify = z.infer<typeof filingVerifySchema>;
