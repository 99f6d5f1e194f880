import { Op, QueryTypes } from "sequelize";
import { sequelize } from "../../db/sequelize";
import { entityByCode } from "../../kit/lookups";
import { AppError } from "../../errors";
import { SupervisorySettingsModel } from "../../models/supervisory-settings";
import { toDated } from "../settings/settings.read";
import { EntityModel } from "../../models/entity";
import { capitalInputsAt } from "../../../shared/backtest/capital";
import {
  capitalUnder,
  determinationCounting,
  indicativeAt,
  multipliersFor,
  settingsInForce,
  settingsOn,
} from "../../../shared/backtest/determination";
import { zoneLabel, type Zone } from "../../../shared/backtest/types";
import type { RegimeId } from "../../../shared/schemas/common";
import type { InForceToday } from "../../../shared/schemas/backtest";
import { addBusinessDays } from "../../../shared/backtest/calendar";
import { EngineInputError } from "../../../shared/backtest/errors";
import type { CapitalOnDate, DeterminationDto } from "../../../shared/schemas/determination";
import type { SessionUser } from "../../../shared/schemas/auth";
import { determinationInForce, storedDeterminations, toDeterminationDto } from "./determinations.store";
import { holidaysOf, loadStartingPoint } from "../figures/engine-inputs";
import { storedStart } from "../figures/stored-figures";
import { deskStatusTimeline, frtbFiguresOn } from "../frtb/frtb.store";

const cents = (v: number) => Math.round(v * 100) / 100;
const today = () => new Date().toISOString().slice(0, 10);

/**
 * The entity's determinations, oldest first, as stored on write. Treasury reads signed-off
 * figures only, so it sees the approved and filed ones.
 */
export async function listDeterminations(code: string, viewer: SessionUser): Promise<DeterminationDto[]> {
  const entity = await entityByCode(code);
  const rows = (await storedDeterminations(entity.id)).map((d) => toDeterminationDto(d, entity.regime));
  return viewer.role === "treasury" ? rows.filter((d) => d.status !== "provisional") : rows;
}

/**
 * The determination in force on `date` for each of these entities (two indexed reads, whatever the
 * history): its plus factor with the addends and floor of the settings record in force that day,
 * as capital on that date uses them.
 */
export async function inForceOnDate(
  entities: readonly { id: number; regime: RegimeId }[],
  date: string = today(),
): Promise<Map<number, InForceToday>> {
  const out = new Map<number, InForceToday>();
  if (entities.length === 0) return out;
  const ids = entities.map((e) => e.id);
  const [rows, records] = await Promise.all([
    sequelize.query<{
      entity_id: number;
      period_end: string;
      effective_from: string;
      counted: number;
      zone: Zone;
      plus_factor: string;
      multiplier: string;
      status: InForceToday["status"];
    }>(
      `SELECT d.entity_id, DATE_FORMAT(d.period_end, '%Y-%m-%d') AS period_end,
              DATE_FORMAT(d.effective_from, '%Y-%m-%d') AS effective_from, d.counted, d.zone, d.plus_factor,
              d.multiplier, d.status
         FROM determinations d
         JOIN (SELECT entity_id, MAX(effective_from) AS f FROM determinations
                WHERE entity_id IN (:ids) AND effective_from <= :date GROUP BY entity_id) m
           ON m.entity_id = d.entity_id AND m.f = d.effective_from`,
      { replacements: { ids, date }, type: QueryTypes.SELECT },
    ),
    SupervisorySettingsModel.findAll({
      where: { entityId: ids, status: "approved", effectiveFrom: { [Op.lte]: date } },
      order: [
        ["effectiveFrom", "ASC"],
        ["decidedAt", "ASC"],
        ["id", "ASC"],
      ],
    }),
  ]);
  const regimeOf = new Map(entities.map((e) => [e.id, e.regime]));
  for (const r of rows) {
    const entityId = Number(r.entity_id);
    const regime = regimeOf.get(entityId)!;
    const settings = settingsOn(records.filter((s) => s.entityId === entityId).map(toDated), date);
    const plusFactor = Number(r.plus_factor);
    out.set(entityId, {
      quarterEnd: r.period_end,
      effectiveFrom: r.effective_from,
      counted: Number(r.counted),
      zone: r.zone,
      zoneLabel: zoneLabel(r.zone, regime),
      plusFactor,
      multiplier: settings
        ? multipliersFor(Number(r.counted), regime, settings, 250, plusFactor).multiplier
        : Number(r.multiplier),
      status: r.status,
    });
  }
  return out;
}

