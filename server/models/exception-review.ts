import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes } from "sequelize";
import { sequelize } from "../db/sequelize";
import type { ExceptionCause, ExclusionStatus } from "../../shared/schemas/review";

export class ExceptionReviewModel extends Model<
  InferAttributes<ExceptionReviewModel>,
  InferCreationAttributes<ExceptionReviewModel>
> {
  declare id: CreationOptional<number>;
  declare portfolioId: number;
  declare businessDate: string;
  declare cause: ExceptionCause;
  declare narrative: string;
  declare exclusionStatus: CreationOptional<ExclusionStatus>;
  declare decisionReference: string | null;
  declare decisionDate: string | null;
  declare decidedBy: number | null;
  declare reviewedBy: number;
  declare version: CreationOptional<number>;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;
}

ExceptionReviewModel.init(
  {
    id: { type: DataTypes.INTEGER, primaryKey: true, autoIncrement: true },
    portfolioId: { type: DataTypes.INTEGER, allowNull: false },
    businessDate: { type: DataTypes.DATEONLY, allowNull: false },
    cause: {
      type: DataTypes.ENUM("market_move", "model_limitation", "data_issue", "intraday_trading", "pricing", "other"),
      allowNull: false,
    },
    narrative: { type: DataTypes.TEXT, allowNull: false },
    exclusionStatus: {
      type: DataTypes.ENUM("none", "requested", "approved", "rejected"),
      allowNull: false,
      defaultValue: "none",
    },
    decisionReference: { type: DataTypes.STRING(120), allowNull: true },
    decisionDate: { type: DataTypes.DATEONLY, allowNull: true },
    decidedBy: { type: DataTypes.INTEGER, allowNull: true },
    reviewedBy: { type: DataTypes.INTEGER, allowNull: false },
    version: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 1 },
    createdAt: DataTypes.DATE(3),
    updatedAt: DataTypes.DATE(3),
  },
  { sequelize, tableName: "exception_reviews" },
);
