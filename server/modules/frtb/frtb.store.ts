/**
 * FRTB desks of an entity: their status at each determination, stored (table frtb_desk_statuses)
 * and refreshed with the determinations inside every writing transaction; and the MAR33
 * aggregation on a date from the statuses in force then (docs/rules.md#frtb-aggregation).
 */
import type { Transaction } from "sequelize";
import type { EntityModel } from "../../models/entity";
import { PortfolioModel } from "../../models/portfolio";
import { FrtbDeskStatusModel } from "../../models/frtb-desk-status";
import { loadSeries, loadSeriesTail } from "../observations/observations.repository";
import { STARTING_POINT_OBSERVATIONS } from "../../../shared/backtest/forecast";
import { approvedExclusions } from "../figures/engine-inputs";
import {
  deskStandingAt,
  deskStatusHistory,
  frtbAggregation,
  topOfHouseScope,
  topScopeNote,
  type DeskStanding,
  type DeskStatus,
  type FrtbDeskInput,
} from "../../../shared/backtest/frtb-capital";
import { withMissingBusinessDays } from "../../../shared/backtest/window";
import type { Observation } from "../../../shared/backtest/types";
import type { FrtbFigures, FrtbStatusPoint } from "../../../shared/schemas/frtb";
import { snapshotFiguresSchema } from "../../../shared/schemas/snapshot";
import { DESK_LIMITS } from "../../../shared/backtest/frtb-desk";

const cents = (v: number) => Math.round(v * 100) / 100;
const centsOrNull = (v: number | null | undefined) => (v == null ? null : cents(v));

interface Point {
  periodEnd: string;
  asOf: string;
  effectiveFrom: string;
}

async function deskSeries(
  entity: EntityModel,
  holidays: ReadonlySet<string>,
  to: string | undefined,
  transaction?: Transaction,
): Promise<{ portfolio: PortfolioModel; series: Observation[]; excluded: Set<string> }[]> {
  const desks = await PortfolioModel.findAll({
    where: { entityId: entity.id, level: "desk" },
    order: [["code", "ASC"]],
    transaction,
  });
  const out = [];
  const exclusions = await approvedExclusions(
    desks.map((d) => d.id),
    { transaction },
  );
  for (const portfolio of desks) {
    // MAR32.5(2): a desk's unreported business day counts as an exception. A figure on a date
    // reads only the days its windows reach (250, docs/rules.md), whatever the desk's history.
    const raw =
      to === undefined
        ? await loadSeries(portfolio.id, entity.regime, undefined, undefined, transaction)
        : await loadSeriesTail(portfolio.id, entity.regime, to, STARTING_POINT_OBSERVATIONS);
    out.push({
      portfolio,
      series: withMissingBusinessDays(raw, holidays as Set<string>),
      excluded: exclusions.get(portfolio.id) ?? new Set<string>(),
    });
  }
  return out;
}

/**
 * Recomputes and stores each desk's status at each of the entity's determinations, inside the
 * writing transaction that refreshes the determinations. Entities under another rule set keep none.
 */
export async function refreshDeskStatuses(
  entity: EntityModel,
  points: readonly Point[],
  holidays: ReadonlySet<string>,
  transaction: Transaction,
  signedOff: readonly { figuresJson: string }[] = [],
): Promise<void> {
  await FrtbDeskStatusModel.destroy({ where: { entityId: entity.id }, transaction });
  if (entity.regime !== "frtb" || points.length === 0) return;
  const desks = await deskSeries(entity, holidays, undefined, transaction);
  if (desks.length === 0) return;
  const history = deskStatusHistory(
    desks.map((d) => ({ code: d.portfolio.code, series: d.series, excluded: d.excluded })),
    points.map((p) => p.asOf),
    frozenStandings(signedOff),
  );
  const idOf = new Map(desks.map((d) => [d.portfolio.code, d.portfolio.id]));
  const rows = history.flatMap((h, i) =>
    h.desks.map((s) => ({
      entityId: entity.id,
      portfolioId: idOf.get(s.code) as number,
      periodEnd: points[i].periodEnd,
      asOf: points[i].asOf,
      effectiveFrom: points[i].effectiveFrom,
      status: s.status,
      reason: s.reason.slice(0, 300),
      backtest99: s.backtest99,
      backtest975: s.backtest975,
      backtestPasses: s.backtestPasses,
      plaZone: s.plaZone,
      plaObservations: s.plaObservations,
      spearman: s.spearman,
      ks: s.ks,
    })),
  );
  if (rows.length) await FrtbDeskStatusModel.bulkCreate(rows, { transaction });
}

/**
 * The desk statuses a signed-off quarter froze in its figures (by as-of date, then desk code):
 * a signed-off determination's statuses never change, and the next one starts from them.
 */
