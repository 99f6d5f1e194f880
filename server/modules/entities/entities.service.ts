import { Op, UniqueConstraintError, type Transaction } from "sequelize";
import { refreshEntityFigures } from "../figures/stored-figures";
import { refreshFindings } from "../findings/findings.service";
import { EntityModel } from "../../models/entity";
import { PortfolioModel } from "../../models/portfolio";
import { HolidayModel } from "../../models/holiday";
import { RegulatorAssignmentModel } from "../../models/regulator-assignment";
import { AppError, ConflictError, NotFoundError } from "../../errors";
import { createInitialSettings, hasGovernedSettings } from "../settings/settings.service";
import { recordAudit } from "../audit/audit.service";
import { sequelize } from "../../db/sequelize";
import { getRegime } from "../../../shared/backtest/regimes";
import type { SignedIn } from "../../kit/actor";
import type { SessionUser } from "../../../shared/schemas/auth";
import { defaultCountryOf } from "../../../shared/schemas/entity";
import type {
  CreateEntityBody,
  CreateHolidayBody,
  CreatePortfolioBody,
  Entity,
  Holiday,
  HolidayImportBody,
  HolidayImportPreview,
  Portfolio,
  UpdateEntityBody,
} from "../../../shared/schemas/entity";
import { checkVersion, StaleError } from "../../kit/stale";
import { entityByCode, lockedRow } from "../../kit/lookups";
import { countryName, publicHolidays } from "./holiday-library";
import type { CalendarCountry } from "../../../shared/schemas/entity";

export function toEntity(row: EntityModel): Entity {
  return {
    code: row.code,
    name: row.name,
    regime: row.regime,
    pnlBasis: row.pnlBasis,
    currency: row.currency,
    country: row.country,
    qualitativeAddend: row.qualitativeAddend,
    supervisorName: row.supervisorName,
    supervisorEmails: row.supervisorEmails,
    version: row.version,
  };
}

const toPortfolio = (row: PortfolioModel): Portfolio => ({ code: row.code, name: row.name, level: row.level });
const toHoliday = (row: HolidayModel): Holiday => ({ date: row.date, name: row.name, source: row.source });

/** The entity by code, or 404. Regulators only find the entities assigned to them. */
export async function findEntity(code: string, viewer?: SessionUser): Promise<EntityModel> {
  const row = await entityByCode(code);
  if (viewer?.role === "regulator") {
    const assigned = await RegulatorAssignmentModel.findOne({ where: { userId: viewer.id, entityId: row.id } });
    if (!assigned) throw new NotFoundError(`No entity with code ${code}.`);
  }
  return row;
}

export async function listEntities(viewer: SessionUser): Promise<Entity[]> {
  if (viewer.role === "regulator") {
    const assignments = await RegulatorAssignmentModel.findAll({
      where: { userId: viewer.id },
      include: [{ model: EntityModel, as: "entity" }],
    });
    return assignments
      .map((a) => (a as unknown as { entity: EntityModel }).entity)
      .sort((a, b) => a.code.localeCompare(b.code))
      .map(toEntity);
  }
  const rows = await EntityModel.findAll({ order: [["code", "ASC"]] });
  return rows.map(toEntity);
}

export async function createEntity(input: CreateEntityBody, actor: SignedIn): Promise<Entity> {
  try {
    return await sequelize.transaction(async (transaction) => {
      const row = await EntityModel.create(
        {
          code: input.code,
          name: input.name,
          regime: input.regime,
          // Each rule set has its own default basis for counting exceptions (docs/rules.md#pnl-basis).
          pnlBasis: input.pnlBasis ?? getRegime(input.regime).defaultPnlBasis,
          currency: input.currency,
          // The schema refuses a currency without a country of its own (EUR) unless one is named.
          country: input.country ?? defaultCountryOf(input.currency),
          qualitativeAddend: input.qualitativeAddend ?? 0,
          supervisorName: input.supervisorName ?? null,
          supervisorEmails: input.supervisorEmails ?? [],
        },
        { transaction },
      );
      // The P&L basis and the addend become the entity's first governed settings record.
      await createInitialSettings(row, transaction);
      const entity = toEntity(row);
      await recordAudit(actor, "entity.create", entity.code, { after: entity }, transaction);
      return entity;
    });
  } catch (err) {
    if (err instanceof UniqueConstraintError)
      throw new ConflictError(`An entity with the code ${input.code} already exists.`);
    throw err;
  }
}

