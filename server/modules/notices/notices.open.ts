/**
 * Opening overshooting notices when an upload is committed (docs/rules.md#overshooting-notice), in
 * the commit's own transaction: the notice exists exactly when the data that reveals it does.
 * Only entities under the EU rule set, only their top-of-house book (the portfolio the entity's
 * determination counts on: headlinePortfolio), only the series the P&L basis in force that day counts,
 * only days of the 250 business days up to the commit's day.
 *
 * A restated day: still an overshooting → an open notice takes the new amounts (its due day stays:
 * the overshooting was already known); no longer one → an unsent notice is withdrawn with the reason
 * (kept visible, never deleted), a sent one keeps "sent" and says the day was restated since. A
 * withdrawn notice whose day becomes an overshooting again opens again, due from this commit.
 */
import { QueryTypes, type CreationAttributes, type Transaction } from "sequelize";
import { sequelize } from "../../db/sequelize";
import { EntityModel } from "../../models/entity";
import { PortfolioModel } from "../../models/portfolio";
import { OvershootingNoticeModel } from "../../models/overshooting-notice";
import { headlinePortfolio, holidaysOf, settingsAt } from "../figures/engine-inputs";
import { approvedSettings, fallbackSettings } from "../settings/settings.read";
import { loadSeries } from "../observations/observations.repository";
import { recordAudit } from "../audit/audit.service";
import { countedOvershooting, noticeDueOn } from "../../../shared/backtest/notice-deadline";
import { addBusinessDays } from "../../../shared/backtest/calendar";
import { STANDARD_WINDOW } from "../../../shared/backtest/regimes";

/**
 * How far back a committed day still opens a notice: the 250-business-day window the multiplier is
 * determined on (CRR Art. 366(2)), ending on the commit's day. An older day, or one dated after the
 * commit, counts in no determination the supervisor monitors now (docs/rules.md#overshooting-notice).
 */
const NOTICE_LOOKBACK_DAYS = STANDARD_WINDOW;
import type { SignedIn } from "../../kit/actor";

export interface WrittenDay {
  portfolioId: number;
  date: string;
}

const todayUtc = () => new Date().toISOString().slice(0, 10);

/**
 * Opens, updates or withdraws the notices of the days a commit wrote. `revealedOn` is the commit's
 * day (UTC); the tests pass it to fix the calendar.
 */
export async function openNoticesForCommit(
  written: readonly WrittenDay[],
  uploadId: number,
  actor: SignedIn,
  transaction: Transaction,
  revealedOn: string = todayUtc(),
): Promise<void> {
  if (written.length === 0) return;
  const portfolioIds = [...new Set(written.map((w) => w.portfolioId))];
  const eu = await sequelize.query<{ entity_id: number }>(
    `SELECT DISTINCT p.entity_id FROM portfolios p JOIN entities e ON e.id = p.entity_id
      WHERE p.id IN (:ids) AND e.regime = 'eu'`,
    { replacements: { ids: portfolioIds }, type: QueryTypes.SELECT, transaction },
  );
  for (const { entity_id } of eu) {
    const entity = (await EntityModel.findByPk(Number(entity_id), { transaction }))!;
    const books = await PortfolioModel.findAll({ where: { entityId: entity.id }, transaction });
    const headline = headlinePortfolio(books);
    if (!headline) continue;
    // Only days that count in the window the supervisor monitors: the 250 business days up to the commit's day.
    const holidays = await holidaysOf(entity.id, { transaction });
    const from = addBusinessDays(revealedOn, -NOTICE_LOOKBACK_DAYS, holidays);
    const dates = [
      ...new Set(
        written
          .filter((w) => w.portfolioId === headline.id && w.date > from && w.date <= revealedOn)
          .map((w) => w.date),
      ),
    ].sort();
    if (dates.length === 0) continue;
    await settleDays(entity, headline, dates, holidays, uploadId, actor, transaction, revealedOn);
  }
}