function frozenStandings(signedOff: readonly { figuresJson: string }[]): Map<string, Map<string, DeskStanding>> {
  const out = new Map<string, Map<string, DeskStanding>>();
  for (const s of signedOff) {
    const parsed = snapshotFiguresSchema.safeParse(JSON.parse(s.figuresJson));
    const f = parsed.success ? parsed.data : null;
    if (!f?.frtb) continue;
    out.set(
      f.asOf,
      new Map(
        f.frtb.desks.map((d) => [
          d.code,
          {
            code: d.code,
            status: d.status,
            reason: d.reason,
            backtest99: d.backtest99,
            backtest975: d.backtest975,
            backtestPasses: d.backtest99 <= DESK_LIMITS.var99 && d.backtest975 <= DESK_LIMITS.var975,
            plaZone: d.plaZone,
            plaProvisional: d.plaZone === null,
            plaObservations: d.plaObservations,
            spearman: null,
            ks: null,
          },
        ]),
      ),
    );
  }
  return out;
}

/** The stored statuses, one point per determination, oldest first. */
export async function deskStatusTimeline(entityId: number): Promise<FrtbStatusPoint[]> {
  const rows = await FrtbDeskStatusModel.findAll({
    where: { entityId },
    order: [
      ["periodEnd", "ASC"],
      ["portfolioId", "ASC"],
    ],
  });
  const codes = new Map(
    (await PortfolioModel.findAll({ where: { entityId, level: "desk" } })).map((p) => [p.id, p.code]),
  );
  const points = new Map<string, FrtbStatusPoint>();
  for (const r of rows) {
    const point = points.get(r.periodEnd) ?? {
      quarterEnd: r.periodEnd,
      asOf: r.asOf,
      effectiveFrom: r.effectiveFrom,
      desks: [],
    };
    point.desks.push({
      code: codes.get(r.portfolioId) ?? String(r.portfolioId),
      status: r.status,
      backtest99: r.backtest99,
      backtest975: r.backtest975,
      plaZone: r.plaZone,
      plaObservations: r.plaObservations,
      reason: r.reason,
    });
    points.set(r.periodEnd, point);
  }
  for (const p of points.values()) p.desks.sort((a, b) => a.code.localeCompare(b.code));
  return [...points.values()];
}

/**
 * The MAR33 aggregation on `date` with m_c = `multiplier`. The desks' statuses are those of the
 * determination named by `statusQuarterEnd` (null: before the first, every desk in the model).
 */
export async function frtbFiguresOn(
  entity: EntityModel,
  top: readonly Observation[],
  date: string,
  multiplier: number,
  statusQuarterEnd: string | null,
  holidays: ReadonlySet<string>,
): Promise<FrtbFigures> {
  const desks = await deskSeries(entity, holidays, date);
  const stored = statusQuarterEnd
    ? await FrtbDeskStatusModel.findAll({ where: { entityId: entity.id, periodEnd: statusQuarterEnd } })
    : [];
  const byDesk = new Map(stored.map((s) => [s.portfolioId, s]));
  const notes: string[] = [];
  const standing = desks
    .filter((d) => d.series.length > 0)
    .map((d) => {
      const s = byDesk.get(d.portfolio.id);
      if (s)
        return {
          code: d.portfolio.code,
          status: s.status as DeskStatus,
          backtest99: s.backtest99,
          backtest975: s.backtest975,
          plaZone: s.plaZone,
          plaObservations: s.plaObservations,
          reason: s.reason,
          series: d.series,
        };
      // No determination has assessed this desk yet: it is taken as in the model, with today's counts.
      const live = deskStandingAt(d.portfolio.code, d.series, date, null, d.excluded);
      notes.push(`${d.portfolio.code} has not been through a determination yet: it is taken as in the model.`);
      return { ...live, status: "in-model" as DeskStatus, series: d.series };
    });
  const inputs: FrtbDeskInput[] = standing.map((d) => ({ code: d.code, status: d.status, series: d.series }));
  // The bank-wide backtest should run on the desks in the model: say what the top of house covers.
  const scope = topScopeNote(topOfHouseScope(top, inputs, date, statusQuarterEnd ?? ""));
  if (scope) notes.push(scope);
  const r = frtbAggregation(top, inputs, date, multiplier);
  const saOf = new Map(r.desks.map((d) => [d.code, d.sa]));
  return {
    statusQuarterEnd,
    multiplier: r.multiplier,
    imccPrev: cents(r.imccPrev),
    imccAvg: cents(r.imccAvg),
    sesPrev: cents(r.sesPrev),
    sesAvg: cents(r.sesAvg),
    binding: r.binding,
    ca: cents(r.ca),
    drc: cents(r.drc),
    imaGA: cents(r.imaGA),
    cU: cents(r.cU),
    saAll: cents(r.saAll),
    saGA: cents(r.saGA),
    saAmber: cents(r.saAmber),
    k: Math.round(r.k * 1e6) / 1e6,
    surcharge: cents(r.surcharge),
    acrTotal: cents(r.acrTotal),
    sources: r.sources,
    desks: standing.map((d) => ({
      code: d.code,
      status: d.status,
      backtest99: d.backtest99,
      backtest975: d.backtest975,
      plaZone: d.plaZone,
      plaObservations: d.plaObservations,
      reason: d.reason,
      sa: centsOrNull(saOf.get(d.code)),
    })),
    notes: [...notes, ...r.notes],
  };
}
