import type { InferAttributes } from "sequelize";
import { sequelize } from "../db/sequelize";
import { RowModel, idColumn, notNull, nullable, timestampColumns } from "./kit";
import { decimalAttribute } from "./decimal";
import type { Zone } from "../../shared/backtest/types";

export type DeterminationStatus = "provisional" | "approved" | "filed";

/** One stored determination of an entity's multiplier at a period end (server/modules/determinations). */
export class DeterminationModel extends RowModel<DeterminationModel> {
  declare entityId: number;
  declare periodEnd: string;
  declare asOf: string;
  declare effectiveFrom: string;
  declare effectiveTo: string | null;
  declare counted: number;
  declare actual: number;
  declare hypothetical: number;
  declare zone: Zone;
  declare plusFactor: number;
  declare multiplier: number;
  declare multiplierSvar: number;
  declare windowStart: string | null;
  declare windowObservations: number;
  declare windowComplete: boolean;
  declare settingsId: number | null;
  declare settingsJson: string;
  declare status: DeterminationStatus;
  declare snapshotId: number | null;
}

const factor = (attribute: keyof InferAttributes<DeterminationModel>) =>
  decimalAttribute<DeterminationModel>(attribute, 6, 4, { allowNull: false }) as never;

DeterminationModel.init(
  {
    ...idColumn(),
    entityId: notNull.integer(),
    periodEnd: notNull.dateOnly(),
    asOf: notNull.dateOnly(),
    effectiveFrom: notNull.dateOnly(),
    effectiveTo: nullable.dateOnly(),
    counted: notNull.integer(),
    actual: notNull.integer(),
    hypothetical: notNull.integer(),
    zone: notNull.oneOf("green", "yellow", "red"),
    plusFactor: factor("plusFactor"),
    multiplier: factor("multiplier"),
    multiplierSvar: factor("multiplierSvar"),
    windowStart: nullable.dateOnly(),
    windowObservations: notNull.integer(),
    windowComplete: notNull.boolean(),
    settingsId: nullable.integer(),
    settingsJson: notNull.text(),
    status: notNull.oneOf("provisional", "approved", "filed"),
    snapshotId: nullable.integer(),
    ...timestampColumns(),
  },
  { sequelize, tableName: "determinations" },
);
