import type { Notice } from "@shared/schemas/notice";
import { formatBusinessDate, formatDateTime } from "@/lib/format";

export const seriesWords: Record<Notice["series"], string> = {
  actual: "actual P&L",
  hypothetical: "hypothetical P&L",
  both: "actual and hypothetical P&L",
};

/** Where a notice stands, in words: the first thing its row and its panel say. */
export function standingOf(n: Notice): string {
  switch (n.status) {
    case "sent":
      return `Sent ${formatDateTime(n.sentAt)}${n.sentBy ? ` by ${n.sentBy}` : ""}`;
    case "withdrawn":
      return "Withdrawn: no longer an overshooting";
    default:
      return n.draftedAt
        ? `Drafted, to send by ${formatBusinessDate(n.dueOn)}`
        : `To draft, due ${formatBusinessDate(n.dueOn)}`;
  }
}
