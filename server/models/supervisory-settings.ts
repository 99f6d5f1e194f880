import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes } from "sequelize";
import { sequelize } from "../db/sequelize";
import { decimalAttribute } from "./decimal";
import type { PnlBasis } from "../../shared/schemas/common";
import type { DeterminationFrequency } from "../../shared/backtest/determination";

export type SettingsStatus = "proposed" | "approved" | "rejected";

/** One dated, governed record of an entity's supervisory settings (server/modules/settings). */
export class SupervisorySettingsModel extends Model<
  InferAttributes<SupervisorySettingsModel>,
  InferCreationAttributes<SupervisorySettingsModel>
> {
  declare id: CreationOptional<number>;
  declare entityId: number;
  declare effectiveFrom: string;
  declare reference: string;
  declare pnlBasis: PnlBasis;
  declare qualitativeAddend: number;
  declare qualitativeAddendSvar: number | null;
  declare multiplierFloor: number | null;
  declare determinationFrequency: DeterminationFrequency;
  declare status: SettingsStatus;
  declare proposedBy: number | null;
  declare proposedAt: Date | null;
  declare decidedBy: number | null;
  declare decidedAt: Date | null;
  declare decisionComment: string | null;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;
}

const decimal = (attribute: keyof InferAttributes<SupervisorySettingsModel>, allowNull: boolean) =>
  decimalAttribute<SupervisorySettingsModel>(attribute, 6, 4, { allowNull });

SupervisorySettingsModel.init(
  {
    id: { type: DataTypes.INTEGER, primaryKey: true, autoIncrement: true },
    entityId: { type: DataTypes.INTEGER, allowNull: false },
    effectiveFrom: { type: DataTypes.DATEONLY, allowNull: false },
    reference: { type: DataTypes.STRING(200), allowNull: false },
    pnlBasis: { type: DataTypes.ENUM("actual", "hypothetical", "max"), allowNull: false },
    qualitativeAddend: decimal("qualitativeAddend", false) as never,
    qualitativeAddendSvar: decimal("qualitativeAddendSvar", true),
    multiplierFloor: decimal("multiplierFloor", true),
    determinationFrequency: { type: DataTypes.ENUM("quarterly", "monthly"), allowNull: false },
    status: { type: DataTypes.ENUM("proposed", "approved", "rejected"), allowNull: false },
    proposedBy: { type: DataTypes.INTEGER, allowNull: true },
    proposedAt: { type: DataTypes.DATE(3), allowNull: true },
    decidedBy: { type: DataTypes.INTEGER, allowNull: true },
    decidedAt: { type: DataTypes.DATE(3), allowNull: true },
    decisionComment: { type: DataTypes.STRING(500), allowNull: true },
    createdAt: DataTypes.DATE(3),
    updatedAt: DataTypes.DATE(3),
  },
  { sequelize, tableName: "supervisory_settings" },
);