/** The latest signed-off determination of an entity, or null (treasury's starting point). */
export async function latestApprovedDetermination(entity: EntityModel): Promise<DeterminationDto | null> {
  const rows = (await storedDeterminations(entity.id)).filter((d) => d.status !== "provisional");
  const last = rows[rows.length - 1];
  return last ? toDeterminationDto(last, entity.regime) : null;
}

/**
 * Capital on a date: the multiplier in force that day (the plus factor of the last determination
 * in force, with the settings in force that day), beside the indicative figures of the rolling
 * count as if determined that day.
 */
export async function capitalOnDate(code: string, query: { date?: string }): Promise<CapitalOnDate> {
  const entity = await entityByCode(code);
  const date = query.date ?? today();
  // The rows it needs, whatever the history: the 250 days up to the date and the determination in
  // force. On or after the latest day they are the starting point stored with the headline book
  // (refreshed by every write that changes it); an earlier date reads its own 250 days.
  const [{ portfolio, start: latest }, stored] = await Promise.all([
    storedStart(entity),
    determinationInForce(entity, date),
  ]);
  const start =
    !portfolio || !latest ? null : date >= latest.asOf ? latest : await loadStartingPoint(entity, portfolio.id, date);
  if (!start) {
    throw new AppError(
      404,
      "no_data",
      `${code} has no daily data on or before ${date}. An analyst uploads it under Data.`,
    );
  }
  const inputs = { series: start.series, options: start.options };
  const settings = settingsInForce(inputs.options, date);
  const det = stored;

  const indicative = indicativeAt(inputs.series, date, inputs.options);
  // The plus factor is the determination's; addends and floor are those in force on the date.
  const inForce = det
    ? {
        quarterEnd: det.quarterEnd,
        asOf: det.asOf,
        effectiveFrom: det.effectiveFrom,
        effectiveTo: det.effectiveTo,
        counted: det.counted,
        zone: det.zone,
        zoneLabel: det.zoneLabel,
        status: det.status,
        snapshotId: det.snapshotId,
        ...multipliersFor(det.counted, entity.regime, settings, 250, det.plusFactor),
      }
    : null;

  let requirement: number | null = null;
  let addOn: number | null = null;
  let indicativeRequirement: number | null = null;
  let capitalNote: string | null = null;
  try {
    const capitalInputs = capitalInputsAt(inputs.series, entity.regime, date);
    indicativeRequirement = cents(
      capitalUnder(capitalInputs, entity.regime, indicative.plusFactor, settings).requirement,
    );
    if (inForce) {
      const c = capitalUnder(capitalInputs, entity.regime, inForce.plusFactor, settings);
      requirement = cents(c.requirement);
      addOn = cents(c.addOn);
    } else {
      capitalNote = `No determination is in force on ${date} yet: the first follows the first quarter end with data.`;
    }
  } catch (err) {
    if (!(err instanceof EngineInputError)) throw err;
    capitalNote = `No capital figure: ${err.message}`;
  }
  let frtb: CapitalOnDate["frtb"] = null;
  let frtbNote: string | null = null;
  let frtbTimeline: CapitalOnDate["frtbTimeline"];
  if (entity.regime === "frtb") {
    // MAR33.41–33.45: the desks' statuses and m_c are those of the determination in force on the date.
    try {
      frtb = await frtbFiguresOn(
        entity,
        inputs.series,
        date,
        (inForce ?? indicative).multiplier,
        inForce?.quarterEnd ?? null,
        // The desks' own series run over their whole history: the whole calendar.
        await holidaysOf(entity.id),
      );
    } catch (err) {
      if (!(err instanceof EngineInputError)) throw err;
      frtbNote = `No aggregate capital requirement: ${err.message}`;
    }
    frtbTimeline = await deskStatusTimeline(entity.id);
  }
  return {
    entity: entity.code,
    currency: entity.currency,
    date,
    inForce,
    indicative,
    requirement,
    addOn,
    indicativeRequirement,
    capitalNote,
    nextDetermination: bitesFrom(addBusinessDays(date, 1, inputs.options.holidays), inputs.options, date),
    settings,
    ...(entity.regime === "frtb" ? { frtb, frtbNote, frtbTimeline } : {}),
  };
}

/** The determination that first counts an exception on `day` (the frequency in force on `asOf`). */
export function bitesFrom(
  day: string,
  options: Parameters<typeof settingsInForce>[0] & { holidays: ReadonlySet<string> },
  asOf: string,
) {
  const p = determinationCounting(day, settingsInForce(options, asOf).determinationFrequency, options.holidays);
  return { quarterEnd: p.periodEnd, asOf: p.asOf, effectiveFrom: p.effectiveFrom };
}
