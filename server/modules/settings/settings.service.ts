import { Op, type Transaction } from "sequelize";
import { sequelize } from "../../db/sequelize";
import { entityByCode } from "../../kit/lookups";
import { AppError, ConflictError, ForbiddenError, NotFoundError } from "../../errors";
import { EntityModel } from "../../models/entity";
import { SnapshotModel } from "../../models/snapshot";
import { SupervisorySettingsModel } from "../../models/supervisory-settings";
import { UserModel } from "../../models/user";
import { recordAudit } from "../audit/audit.service";
import { refreshEntityFigures } from "../figures/stored-figures";
import { lockEntityPortfolios } from "../../db/portfolio-locks";
import { approvedSettings, fallbackSettings, toDated } from "./settings.read";
import { settingsOn, type DatedSettings } from "../../../shared/backtest/determination";
import type { SignedIn } from "../../kit/actor";
import type { SettingsRecord } from "../../../shared/schemas/determination";
import type { proposeSettingsSchema, settingsDecisionSchema } from "../../../shared/schemas/determination";
import type { z } from "zod";

type ProposeBody = z.output<typeof proposeSettingsSchema>;
type DecisionBody = z.output<typeof settingsDecisionSchema>;

const today = () => new Date().toISOString().slice(0, 10);

/** 422 with the field the message is about, as a refused schema says it. */
const invalid = (message: string, fields: Record<string, string> = {}) =>
  new AppError(422, "validation_failed", message, { fields });

/** What a record sets (the values the audit log keeps before and after). */
const valuesOf = (s: DatedSettings) => ({
  effectiveFrom: s.effectiveFrom,
  reference: s.reference,
  pnlBasis: s.pnlBasis,
  qualitativeAddend: s.qualitativeAddend,
  qualitativeAddendSvar: s.qualitativeAddendSvar,
  multiplierFloor: s.multiplierFloor,
  determinationFrequency: s.determinationFrequency,
});

/**
 * The last day an approved quarter covers: a signed-off snapshot's figures never change, so no
 * settings record may take effect on or before its quarter end.
 */
async function lastSignedOffQuarter(entityId: number, transaction?: Transaction): Promise<string | null> {
  const s = await SnapshotModel.findOne({
    where: { entityId, status: { [Op.in]: ["approved", "filed"] } },
    order: [["quarterEnd", "DESC"]],
    attributes: ["quarterEnd"],
    transaction,
  });
  return s?.quarterEnd ?? null;
}

function refuseSignedOffPast(effectiveFrom: string, signedOff: string | null, code: string): void {
  if (signedOff && effectiveFrom <= signedOff) {
    throw invalid(
      `${code}'s quarter ending ${signedOff} is signed off and its figures never change, so a settings change can take effect from ${signedOff} + 1 day at the earliest.`,
      { effectiveFrom: `After ${signedOff}` },
    );
  }
}

async function toRecord(rows: SupervisorySettingsModel[], entity: EntityModel): Promise<SettingsRecord[]> {
  const ids = [...new Set(rows.flatMap((r) => [r.proposedBy, r.decidedBy]).filter((v): v is number => v !== null))];
  const people = new Map(
    (await UserModel.findAll({ where: { id: ids }, attributes: ["id", "email", "name"] })).map((u) => [u.id, u]),
  );
  const person = (id: number | null) => (id ? (people.get(id) ?? null) : null);
  const inForce = settingsOn(rows.filter((r) => r.status === "approved").map(toDated), today());
  return rows.map((r) => ({
    id: r.id,
    entity: entity.code,
    effectiveFrom: r.effectiveFrom,
    reference: r.reference,
    pnlBasis: r.pnlBasis,
    qualitativeAddend: r.qualitativeAddend,
    qualitativeAddendSvar: r.qualitativeAddendSvar,
    multiplierFloor: r.multiplierFloor,
    determinationFrequency: r.determinationFrequency,
    status: r.status,
    proposedBy: person(r.proposedBy)?.email ?? null,
    proposedByName: person(r.proposedBy)?.name ?? null,
    proposedAt: r.proposedAt?.toISOString() ?? null,
    decidedBy: person(r.decidedBy)?.email ?? null,
    decidedByName: person(r.decidedBy)?.name ?? null,
    decidedAt: r.decidedAt?.toISOString() ?? null,
    decisionComment: r.decisionComment,
    inForceToday: inForce?.id === r.id,
  }));
}

/** Every settings record of the entity, newest effective date first (proposed and rejected ones too). */
export async function listSettings(code: string): Promise<SettingsRecord[]> {
  const entity = await entityByCode(code);
  const rows = await SupervisorySettingsModel.findAll({
    where: { entityId: entity.id },
    order: [
      ["effectiveFrom", "DESC"],
      ["id", "DESC"],
    ],
  });
  return toRecord(rows, entity);
}

/**
 * An admin proposes a change with the supervisor's decision reference and the date it takes
 * effect. What the proposal leaves out stays as in force on that date. Nothing changes until a CRO
 * approves it.
 */
