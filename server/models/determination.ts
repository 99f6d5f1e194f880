import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes } from "sequelize";
import { sequelize } from "../db/sequelize";
import { decimalAttribute } from "./decimal";
import type { Zone } from "../../shared/backtest/types";

export type DeterminationStatus = "provisional" | "approved" | "filed";

/** One stored determination of an entity's multiplier at a period end (server/modules/determinations). */
export class DeterminationModel extends Model<
  InferAttributes<DeterminationModel>,
  InferCreationAttributes<DeterminationModel>
> {
  declare id: CreationOptional<number>;
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
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;
}

const factor = (attribute: keyof InferAttributes<DeterminationModel>) =>
  decimalAttribute<DeterminationModel>(attribute, 6, 4, { allowNull: false }) as never;

DeterminationModel.init(
  {
    id: { type: DataTypes.INTEGER, primaryKey: true, autoIncrement: true },
    entityId: { type: DataTypes.INTEGER, allowNull: false },
    periodEnd: { type: DataTypes.DATEONLY, allowNull: false },
    asOf: { type: DataTypes.DATEONLY, allowNull: false },
    effectiveFrom: { type: DataTypes.DATEONLY, allowNull: false },
    effectiveTo: { type: DataTypes.DATEONLY, allowNull: true },
    counted: { type: DataTypes.INTEGER, allowNull: false },
    actual: { type: DataTypes.INTEGER, allowNull: false },
    hypothetical: { type: DataTypes.INTEGER, allowNull: false },
    zone: { type: DataTypes.ENUM("green", "yellow", "red"), allowNull: false },
    plusFactor: factor("plusFactor"),
    multiplier: factor("multiplier"),
    multiplierSvar: factor("multiplierSvar"),
    windowStart: { type: DataTypes.DATEONLY, allowNull: true },
    windowObservations: { type: DataTypes.INTEGER, allowNull: false },
    windowComplete: { type: DataTypes.BOOLEAN, allowNull: false },
    settingsId: { type: DataTypes.INTEGER, allowNull: true },
    settingsJson: { type: DataTypes.TEXT, allowNull: false },
    status: { type: DataTypes.ENUM("provisional", "approved", "filed"), allowNull: false },
    snapshotId: { type: DataTypes.INTEGER, allowNull: true },
    createdAt: DataTypes.DATE(3),
    updatedAt: DataTypes.DATE(3),
  },
  { sequelize, tableName: "determinations" },
);
