import { Op, type Transaction } from "sequelize";
import { EntityModel } from "../../models/entity";
import { PortfolioModel } from "../../models/portfolio";
import { HolidayModel } from "../../models/holiday";
import { ExceptionReviewModel } from "../../models/exception-review";
import { SnapshotModel } from "../../models/snapshot";
import { DeterminationModel, type DeterminationStatus } from "../../models/determination";
import { loadSeries } from "../observations/observations.repository";
import { approvedSettings, fallbackSettings } from "../settings/settings.read";
import {
  determinationPoint,
  determinationsFor,
  withSpans,
  type DatedSettings,
  type Determination,
  type DeterminationOptions,
} from "../../../shared/backtest/determination";
import { getRegime } from "../../../shared/backtest/regimes";
import { zoneLabel, type Observation } from "../../../shared/backtest/types";
import { withMissingBusinessDays } from "../../../shared/backtest/window";
import { snapshotFiguresSchema } from "../../../shared/schemas/snapshot";
import { refreshDeskStatuses } from "../frtb/frtb.store";
import type { DeterminationDto } from "../../../shared/schemas/determination";

/** What the engine needs to determine an entity's multiplier: the top portfolio's data and the entity's rules. */
export interface EntityEngineInputs {
  entity: EntityModel;
  portfolio: PortfolioModel | null;
  series: Observation[];
  options: DeterminationOptions;
}

/** Reads inside `transaction` when given, so a write sees its own rows. */
export async function loadEntityEngineInputs(
  entity: EntityModel,
  transaction?: Transaction,
): Promise<EntityEngineInputs> {
  const portfolio = await PortfolioModel.findOne({
    where: { entityId: entity.id, level: "top" },
    order: [["code", "ASC"]],
    transaction,
  });
  const [holidays, settings] = await Promise.all([
    HolidayModel.findAll({ where: { entityId: entity.id }, attributes: ["date"], transaction }),
    approvedSettings(entity.id, transaction),
  ]);
  const holidaySet = new Set(holidays.map((h) => h.date));
  let series: Observation[] = [];
  let excluded: string[] = [];
  if (portfolio) {
    const [raw, approved] = await Promise.all([
      loadSeries(portfolio.id, entity.regime, undefined, undefined, transaction),
      ExceptionReviewModel.findAll({
        where: { portfolioId: portfolio.id, exclusionStatus: "approved" },
        attributes: ["businessDate"],
        transaction,
      }),
    ]);
    // FRTB: a business day never reported counts as an exception (MAR32.5(2)).
    series = getRegime(entity.regime).missingCountsAsException ? withMissingBusinessDays(raw, holidaySet) : raw;
    excluded = approved.map((r) => r.businessDate);
  }
  return {
    entity,
    portfolio,
    series,
    options: {
      regime: entity.regime,
      holidays: holidaySet,
      excludedDates: new Set(excluded),
      settings,
      fallback: fallbackSettings(entity),
    },
  };
}

type Row = Omit<Determination, "effectiveTo"> & {
  status: DeterminationStatus;
  snapshotId: number | null;
};

/** A signed-off snapshot's determination: its own figures, frozen with it. */
function frozenFromSnapshot(
  snapshot: SnapshotModel,
  entity: EntityModel,
  holidays: ReadonlySet<string>,
  stored: DeterminationModel | undefined,
  fallback: DatedSettings,
): Row {
  const status: DeterminationStatus = snapshot.status === "filed" ? "filed" : "approved";
  if (stored && stored.snapshotId === snapshot.id && stored.status !== "provisional") {
    return { ...fromStored(stored), status };
  }
  const f = snapshotFiguresSchema.parse(JSON.parse(snapshot.figuresJson));
  const point = determinationPoint(snapshot.quarterEnd, holidays);
  const settings: DatedSettings = f.settings ?? {
    ...fallback,
    pnlBasis: f.pnlBasis,
    qualitativeAddend: f.qualitativeAddend,
  };
  return {
    ...point,
    asOf: f.asOf,
    counted: f.exceptions.counted,
    actual: f.exceptions.actual,
    hypothetical: f.exceptions.hypothetical,
    zone: f.zone,
    zoneLabel: zoneLabel(f.zone, entity.regime),
    plusFactor: f.plusFactor,
    multiplier: f.multiplier,
    multiplierSvar: f.multiplierSvar ?? f.multiplier,
    windowStart: f.window.start,
    windowObservations: f.window.observations,
    windowComplete: f.window.complete,
    settings,
    status,
    snapshotId: snapshot.id,
  };
}

