import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes } from "sequelize";
import { sequelize } from "../db/sequelize";
import type { DeskStatus } from "../../shared/backtest/frtb-capital";
import type { PlaZone } from "../../shared/backtest/pla";

/** One FRTB desk's status at one determination of its entity (docs/rules.md#frtb-eligibility). */
export class FrtbDeskStatusModel extends Model<
  InferAttributes<FrtbDeskStatusModel>,
  InferCreationAttributes<FrtbDeskStatusModel>
> {
  declare id: CreationOptional<number>;
  declare entityId: number;
  declare portfolioId: number;
  declare periodEnd: string;
  declare asOf: string;
  declare effectiveFrom: string;
  declare status: DeskStatus;
  declare reason: string;
  declare backtest99: number;
  declare backtest975: number;
  declare backtestPasses: boolean;
  declare plaZone: PlaZone | null;
  declare plaObservations: number;
  declare spearman: number | null;
  declare ks: number | null;
}

FrtbDeskStatusModel.init(
  {
    id: { type: DataTypes.INTEGER, primaryKey: true, autoIncrement: true },
    entityId: { type: DataTypes.INTEGER, allowNull: false },
    portfolioId: { type: DataTypes.INTEGER, allowNull: false },
    periodEnd: { type: DataTypes.DATEONLY, allowNull: false },
    asOf: { type: DataTypes.DATEONLY, allowNull: false },
    effectiveFrom: { type: DataTypes.DATEONLY, allowNull: false },
    status: { type: DataTypes.ENUM("in-model", "amber", "out-of-model"), allowNull: false },
    reason: { type: DataTypes.STRING(300), allowNull: false },
    backtest99: { type: DataTypes.INTEGER, allowNull: false, field: "backtest99" },
    backtest975: { type: DataTypes.INTEGER, allowNull: false, field: "backtest975" },
    backtestPasses: { type: DataTypes.BOOLEAN, allowNull: false },
    plaZone: { type: DataTypes.ENUM("green", "amber", "red"), allowNull: true },
    plaObservations: { type: DataTypes.INTEGER, allowNull: false },
    spearman: { type: DataTypes.DOUBLE, allowNull: true },
    ks: { type: DataTypes.DOUBLE, allowNull: true },
  },
  { sequelize, tableName: "frtb_desk_statuses", timestamps: false },
);