export async function updateEntity(code: string, change: UpdateEntityBody, actor: SignedIn): Promise<Entity> {
  const found = await EntityModel.findOne({ where: { code }, attributes: ["id"] });
  if (!found) throw new NotFoundError(`No entity with code ${code}.`);
  return sequelize.transaction(async (transaction) => {
    // Portfolios before the entity, the order every writer and sign-off takes them.
    await lockEntityPortfolios(found.id, transaction);
    const row = await entityByCode(code, { transaction, lock: true });
    await checkVersion(row.version, change.version, () => ({
      message: `Someone else changed ${code} since you opened it (now version ${row.version}). Reload and apply your change again.`,
      current: toEntity(row),
    }));
    const before = toEntity(row);
    const governed =
      (change.pnlBasis !== undefined && change.pnlBasis !== row.pnlBasis) ||
      (change.qualitativeAddend !== undefined && change.qualitativeAddend !== row.qualitativeAddend);
    if (governed && (await hasGovernedSettings(row.id, transaction))) {
      throw new AppError(
        422,
        "settings_governed",
        `The P&L basis and the qualitative addend of ${code} are supervisory settings: an admin proposes a change with the supervisor's decision reference and its effective date under Admin › Supervisory settings, and a CRO approves it.`,
        { fields: { pnlBasis: "Governed setting", qualitativeAddend: "Governed setting" } },
      );
    }
    row.version = row.version + 1;
    if (change.name !== undefined) row.name = change.name;
    if (change.regime !== undefined) row.regime = change.regime;
    if (change.pnlBasis !== undefined) row.pnlBasis = change.pnlBasis;
    if (change.currency !== undefined) row.currency = change.currency;
    // The calendar's rows move only with an import (importLibraryHolidays), which states how many days change.
    if (change.country !== undefined) row.country = change.country;
    if (change.qualitativeAddend !== undefined) row.qualitativeAddend = change.qualitativeAddend;
    if (change.supervisorName !== undefined) row.supervisorName = change.supervisorName;
    if (change.supervisorEmails !== undefined) row.supervisorEmails = change.supervisorEmails;
    await row.save({ transaction });
    const entity = toEntity(row);
    await recordAudit(actor, "entity.update", code, { before, after: entity }, transaction);
    await refreshEntityFigures([row.id], transaction); // rule set, P&L basis, addend and names feed the figures
    return entity;
  });
}

export async function listPortfolios(code: string, viewer: SessionUser): Promise<Portfolio[]> {
  const entity = await findEntity(code, viewer);
  // ENUM order: top (1) before desk (2).
  const rows = await PortfolioModel.findAll({
    where: { entityId: entity.id },
    order: [
      ["level", "ASC"],
      ["code", "ASC"],
    ],
  });
  return rows.map(toPortfolio);
}

export async function createPortfolio(code: string, input: CreatePortfolioBody, actor: SignedIn): Promise<Portfolio> {
  const entity = await findEntity(code);
  if (await PortfolioModel.findOne({ where: { code: input.code } })) {
    throw new ConflictError(`A portfolio with the code ${input.code} already exists.`);
  }
  return sequelize.transaction(async (transaction) => {
    const row = await PortfolioModel.create(
      { entityId: entity.id, code: input.code, name: input.name, level: input.level },
      { transaction },
    );
    const portfolio = toPortfolio(row);
    await recordAudit(actor, "portfolio.create", `${code}/${portfolio.code}`, { after: portfolio }, transaction);
    await refreshEntityFigures([entity.id], transaction); // a new top book may become the headline
    return portfolio;
  });
}