function fromStored(d: DeterminationModel): Row {
  return {
    periodEnd: d.periodEnd,
    asOf: d.asOf,
    effectiveFrom: d.effectiveFrom,
    counted: d.counted,
    actual: d.actual,
    hypothetical: d.hypothetical,
    zone: d.zone,
    zoneLabel: "",
    plusFactor: d.plusFactor,
    multiplier: d.multiplier,
    multiplierSvar: d.multiplierSvar,
    windowStart: d.windowStart,
    windowObservations: d.windowObservations,
    windowComplete: d.windowComplete,
    settings: JSON.parse(d.settingsJson) as DatedSettings,
    status: d.status,
    snapshotId: d.snapshotId,
  };
}

/**
 * Recomputes and stores an entity's determinations inside the writing transaction (upload commit,
 * exclusion decision, calendar change, settings approval, snapshot approval or filing), so no
 * reader sees a determination that disagrees with the data. The entity row is locked first (the
 * lock order is portfolios → entity → snapshot), so two writes of one entity take turns. A period
 * whose snapshot is signed off keeps the determination frozen with it; the others follow the data.
 */
export async function refreshDeterminations(entityId: number, transaction: Transaction): Promise<void> {
  const entity = await EntityModel.findByPk(entityId, { transaction, lock: transaction.LOCK.UPDATE });
  if (!entity) return;
  const inputs = await loadEntityEngineInputs(entity, transaction);
  const [stored, signedOff, open] = await Promise.all([
    DeterminationModel.findAll({ where: { entityId }, transaction }),
    // Oldest first: a quarter's signed-off amendment comes after (and stands instead of) what it amends.
    SnapshotModel.findAll({
      where: { entityId, status: { [Op.in]: ["approved", "filed"] } },
      order: [["id", "ASC"]],
      transaction,
    }),
    SnapshotModel.findAll({
      where: { entityId, status: { [Op.notIn]: ["approved", "filed"] } },
      attributes: ["id", "quarterEnd"],
      transaction,
    }),
  ]);
  const storedByPeriod = new Map(stored.map((d) => [d.periodEnd, d]));
  const openByPeriod = new Map(open.map((s) => [s.quarterEnd, s.id]));
  const rows = new Map<string, Row>();
  for (const d of determinationsFor(inputs.series, inputs.options)) {
    rows.set(d.periodEnd, { ...d, status: "provisional", snapshotId: openByPeriod.get(d.periodEnd) ?? null });
  }
  for (const s of signedOff) {
    rows.set(
      s.quarterEnd,
      frozenFromSnapshot(s, entity, inputs.options.holidays, storedByPeriod.get(s.quarterEnd), inputs.options.fallback),
    );
  }
  const ordered = withSpans([...rows.values()].sort((a, b) => (a.periodEnd < b.periodEnd ? -1 : 1)));
  // FRTB: each desk's status at each determination (docs/rules.md#frtb-eligibility), in the same transaction.
  await refreshDeskStatuses(entity, ordered, inputs.options.holidays, transaction, signedOff);

  const keep = new Set(ordered.map((d) => d.periodEnd));
  const gone = stored.filter((d) => !keep.has(d.periodEnd)).map((d) => d.id);
  if (gone.length) await DeterminationModel.destroy({ where: { id: gone }, transaction });
  if (ordered.length === 0) return;
  await DeterminationModel.bulkCreate(
    ordered.map((d) => ({
      entityId,
      periodEnd: d.periodEnd,
      ...copiedColumns(d),
      settingsId: d.settings.id,
      settingsJson: JSON.stringify(d.settings),
    })),
    { transaction, updateOnDuplicate: [...COPIED_COLUMNS, "settingsId", "settingsJson", "updatedAt"] },
  );
}

