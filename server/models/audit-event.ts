import { DataTypes, type CreationOptional } from "sequelize";
import { sequelize } from "../db/sequelize";
import { TableModel, notNull, nullable } from "./kit";

/** The audit log: one row per event, only ever added; signed and chained (server/modules/audit/audit-chain.ts). */
export class AuditEventModel extends TableModel<AuditEventModel> {
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
    at: { ...notNull.dateTime(), defaultValue: DataTypes.NOW },
    actorUserId: nullable.integer(),
    actorEmail: nullable.varchar(190),
    action: notNull.varchar(60),
    target: nullable.varchar(190),
    ip: nullable.varchar(64),
    requestId: nullable.varchar(64),
    beforeJson: nullable.text("long"),
    afterJson: nullable.text("long"),
    mac: nullable.char(64),
    seq: { type: DataTypes.BIGINT, allowNull: true },
    chainMac: nullable.char(64),
  },
  { sequelize, tableName: "audit_events", timestamps: false },
);
