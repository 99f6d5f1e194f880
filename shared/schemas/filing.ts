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
   * "sent": the mail server took the pack (messageId, sentAt). "pending": it did not answer when
   * the CRO filed; the pack is kept and sent by the delivery loop as soon as the server is back.
   */
  delivery: z.enum(["pending", "sent"]),
  messageId: z.string().nullable(),
  /** Who filed it. */
  sentBy: z.string(),
  sentAt: z.string().nullable(),
  /** Why the last attempt failed, while pending. */
  lastError: z.string().nullable(),
  acknowledgedBy: z.string().nullable(),
  acknowledgedAt: z.string().nullable(),
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
