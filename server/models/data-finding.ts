import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes } from "sequelize";
import { sequelize } from "../db/sequelize";
import { PortfolioModel } from "./portfolio";
import type { FindingKind } from "../../shared/schemas/finding";

export class DataFindingModel extends Model<
  InferAttributes<DataFindingModel>,
  InferCreationAttributes<DataFindingModel>
> {
  declare id: CreationOptional<number>;
  declare portfolioId: number;
  declare kind: FindingKind;
  declare dateFrom: string;
  declare dateTo: string;
  declare detail: string;
  declare status: CreationOptional<"open" | "resolved" | "explained">;
  declare note: string | null;
  declare closedBy: number | null;
  declare closedAt: Date | null;
  declare version: CreationOptional<number>;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;
}

DataFindingModel.init(
  {
    id: { type: DataTypes.INTEGER, primaryKey: true, autoIncrement: true },
    portfolioId: { type: DataTypes.INTEGER, allowNull: false },
    kind: {
      type: DataTypes.ENUM(
        "missing_day",
        "stale_var",
        "pnl_without_var",
        "var_without_pnl",
        "hpl_without_rtpl",
        "outlier",
      ),
      allowNull: false,
    },
    dateFrom: { type: DataTypes.DATEONLY, allowNull: false },
    dateTo: { type: DataTypes.DATEONLY, allowNull: false },
    detail: { type: DataTypes.STRING(500), allowNull: false },
    status: { type: DataTypes.ENUM("open", "resolved", "explained"), allowNull: false, defaultValue: "open" },
    note: { type: DataTypes.TEXT, allowNull: true },
    closedBy: { type: DataTypes.INTEGER, allowNull: true },
    closedAt: { type: DataTypes.DATE(3), allowNull: true },
    version: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 1 },
    createdAt: DataTypes.DATE(3),
    updatedAt: DataTypes.DATE(3),
  },
  { sequelize, tableName: "data_findings" },
);
DataFindingModel.belongsTo(PortfolioModel, { foreignKey: "portfolioId", as: "portfolio" });
