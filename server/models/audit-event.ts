import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes } from "sequelize";
import { sequelize } from "../db/sequelize";

export class AuditEventModel extends Model<InferAttributes<AuditEventModel>, InferCreationAttributes<AuditEventModel>> {
  declare id: CreationOptional<number>;
  declare at: CreationOptional<Date>;
  declare actorUserId: number | null;
  declare actorEmail: string | null;
  declare action: string;
  declare target: string | null;
  declare ip: string | null;
  declare requestId: string | null;
  declare beforeJson: string | null;
  declare afterJson: string | null;
}

AuditEventModel.init(
  {
    id: { type: DataTypes.BIGINT, primaryKey: true, autoIncrement: true },
    at: { type: DataTypes.DATE(3), allowNull: false, defaultValue: DataTypes.NOW },
    actorUserId: { type: DataTypes.INTEGER, allowNull: true },
    actorEmail: { type: DataTypes.STRING(190), allowNull: true },
    action: { type: DataTypes.STRING(60), allowNull: false },
    target: { type: DataTypes.STRING(190), allowNull: true },
    ip: { type: DataTypes.STRING(64), allowNull: true },
    requestId: { type: DataTypes.STRING(64), allowNull: true },
    beforeJson: { type: DataTypes.TEXT("long"), allowNull: true },
    afterJson: { type: DataTypes.TEXT("long"), allowNull: true },
  },
  { sequelize, tableName: "audit_events", timestamps: false },
);