export async function renamePortfolio(
  code: string,
  portfolioCode: string,
  name: string,
  actor: SignedIn,
): Promise<Portfolio> {
  const entity = await findEntity(code);
  return sequelize.transaction(async (transaction) => {
    await lockEntityPortfolios(entity.id, transaction);
    const row = await lockedRow(
      PortfolioModel,
      { entityId: entity.id, code: portfolioCode },
      transaction,
      `No portfolio ${portfolioCode} in entity ${code}.`,
    );
    const before = toPortfolio(row);
    row.name = name;
    await row.save({ transaction });
    const portfolio = toPortfolio(row);
    await recordAudit(actor, "portfolio.update", `${code}/${portfolioCode}`, { before, after: portfolio }, transaction);
    await refreshEntityFigures([entity.id], transaction); // the stored figures carry the name
    return portfolio;
  });
}

/** Locks the entity's portfolios in id order: calendar changes and upload commits take turns. */
async function lockEntityPortfolios(entityId: number, transaction: Transaction): Promise<number[]> {
  const rows = await PortfolioModel.findAll({
    where: { entityId },
    order: [["id", "ASC"]],
    transaction,
    lock: transaction.LOCK.UPDATE,
  });
  return rows.map((p) => p.id);
}

export async function listHolidays(code: string, viewer: SessionUser): Promise<Holiday[]> {
  const entity = await findEntity(code, viewer);
  const rows = await HolidayModel.findAll({ where: { entityId: entity.id }, order: [["date", "ASC"]] });
  return rows.map(toHoliday);
}

export async function addHoliday(code: string, input: CreateHolidayBody, actor: SignedIn): Promise<Holiday> {
  const entity = await findEntity(code);
  const weekday = new Date(`${input.date}T00:00:00Z`).getUTCDay();
  if (weekday === 0 || weekday === 6) {
    // Business days are weekdays minus holidays: a weekend day is never a business day to begin with.
    const day = weekday === 0 ? "Sunday" : "Saturday";
    throw new AppError(422, "weekend_holiday", `${input.date} is a ${day}; only a weekday can be added as a holiday.`);
  }
  if (await HolidayModel.findOne({ where: { entityId: entity.id, date: input.date } })) {
    throw new ConflictError(`${input.date} is already a holiday in the ${code} calendar.`);
  }
  return sequelize.transaction(async (transaction) => {
    const portfolioIds = await lockEntityPortfolios(entity.id, transaction);
    const row = await HolidayModel.create(
      { entityId: entity.id, date: input.date, name: input.name, source: "bank" },
      { transaction },
    );
    const holiday = toHoliday(row);
    await recordAudit(actor, "holiday.create", `${code}/${holiday.date}`, { after: holiday }, transaction);
    await refreshFindings(portfolioIds, { transaction }); // a missing day may now be a holiday
    await refreshEntityFigures([entity.id], transaction); // roll-offs, forecasts and FRTB windows follow the calendar
    return holiday;
  });
}

export async function removeHoliday(code: string, date: string, actor: SignedIn): Promise<void> {
  const entity = await findEntity(code);
  const row = await HolidayModel.findOne({ where: { entityId: entity.id, date } });
  if (!row) throw new NotFoundError(`${date} is not a holiday in the ${code} calendar.`);
  await sequelize.transaction(async (transaction) => {
    const portfolioIds = await lockEntityPortfolios(entity.id, transaction);
    await row.destroy({ transaction });
    await recordAudit(actor, "holiday.delete", `${code}/${date}`, { before: toHoliday(row) }, transaction);
    await refreshFindings(portfolioIds, { transaction }); // the day is a business day again: data may be missing
    await refreshEntityFigures([entity.id], transaction);
  });
}

