import { addBusinessDays } from "./calendar";
import { classifyDay } from "./exceptions";
import type { PnlBasis } from "../schemas/common";

/**
 * The deadline of an overshooting notice (docs/rules.md#overshooting-notice). CRR Art. 366(5): the
 * institution notifies its competent authority of an overshooting "promptly, and in any case no later
 * than within five working days". Quartermark counts the five working days on the entity's business-day
 * calendar from the day the committed upload revealed the overshooting (day 0), so a notice is due on
 * the fifth business day after that day.
 */
export const NOTICE_WORKING_DAYS = 5;

export function noticeDueOn(revealedOn: string, holidays: ReadonlySet<string>): string {
  return addBusinessDays(revealedOn, NOTICE_WORKING_DAYS, holidays);
}

/**
 * Late: still not sent when `today` is past the due day, or sent on a day after it. A withdrawn
 * notice is never late (nothing is owed any more). Days are calendar dates (YYYY-MM-DD, UTC).
 */
export function noticeIsLate(
  n: { status: "open" | "sent" | "withdrawn"; dueOn: string; sentOn: string | null },
  today: string,
): boolean {
  if (n.status === "withdrawn") return false;
  if (n.status === "sent") return n.sentOn !== null && n.sentOn > n.dueOn;
  return today > n.dueOn;
}

/** The day the "coming due" reminder goes: one business day before the due day. */
export function noticeReminderOn(dueOn: string, holidays: ReadonlySet<string>): string {
  return addBusinessDays(dueOn, -1, holidays);
}

/**
 * Which series of a day overshoot (docs/rules.md#exception, the engine's classifyDay), of those the
 * determination counts (the P&L basis in force): "actual" or "hypothetical" alone, or under "max"
 * (CRR Art. 366(3): the higher of the two counts) an overshooting on either. Null when the day is no
 * overshooting on a counted series. `excess`: the loss beyond VaR on the larger counted loss.
 */
export function countedOvershooting(
  day: { actualPnl: number | null; hypotheticalPnl: number | null; var99: number | null },
  basis: PnlBasis,
): { series: "actual" | "hypothetical" | "both"; excess: number } | null {
  const c = classifyDay(day.actualPnl, day.hypotheticalPnl, day.var99, false);
  const actual = basis !== "hypothetical" && c.actual;
  const hypothetical = basis !== "actual" && c.hypothetical;
  if (!actual && !hypothetical) return null;
  const losses = [actual ? -day.actualPnl! : -Infinity, hypothetical ? -day.hypotheticalPnl! : -Infinity];
  return {
    series: actual && hypothetical ? "both" : actual ? "actual" : "hypothetical",
    excess: Math.round((Math.max(...losses) - day.var99!) * 100) / 100,
  };
}
