import { z } from "zod";
import type { Role } from "./common";

/** The e-mails Quartermark sends about the work, each to the roles it concerns. */
export const notificationKindSchema = z.enum([
  "new_exception",
  "snapshot_submitted",
  "snapshot_returned",
  "snapshot_approved",
  "notice_due",
]);
export type NotificationKind = z.infer<typeof notificationKindSchema>;

export const NOTIFICATION_KINDS: readonly {
  kind: NotificationKind;
  label: string;
  audience: readonly Role[];
}[] = [
  { kind: "new_exception", label: "A committed day is a new exception", audience: ["analyst", "cro"] },
  { kind: "snapshot_submitted", label: "A quarter is submitted for sign-off", audience: ["cro"] },
  { kind: "snapshot_returned", label: "A quarter is returned to the analysts", audience: ["analyst"] },
  { kind: "snapshot_approved", label: "A quarter is approved and sealed", audience: ["analyst", "cro", "treasury"] },
  {
    kind: "notice_due",
    label: "An overshooting notice is due in one working day and not sent",
    audience: ["analyst", "cro"],
  },
];

export const notificationChoicesSchema = z.object({
  choices: z.array(z.object({ kind: notificationKindSchema, label: z.string(), on: z.boolean() })),
});
export type NotificationChoices = z.infer<typeof notificationChoicesSchema>;

/** PUT /api/notifications/choices: the kinds the person wants (of those for their role). */
export const notificationChoicesBodySchema = z.strictObject({
  on: z.array(notificationKindSchema).max(NOTIFICATION_KINDS.length),
});
export type NotificationChoicesBody = z.infer<typeof notificationChoicesBodySchema>;