/**
 * The year's public holidays from the library (holiday-library.ts) set against the entity's calendar: the days an
 * import adds, the imported days it removes (no longer listed, or another country's), the names it corrects, and
 * the library days the bank already keeps as its own (left as they are). Bank days are never touched.
 */
async function planImport(entity: EntityModel, year: number, transaction?: Transaction): Promise<HolidayImportPreview> {
  if (!entity.country) {
    throw new AppError(
      422,
      "no_country",
      `${entity.code} has no country for its calendar yet: choose one on the entity form, then import its public holidays.`,
      { fields: { country: "Choose the country whose public holidays the entity keeps" } },
    );
  }
  const library = publicHolidays(entity.country as CalendarCountry, year);
  const rows = await HolidayModel.findAll({
    where: { entityId: entity.id, date: { [Op.between]: [`${year}-01-01`, `${year}-12-31`] } },
    order: [["date", "ASC"]],
    transaction,
    ...(transaction ? { lock: transaction.LOCK.UPDATE } : {}),
  });
  const byDate = new Map(rows.map((r) => [r.date, r]));
  const listed = new Set(library.map((h) => h.date));
  const add = library.filter((h) => !byDate.has(h.date));
  const rename = library.filter((h) => byDate.get(h.date)?.source === "library" && byDate.get(h.date)!.name !== h.name);
  const alreadyBank = library.filter((h) => byDate.get(h.date)?.source === "bank");
  const remove = rows
    .filter((r) => r.source === "library" && !listed.has(r.date))
    .map((r) => ({ date: r.date, name: r.name }));
  return {
    year,
    country: entity.country,
    countryName: countryName(entity.country),
    add,
    remove,
    rename,
    alreadyBank,
    changes: add.length + remove.length,
  };
}

export async function previewHolidayImport(code: string, year: number): Promise<HolidayImportPreview> {
  return planImport(await findEntity(code), year);
}

/**
 * Imports the year's public holidays as "library" rows, in one transaction with the refresh of findings and stored
 * figures (as adding a holiday by hand does). The admin confirmed a number of changing days: when the calendar
 * now gives another number (someone else imported or edited it), nothing is written and the answer is 409 with
 * the plan as it now stands.
 */
export async function importLibraryHolidays(
  code: string,
  input: HolidayImportBody,
  actor: SignedIn,
): Promise<HolidayImportPreview> {
  const found = await findEntity(code);
  return sequelize.transaction(async (transaction) => {
    const portfolioIds = await lockEntityPortfolios(found.id, transaction);
    const entity = await entityByCode(code, { transaction, lock: true });
    const plan = await planImport(entity, input.year, transaction);
    if (plan.changes !== input.changes) {
      throw new StaleError(
        `The ${code} calendar for ${input.year} changed since you looked: the import now changes ${plan.changes} days, not ${input.changes}. Read the new figures and confirm again.`,
        plan,
      );
    }
    if (plan.remove.length > 0) {
      await HolidayModel.destroy({
        where: { entityId: entity.id, source: "library", date: plan.remove.map((h) => h.date) },
        transaction,
      });
    }
    if (plan.add.length > 0) {
      await HolidayModel.bulkCreate(
        plan.add.map((h) => ({ entityId: entity.id, date: h.date, name: h.name, source: "library" as const })),
        { transaction },
      );
    }
    for (const h of plan.rename) {
      await HolidayModel.update({ name: h.name }, { where: { entityId: entity.id, date: h.date }, transaction });
    }
    await recordAudit(
      actor,
      "holiday.import",
      `${code}/${input.year}`,
      { before: { removed: plan.remove }, after: { country: plan.country, added: plan.add, renamed: plan.rename } },
      transaction,
    );
    if (plan.changes > 0) {
      await refreshFindings(portfolioIds, { transaction }); // a missing day may now be a holiday, or no longer
      await refreshEntityFigures([entity.id], transaction); // windows, roll-offs and forecasts follow the calendar
    }
    return plan;
  });
}