async function settleDays(
  entity: EntityModel,
  headline: PortfolioModel,
  dates: string[],
  holidays: Set<string>,
  uploadId: number,
  actor: SignedIn,
  transaction: Transaction,
  revealedOn: string,
): Promise<void> {
  const [series, settings] = await Promise.all([
    loadSeries(headline.id, entity.regime, dates[0], dates.at(-1), transaction),
    approvedSettings(entity.id, transaction),
  ]);
  const ctx = { settings, fallback: fallbackSettings(entity) };
  const byDate = new Map(series.map((o) => [o.date, o]));
  const existing = new Map(
    (
      await OvershootingNoticeModel.findAll({
        where: { portfolioId: headline.id, businessDate: dates },
        transaction,
        lock: transaction.LOCK.UPDATE,
      })
    ).map((n) => [n.businessDate, n]),
  );
  // Sent in bulk: a first load of a year's data may reveal many overshootings at once. Each kind of
  // change is one audit event per commit and book, listing the days.
  const opened: CreationAttributes<OvershootingNoticeModel>[] = [];
  const events = new Map<string, unknown[]>();
  const note = (action: string, detail: unknown) => events.set(action, [...(events.get(action) ?? []), detail]);
  for (const date of dates) {
    const day = byDate.get(date);
    const amounts = {
      actualPnl: day?.actualPnl ?? null,
      hypotheticalPnl: day?.hypotheticalPnl ?? null,
      var99: day?.var99 ?? null,
    };
    const over = countedOvershooting(amounts, settingsAt(ctx, date).pnlBasis);
    const notice = existing.get(date);
    if (over && !notice) {
      opened.push({
        portfolioId: headline.id,
        businessDate: date,
        revealedOn,
        dueOn: noticeDueOn(revealedOn, holidays),
        uploadId,
        series: over.series,
        ...amounts,
        excess: over.excess,
      });
    } else if (over && notice) {
      const reopened = notice.status === "withdrawn";
      const before = { status: notice.status, ...pick(notice) };
      if (reopened) {
        notice.status = "open";
        notice.revealedOn = revealedOn;
        notice.dueOn = noticeDueOn(revealedOn, holidays);
        notice.withdrawnAt = null;
        notice.note = `Opened again: upload #${uploadId} restated the day into an overshooting on ${revealedOn}.`;
        notice.remindedAt = null;
      } else if (notice.status === "sent" && changed(notice, amounts)) {
        notice.note = `Restated by upload #${uploadId} on ${revealedOn} after it was sent; still an overshooting.`;
      }
      if (notice.status !== "sent") Object.assign(notice, amounts, { series: over.series, excess: over.excess });
      if (!notice.changed()) continue;
      notice.uploadId = uploadId;
      notice.version += 1;
      await notice.save({ transaction });
      note(reopened ? "notice.reopen" : "notice.restated", {
        notice: notice.id,
        date,
        before,
        after: { status: notice.status, dueOn: notice.dueOn, ...pick(notice) },
      });
    } else if (!over && notice && notice.status !== "withdrawn") {
      const before = { status: notice.status, ...pick(notice) };
      if (notice.status === "open") {
        notice.status = "withdrawn";
        notice.withdrawnAt = new Date();
        notice.note = `Withdrawn: upload #${uploadId} restated the day on ${revealedOn} and it is no longer an overshooting.`;
        Object.assign(notice, amounts);
      } else {
        notice.note = `Restated by upload #${uploadId} on ${revealedOn} after it was sent: no longer an overshooting.`;
      }
      notice.uploadId = uploadId;
      notice.version += 1;
      await notice.save({ transaction });
      note(notice.status === "withdrawn" ? "notice.withdraw" : "notice.restated", {
        notice: notice.id,
        date,
        before,
        after: { status: notice.status, note: notice.note, ...amounts },
      });
    }
  }
  if (opened.length) {
    const created = await OvershootingNoticeModel.bulkCreate(opened, { transaction });
    for (const n of created)
      note("notice.open", { notice: n.id, date: n.businessDate, dueOn: n.dueOn, excess: n.excess, series: n.series });
  }
  for (const [action, days] of events)
    await recordAudit(
      actor,
      action,
      `${entity.code} ${headline.code}`,
      { after: { upload: uploadId, days } },
      transaction,
    );
}

const pick = (n: OvershootingNoticeModel) => ({
  actualPnl: n.actualPnl,
  hypotheticalPnl: n.hypotheticalPnl,
  var99: n.var99,
  excess: n.excess,
});

const changed = (
  n: OvershootingNoticeModel,
  a: { actualPnl: number | null; hypotheticalPnl: number | null; var99: number | null },
) => n.actualPnl !== a.actualPnl || n.hypotheticalPnl !== a.hypotheticalPnl || n.var99 !== a.var99;