export async function proposeSettings(code: string, body: ProposeBody, actor: SignedIn): Promise<SettingsRecord> {
  return sequelize.transaction(async (transaction) => {
    const entity = await entityByCode(code, { transaction });
    if (body.qualitativeAddendSvar != null && entity.regime !== "eu") {
      throw invalid(
        "A separate stressed VaR addend is an EU CRR setting (Art. 366: m_c and m_s); this rule set applies one addend.",
        { qualitativeAddendSvar: "EU entities only" },
      );
    }
    refuseSignedOffPast(body.effectiveFrom, await lastSignedOffQuarter(entity.id, transaction), code);
    const current =
      settingsOn(await approvedSettings(entity.id, transaction), body.effectiveFrom) ?? fallbackSettings(entity);
    const next = {
      pnlBasis: body.pnlBasis ?? current.pnlBasis,
      qualitativeAddend: body.qualitativeAddend ?? current.qualitativeAddend,
      qualitativeAddendSvar:
        body.qualitativeAddendSvar === undefined ? current.qualitativeAddendSvar : body.qualitativeAddendSvar,
      multiplierFloor: body.multiplierFloor === undefined ? current.multiplierFloor : body.multiplierFloor,
      determinationFrequency: body.determinationFrequency ?? current.determinationFrequency,
    };
    const unchanged = (Object.keys(next) as (keyof typeof next)[]).every((k) => next[k] === current[k]);
    if (unchanged) {
      throw invalid(`The proposal changes nothing: these are the settings in force on ${body.effectiveFrom} already.`);
    }
    const row = await SupervisorySettingsModel.create(
      {
        entityId: entity.id,
        effectiveFrom: body.effectiveFrom,
        reference: body.reference,
        ...next,
        status: "proposed",
        proposedBy: actor.user.id,
        proposedAt: new Date(),
        decidedBy: null,
        decidedAt: null,
        decisionComment: null,
      },
      { transaction },
    );
    await recordAudit(
      actor,
      "settings.propose",
      `${code} settings #${row.id}`,
      { before: valuesOf(current), after: valuesOf(toDated(row)) },
      transaction,
    );
    return (await toRecord([row], entity))[0];
  });
}

async function lockProposal(id: number, transaction: Transaction) {
  const found = await SupervisorySettingsModel.findByPk(id, { transaction, attributes: ["id", "entityId"] });
  if (!found) throw new NotFoundError(`No settings record #${id}.`);
  // An approval changes what the engine is given: the entity's portfolios first (the lock order
  // portfolios → entity → the record), as every write that refreshes figures takes them.
  await lockEntityPortfolios(found.entityId, transaction);
  const row = await SupervisorySettingsModel.findByPk(id, { transaction, lock: transaction.LOCK.UPDATE });
  if (!row) throw new NotFoundError(`No settings record #${id}.`);
  if (row.status !== "proposed")
    throw new ConflictError(`Settings record #${id} is ${row.status}; only a proposed change can be decided.`);
  const entity = (await EntityModel.findByPk(row.entityId, { transaction }))!;
  return { row, entity };
}

/**
 * The CRO approves a proposed change (four eyes: never their own proposal). From its effective
 * date on, every figure uses it; the stored figures and determinations are recomputed in the same
 * transaction.
 */
export async function approveSettings(id: number, body: DecisionBody, actor: SignedIn): Promise<SettingsRecord> {
  return sequelize.transaction(async (transaction) => {
    const { row, entity } = await lockProposal(id, transaction);
    if (row.proposedBy === actor.user.id) {
      throw new ForbiddenError(
        "Four eyes: you proposed this change, so another person with the CRO role must approve it.",
        "four_eyes",
      );
    }
    refuseSignedOffPast(row.effectiveFrom, await lastSignedOffQuarter(entity.id, transaction), entity.code);
    const before =
      settingsOn(await approvedSettings(entity.id, transaction), row.effectiveFrom) ?? fallbackSettings(entity);
    row.status = "approved";
    row.decidedBy = actor.user.id;
    row.decidedAt = new Date();
    row.decisionComment = body.comment ?? null;
    await row.save({ transaction });
    // Every stored figure of the entity (portfolio_figures and the determinations) with the settings
    // in force on each date, in this transaction: no reader sees the approval without its figures.
    await refreshEntityFigures([entity.id], transaction);
    await recordAudit(
      actor,
      "settings.approve",
      `${entity.code} settings #${row.id}`,
      { before: valuesOf(before), after: { ...valuesOf(toDated(row)), comment: row.decisionComment } },
      transaction,
    );
    return (await toRecord([row], entity))[0];
  });
}

export async function rejectSettings(id: number, body: DecisionBody, actor: SignedIn): Promise<SettingsRecord> {
  return sequelize.transaction(async (transaction) => {
    const { row, entity } = await lockProposal(id, transaction);
    if (!body.comment) {
      throw new AppError(422, "validation_failed", "Say why the change is rejected.", {
        fields: { comment: "Required" },
      });
    }
    row.status = "rejected";
    row.decidedBy = actor.user.id;
    row.decidedAt = new Date();
    row.decisionComment = body.comment;
    await row.save({ transaction });
    await recordAudit(
      actor,
      "settings.reject",
      `${entity.code} settings #${row.id}`,
      { before: { status: "proposed" }, after: { status: "rejected", comment: body.comment } },
      transaction,
    );
    return (await toRecord([row], entity))[0];
  });
}

/** A new entity's first record: what the admin entered, in force from the start. */
export async function createInitialSettings(entity: EntityModel, transaction: Transaction): Promise<void> {
  await SupervisorySettingsModel.create(
    {
      entityId: entity.id,
      effectiveFrom: "1900-01-01",
      reference: "Settings entered when the entity was created",
      pnlBasis: entity.pnlBasis,
      qualitativeAddend: entity.qualitativeAddend,
      qualitativeAddendSvar: null,
      multiplierFloor: null,
      determinationFrequency: "quarterly",
      status: "approved",
      proposedBy: null,
      proposedAt: null,
      decidedBy: null,
      decidedAt: new Date(),
      decisionComment: null,
    },
    { transaction },
  );
}

/** Whether the entity's settings are governed records (then the entity's own columns no longer change them). */
export async function hasGovernedSettings(entityId: number, transaction?: Transaction): Promise<boolean> {
  return (await SupervisorySettingsModel.count({ where: { entityId, status: "approved" }, transaction })) > 0;
}
