import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes } from "sequelize";
import { sequelize } from "../db/sequelize";

/** The audit log: one row per event, only ever added; signed and chained (server/modules/audit/audit-chain.ts). */
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
  /** HMAC of the event's content, made when it is written (server/modules/audit/audit-chain.ts). */
  declare mac: string | null;
  /** Its place in the signed audit chain and the link's signature; null until sealed, right after commit. */
  declare seq: CreationOptional<number | null>;
  declare chainMac: CreationOptional<string | null>;
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
    mac: { type: DataTypes.CHAR(64), allowNull: true },
    seq: { type: DataTypes.BIGINT, allowNull: true },
    chainMac: { type: DataTypes.CHAR(64), allowNull: true },
  },
  { sequelize, tableName: "audit_events", timestamps: false },
);
