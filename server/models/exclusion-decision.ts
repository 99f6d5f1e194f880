import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes } from "sequelize";
import { sequelize } from "../db/sequelize";

/**
 * A decision the CRO recorded on an exclusion request; never updated. A correction is a new row
 * naming the one it supersedes, with its reason (migrations/20261202-23-01-exclusion-decisions.cjs).
 */
export class ExclusionDecisionModel extends Model<
  InferAttributes<ExclusionDecisionModel>,
  InferCreationAttributes<ExclusionDecisionModel>
> {
  declare id: CreationOptional<number>;
  declare reviewId: number;
  declare decision: "approved" | "rejected";
  declare reference: string;
  declare decidedOn: string;
  declare decidedBy: number | null;
  declare recordedAt: Date;
  declare supersedesId: number | null;
  declare correctionReason: string | null;
}

ExclusionDecisionModel.init(
  {
    id: { type: DataTypes.INTEGER, primaryKey: true, autoIncrement: true },
    reviewId: { type: DataTypes.INTEGER, allowNull: false },
    decision: { type: DataTypes.ENUM("approved", "rejected"), allowNull: false },
    reference: { type: DataTypes.STRING(120), allowNull: false },
    decidedOn: { type: DataTypes.DATEONLY, allowNull: false },
    decidedBy: { type: DataTypes.INTEGER, allowNull: true },
    recordedAt: { type: DataTypes.DATE(3), allowNull: false },
    supersedesId: { type: DataTypes.INTEGER, allowNull: true },
    correctionReason: { type: DataTypes.STRING(500), allowNull: true },
  },
  { sequelize, tableName: "exclusion_decisions", timestamps: false },
);