/** The columns a refresh takes from the engine's determination as they are, named alike on both sides. */
const COPIED_COLUMNS = [
  "asOf",
  "effectiveFrom",
  "effectiveTo",
  "counted",
  "actual",
  "hypothetical",
  "zone",
  "plusFactor",
  "multiplier",
  "multiplierSvar",
  "windowStart",
  "windowObservations",
  "windowComplete",
  "status",
  "snapshotId",
] as const;

type CopiedColumn = (typeof COPIED_COLUMNS)[number];

function copiedColumns<D extends Record<CopiedColumn, unknown>>(d: D): Pick<D, CopiedColumn> {
  return Object.fromEntries(COPIED_COLUMNS.map((column) => [column, d[column]])) as Pick<D, CopiedColumn>;
}

/** Refreshes every entity that owns one of these portfolios (an upload names portfolios). */
export async function refreshDeterminationsOfPortfolios(portfolioIds: number[], transaction: Transaction) {
  if (portfolioIds.length === 0) return;
  const rows = await PortfolioModel.findAll({
    where: { id: portfolioIds, level: "top" },
    attributes: ["entityId"],
    transaction,
  });
  const entityIds = [...new Set(rows.map((p) => p.entityId))].sort((a, b) => a - b);
  for (const id of entityIds) await refreshDeterminations(id, transaction);
}

export function toDeterminationDto(d: DeterminationModel, regime: EntityModel["regime"]): DeterminationDto {
  const settings = JSON.parse(d.settingsJson) as DatedSettings;
  return {
    quarterEnd: d.periodEnd,
    asOf: d.asOf,
    effectiveFrom: d.effectiveFrom,
    effectiveTo: d.effectiveTo,
    counted: d.counted,
    actual: d.actual,
    hypothetical: d.hypothetical,
    zone: d.zone,
    zoneLabel: zoneLabel(d.zone, regime),
    plusFactor: d.plusFactor,
    multiplier: d.multiplier,
    multiplierSvar: d.multiplierSvar,
    windowComplete: d.windowComplete,
    status: d.status,
    snapshotId: d.snapshotId,
    settings,
  };
}

/** The entity's stored determinations, oldest first. */
export async function storedDeterminations(entityId: number, transaction?: Transaction) {
  return DeterminationModel.findAll({ where: { entityId }, order: [["periodEnd", "ASC"]], transaction });
}

/** The determination in force on a date (the last one effective on or before it), or null: one indexed row. */
export async function determinationInForce(entity: EntityModel, date: string): Promise<DeterminationDto | null> {
  const row = await DeterminationModel.findOne({
    where: { entityId: entity.id, effectiveFrom: { [Op.lte]: date } },
    order: [
      ["effectiveFrom", "DESC"],
      ["periodEnd", "DESC"],
    ],
  });
  return row ? toDeterminationDto(row, entity.regime) : null;
}

/**
 * The latest signed-off (approved or filed) determination of an entity, or with `asOf` the first
 * one counted on that day; null when there is none. One indexed row.
 */
export async function signedOffDetermination(entity: EntityModel, asOf?: string): Promise<DeterminationDto | null> {
  const row = await DeterminationModel.findOne({
    where: { entityId: entity.id, status: { [Op.ne]: "provisional" }, ...(asOf ? { asOf } : {}) },
    order: [["periodEnd", asOf ? "ASC" : "DESC"]],
  });
  return row ? toDeterminationDto(row, entity.regime) : null;
}
