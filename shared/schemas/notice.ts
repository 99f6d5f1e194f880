import { z } from "zod";
import { entityCodeSchema } from "./common";

/**
 * An overshooting notice (docs/rules.md#overshooting-notice): an entity under the EU rule set tells
 * its supervisor of each overshooting of its top-of-house book within five working days. The analyst
 * drafts it, the chief risk officer sends it. "open": not sent yet; "sent": it went to the supervisor
 * contacts; "withdrawn": a restatement left the day no overshooting before it was sent (kept visible).
 */
export const noticeStatusSchema = z.enum(["open", "sent", "withdrawn"]);
export type NoticeStatus = z.infer<typeof noticeStatusSchema>;

export const noticeSchema = z.object({
  id: z.number().int(),
  entity: z.string(),
  entityName: z.string(),
  portfolio: z.string(),
  currency: z.string(),
  /** The business day of the overshooting. */
  date: z.string(),
  status: noticeStatusSchema,
  /** The day the committed upload revealed it: the five working days run from the next one. */
  revealedOn: z.string(),
  dueOn: z.string(),
  /** Not sent by dueOn (when open), or sent after it. */
  late: z.boolean(),
  /** The series the overshooting is on: those the entity's determination counts. */
  series: z.enum(["actual", "hypothetical", "both"]),
  actualPnl: z.number().nullable(),
  hypotheticalPnl: z.number().nullable(),
  var99: z.number().nullable(),
  /** The loss beyond VaR on the larger of the counted series' losses. */
  excess: z.number().nullable(),
  /** The cause so far, in the analyst's words (empty until drafted). */
  cause: z.string(),
  draftedBy: z.string().nullable(),
  draftedAt: z.string().nullable(),
  sentBy: z.string().nullable(),
  sentAt: z.string().nullable(),
  /** Where it was sent (the entity's supervisor contacts at the time). */
  recipients: z.array(z.string()),
  withdrawnAt: z.string().nullable(),
  /** Why it no longer needs sending, or, on a sent one, that a restatement changed the day since. */
  note: z.string().nullable(),
  version: z.number().int(),
});
export type Notice = z.infer<typeof noticeSchema>;
export const noticeListSchema = z.array(noticeSchema);

/** GET /api/notices?entity=CODE */
export const noticeListQuerySchema = z.strictObject({ entity: entityCodeSchema });

/** PUT /api/notices/:id/draft: the analyst's text, with the version they saw (409 stale otherwise). */
export const noticeDraftBodySchema = z.strictObject({
  cause: z
    .string()
    .trim()
    .min(1, "Say what is known of the cause so far")
    .max(4000, "Keep the cause under 4,000 characters"),
  version: z.number().int().min(1),
});
export type NoticeDraftBody = z.infer<typeof noticeDraftBodySchema>;

/** POST /api/notices/:id/send: the version the CRO confirmed. */
export const noticeSendBodySchema = z.strictObject({ version: z.number().int().min(1) });
export type NoticeSendBody = z.infer<typeof noticeSendBodySchema>;
