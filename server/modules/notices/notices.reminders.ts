/**
 * "An overshooting notice is due in one working day and not sent" (the notice_due notification). A
 * round looks for open notices whose reminder day (one business day before the due day, on the
 * entity's calendar) has come, claims each one with a conditional UPDATE of `reminded_at` (so with
 * several server processes exactly one sends it), and tells whoever chose it. The server process
 * that runs the filing delivery runs a round every minute; no cron needed.
 */
import { QueryTypes } from "sequelize";
import { sequelize } from "../../db/sequelize";
import { logger } from "../../logger";
import { holidaysOf } from "../figures/engine-inputs";
import { notify } from "../notifications/notifications.service";
import { noticeReminderOn } from "../../../shared/backtest/notice-deadline";

const todayUtc = () => new Date().toISOString().slice(0, 10);

/** One round; returns how many reminders this process claimed and sent. `today` is fixed by the tests. */
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
  let sent = 0;
  const calendars = new Map<number, Set<string>>();
  for (const r of rows) {
    const entityId = Number(r.entity_id);
    if (!calendars.has(entityId)) calendars.set(entityId, await holidaysOf(entityId));
    if (today < noticeReminderOn(r.due_on, calendars.get(entityId)!)) continue;
    // The claim: only the process whose UPDATE changes the row sends the reminder.
    const [, affected] = await sequelize.query(
      "UPDATE overshooting_notices SET reminded_at = CURRENT_TIMESTAMP(3) WHERE id = :id AND reminded_at IS NULL AND status = 'open'",
      { replacements: { id: r.id }, type: QueryTypes.UPDATE },
    );
    if (Number(affected) !== 1) continue;
    const late = today > r.due_on;
    await notify({
      kind: "notice_due",
      subject: `overshooting notice of ${r.entity} ${late ? "late since" : "due on"} ${r.due_on}`,
      text:
        `The overshooting notice of ${r.entity_name} (${r.entity}) for ${r.portfolio} on ${r.date} is due on ` +
        `${r.due_on} and has not been sent${late ? ": it is late" : ""}. ` +
        (Number(r.drafted)
          ? "It is drafted and waits for the chief risk officer to send it."
          : "It has no draft yet: an analyst drafts the cause, then the chief risk officer sends it."),
      href: `/notices?entity=${encodeURIComponent(r.entity)}&notice=${Number(r.id)}`,
      target: `${r.entity} ${r.portfolio} ${r.date}`,
    });
    sent++;
  }
  return sent;
}

/** Runs a round every `everyMs` in this process; rounds never overlap. */
export function startNoticeReminders(everyMs = 60_000): () => void {
  let running = false;
  const timer = setInterval(() => {
    if (running) return;
    running = true;
    remindNoticesComingDue()
      .then((n) => {
        if (n) logger.info(`overshooting notices: ${n} coming-due reminder(s) sent`);
      })
      .catch((err) => logger.error(`overshooting notice reminders failed: ${(err as Error).message}`))
      .finally(() => {
        running = false;
      });
  }, everyMs);
  timer.unref();
  return () => clearInterval(timer);
}
