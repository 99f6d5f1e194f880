import type { Transaction } from "sequelize";
import { SupervisorySettingsModel } from "../../models/supervisory-settings";
import type { EntityModel } from "../../models/entity";
import type { DatedSettings } from "../../../shared/backtest/determination";

/** A stored record as the engine reads it. */
export function toDated(row: SupervisorySettingsModel): DatedSettings {
  return {
    id: row.id,
    effectiveFrom: row.effectiveFrom,
    reference: row.reference,
    pnlBasis: row.pnlBasis,
    qualitativeAddend: row.qualitativeAddend,
    qualitativeAddendSvar: row.qualitativeAddendSvar,
    multiplierFloor: row.multiplierFloor,
    determinationFrequency: row.determinationFrequency,
  };
}

/**
 * Before an entity has an approved record (an entity made before the records existed, until the
 * migration ran), its own columns stand in, quarterly and with no floor.
 */
export function fallbackSettings(entity: EntityModel): DatedSettings {
  return {
    id: null,
    effectiveFrom: "1900-01-01",
    reference: "Entity settings before governed records",
    pnlBasis: entity.pnlBasis,
    qualitativeAddend: entity.qualitativeAddend,
    qualitativeAddendSvar: null,
    multiplierFloor: null,
    determinationFrequency: "quarterly",
  };
}

/** The entity's approved records, oldest first (the engine picks the one in force on each date). */
export async function approvedSettings(entityId: number, transaction?: Transaction): Promise<DatedSettings[]> {
  const rows = await SupervisorySettingsModel.findAll({
    where: { entityId, status: "approved" },
    order: [
      ["effectiveFrom", "ASC"],
      ["decidedAt", "ASC"],
      ["id", "ASC"],
    ],
    transaction,
  });
  return rows.map(toDated);
}
