import { causeLabels, type ExceptionCause, type ExclusionStatus } from "@shared/schemas/review";
import type { ExceptionDayDto } from "@shared/schemas/backtest";

export { causeLabels };
export const causeIds = Object.keys(causeLabels) as ExceptionCause[];

export const exclusionStatusLabels: Record<ExclusionStatus, string> = {
  none: "Explained",
  requested: "Exclusion requested",
  approved: "Excluded by the supervisor",
  rejected: "Exclusion refused",
};

/** One word for where an exception's review stands, for the table and the overview. */
export function reviewStatusOf(day: Pick<ExceptionDayDto, "review">): string {
  if (!day.review) return "Not reviewed";
  return exclusionStatusLabels[day.review.exclusionStatus];
}
