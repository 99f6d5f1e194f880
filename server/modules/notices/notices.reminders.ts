/**
 * "An overshooting notice is due in one working day and not sent" (the notice_due notification). A
 * round looks for open notices whose reminder day (one business day before the due day, on the
 * entity's calendar) has come, claims each one with a conditional UPDATE of `reminded_at` (so with
 * several server processes exactly one sends it), and tells whoever chose it, one message per entity. The server process
 * that runs the filing delivery runs a round every minute; no cron needed.
 */
import { QueryTypes } from "sequelize";
import { sequelize } from "../../db/sequelize";
import { everyRound } from "../../kit/rounds";
import { holidaysOf } from "../figures/engine-inputs";
import { notify } from "../notifications/notifications.service";
import { noticeReminderOn } from "../../../shared/backtest/notice-deadline";

const todayUtc = () => new Date().toISOString().slice(0, 10);

/** One round; returns how many notices this process claimed and told of. `today` is fixed by the tests. */
export async function remindNoticesComingDue(today: string = todayUtc()): Promise<number> {
  const rows = await sequelize.query<{
    id: number;
    entity_id: number;
    entity: string;
    entity_name: string;
    portfolio: string;
    date: string;
    due_on: string;
    drafted: number;
  }>(
    `SELECT n.id, e.id AS entity_id, e.code AS entity, e.name AS entity_name, p.code AS portfolio,
            DATE_FORMAT(n.business_date, '%Y-%m-%d') AS date, DATE_FORMAT(n.due_on, '%Y-%m-%d') AS due_on,
            n.drafted_at IS NOT NULL AS drafted
       FROM overshooting_notices n JOIN portfolios p ON p.id = n.portfolio_id JOIN entities e ON e.id = p.entity_id
      WHERE n.status = 'open' AND n.reminded_at IS NULL AND n.due_on <= DATE_ADD(:today, INTERVAL 14 DAY)
      ORDER BY n.due_on, n.id`,
    { replacements: { today }, type: QueryTypes.SELECT },
  );
  const calendars = new Map<number, Set<string>>();
  const claimed = new Map<number, typeof rows>();
  for (const r of rows) {
    const entityId = Number(r.entity_id);
    if (!calendars.has(entityId)) calendars.set(entityId, await holidaysOf(entityId));
    if (today < noticeReminderOn(r.due_on, calendars.get(entityId)!)) continue;
    // The claim: only the process whose UPDATE changes the row sends the reminder.
    const [, affected] = await sequelize.query(
      `UPDATE overshooting_notices SET reminded_at = CURRENT_TIMESTAMP(3)
        WHERE id = :id AND reminded_at IS NULL AND status = 'open'`,
      { replacements: { id: r.id }, type: QueryTypes.UPDATE },
    );
    if (Number(affected) === 1) claimed.set(entityId, [...(claimed.get(entityId) ?? []), r]);
  }
  // One message per entity and round, listing its notices (a large first load must not send hundreds).
  for (const notices of claimed.values()) {
    const first = notices[0];
    const lines = notices.map((r) => {
      const late = today > r.due_on;
      return (
        `- ${r.portfolio} on ${r.date}: due on ${r.due_on}${late ? ", late" : ""}; ` +
        (Number(r.drafted) ? "drafted, waits for the chief risk officer to send it" : "no draft yet")
      );
    });
    const late = notices.some((r) => today > r.due_on);
    await notify({
      kind: "notice_due",
      subject:
        notices.length === 1
          ? `overshooting notice of ${first.entity} ${late ? "late since" : "due on"} ${first.due_on}`
          : `${notices.length} overshooting notices of ${first.entity} due by ${notices.at(-1)!.due_on}`,
      text:
        `${first.entity_name} (${first.entity}) has overshooting notices due within one working day and not sent:\n` +
        `${lines.join("\n")}\n\nAn analyst drafts the cause; the chief risk officer sends the notice to the supervisor.`,
      href: `/notices?entity=${encodeURIComponent(first.entity)}${notices.length === 1 ? `&notice=${Number(first.id)}` : ""}`,
      target: `${first.entity} overshooting notices`,
    });
  }
  return [...claimed.values()].reduce((n, list) => n + list.length, 0);
}

/** Runs a round every `everyMs` in this process; rounds never overlap. */
export function startNoticeReminders(everyMs = 60_000): () => void {
  return everyRound(
    everyMs,
    () => remindNoticesComingDue(),
    (n) => (n ? `overshooting notices: ${n} coming-due reminder(s) sent` : null),
    "overshooting notice reminders failed",
  );
}
