/**
 * What each notification says, built from stored figures after the write committed: the reader
 * gets the figures the screens show at that moment.
 */
import { PortfolioModel } from "../../models/portfolio";
import { getBacktest } from "../backtest/backtest.service";
import { quarterLabel } from "../../../shared/backtest/quarters";
import { notify, type Notice } from "./notifications.service";

const amount = (v: number | null, currency: string) =>
  v === null ? "—" : `${v.toLocaleString("en-GB", { minimumFractionDigits: 2, maximumFractionDigits: 2 })} ${currency}`;

/**
 * One notice per portfolio for the committed days that are exceptions in its current window:
 * each day's P&L, VaR and excess, and the count and zone they lead to.
 */
export async function newExceptionNotices(
  written: readonly { portfolioId: number; date: string }[],
): Promise<Notice[]> {
  const byPortfolio = new Map<number, Set<string>>();
  for (const w of written) {
    const dates = byPortfolio.get(w.portfolioId) ?? new Set<string>();
    dates.add(w.date);
    byPortfolio.set(w.portfolioId, dates);
  }
  if (byPortfolio.size === 0) return [];
  const portfolios = await PortfolioModel.findAll({ where: { id: [...byPortfolio.keys()] } });
  const notices: Notice[] = [];
  for (const p of portfolios) {
    const bt = await getBacktest(p.code).catch(() => null);
    if (!bt) continue;
    const dates = byPortfolio.get(p.id)!;
    const fresh = bt.exceptionDays.filter((d) => dates.has(d.date) && (d.actual || d.hypothetical) && !d.excluded);
    if (fresh.length === 0) continue;
    const c = bt.entity.currency;
    const lines = fresh.map((d) => {
      const series = d.actual && d.hypothetical ? "actual and hypothetical" : d.actual ? "actual" : "hypothetical";
      const pnl = d.actual ? d.actualPnl : d.hypotheticalPnl;
      const excess = d.actual ? d.excessActual : d.excessHypothetical;
      return `- ${d.date}: P&L ${amount(pnl, c)}, VaR ${amount(d.var99, c)}, excess ${amount(excess, c)} (on ${series} P&L)`;
    });
    notices.push({
      kind: "new_exception",
      subject: `${fresh.length === 1 ? "a new exception" : `${fresh.length} new exceptions`} on ${bt.portfolio.code}`,
      text:
        `${bt.entity.name} (${bt.entity.code}), portfolio ${bt.portfolio.name} (${bt.portfolio.code}):\n` +
        `${lines.join("\n")}\n\n` +
        `With ${fresh.length === 1 ? "it" : "them"}, ${bt.exceptions.counted} ` +
        `${bt.exceptions.counted === 1 ? "exception counts" : "exceptions count"} in the window ending ` +
        `${bt.asOf}: ${bt.zoneLabel} zone, plus factor ${bt.plusFactor.toFixed(2)}, multiplier if determined today ` +
        `${bt.multiplier.toFixed(2)}. Each exception needs an explanation.`,
      href: `/backtest/${bt.portfolio.code}?exception=${fresh[0].date}`,
      target: `${bt.entity.code} ${bt.portfolio.code}`,
    });
  }
  return notices;
}

/** Tells the office of the new exceptions a commit wrote (after it committed; never throws). */
export async function notifyNewExceptions(written: readonly { portfolioId: number; date: string }[]): Promise<void> {
  try {
    for (const notice of await newExceptionNotices(written)) await notify(notice);
  } catch {
    // notify() logs its own failures; building the notice reads stored figures only.
  }
}

type SnapshotEvent = "snapshot_submitted" | "snapshot_returned" | "snapshot_approved";

/** Tells the people concerned that a quarter moved on in its sign-off (never throws). */
export async function notifySnapshotEvent(
  kind: SnapshotEvent,
  s: {
    id: number;
    entity: string;
    entityName: string;
    quarterEnd: string;
    zone: string;
    counted: number;
    multiplier: number;
  },
  by: string,
  comment?: string | null,
): Promise<void> {
  const quarter = quarterLabel(s.quarterEnd);
  const what = {
    snapshot_submitted: `${by} submitted ${quarter} of ${s.entityName} for sign-off. It waits for the chief risk officer's approval.`,
    snapshot_returned: `${by} returned ${quarter} of ${s.entityName} to the analysts.`,
    snapshot_approved: `${by} approved and sealed ${quarter} of ${s.entityName}; its figures no longer change.`,
  }[kind];
  await notify({
    kind,
    subject: `${quarter} of ${s.entity} ${kind === "snapshot_submitted" ? "submitted" : kind === "snapshot_returned" ? "returned" : "approved"}`,
    text:
      `${what}\n\n${s.counted} exceptions counted, ${s.zone} zone, multiplier ${s.multiplier.toFixed(2)}.` +
      (comment ? `\nComment: ${comment}` : ""),
    href: `/quarters?entity=${encodeURIComponent(s.entity)}&snapshot=${s.id}`,
    target: `${s.entity} ${quarter}`,
  });
}
