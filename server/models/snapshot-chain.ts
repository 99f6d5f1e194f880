import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes } from "sequelize";
import { sequelize } from "../db/sequelize";

export type ChainLinkKind = "sealed" | "filed" | "restated" | "acknowledged" | "backfilled";

/**
 * One signed link of an entity's snapshot chain (server/modules/snapshot-chain): what a signed-off
 * snapshot held after an event (sealed, filed, restated, acknowledged), numbered per entity and
 * linked to the link before it. Rows are only ever added. `body` is the canonical JSON that `mac`
 * signs; the other columns repeat parts of it for lookups and are checked against it.
 */
export class ChainLinkModel extends Model<InferAttributes<ChainLinkModel>, InferCreationAttributes<ChainLinkModel>> {
  declare id: CreationOptional<number>;
  declare entityId: number;
  declare seq: number;
  declare snapshotId: number;
  declare kind: ChainLinkKind;
  declare body: string;
  declare mac: string;
  declare createdAt: CreationOptional<Date>;
}

ChainLinkModel.init(
  {
    id: { type: DataTypes.INTEGER, primaryKey: true, autoIncrement: true },
    entityId: { type: DataTypes.INTEGER, allowNull: false },
    seq: { type: DataTypes.INTEGER, allowNull: false },
    snapshotId: { type: DataTypes.INTEGER, allowNull: false },
    kind: { type: DataTypes.ENUM("sealed", "filed", "restated", "acknowledged", "backfilled"), allowNull: false },
    body: { type: DataTypes.TEXT("long"), allowNull: false },
    mac: { type: DataTypes.CHAR(64), allowNull: false },
    createdAt: DataTypes.DATE(3),
  },
  { sequelize, tableName: "snapshot_chain_links", updatedAt: false },
);

/** The signed head of an entity's chain: its length and newest link, so that a deleted newest link shows. */
export class ChainHeadModel extends Model<InferAttributes<ChainHeadModel>, InferCreationAttributes<ChainHeadModel>> {
  declare entityId: number;
  declare seq: number;
  declare mac: string;
  declare headMac: string;
  declare updatedAt: CreationOptional<Date>;
}

ChainHeadModel.init(
  {
    entityId: { type: DataTypes.INTEGER, primaryKey: true },
    seq: { type: DataTypes.INTEGER, allowNull: false },
    mac: { type: DataTypes.CHAR(64), allowNull: false },
    headMac: { type: DataTypes.CHAR(64), allowNull: false },
    updatedAt: DataTypes.DATE(3),
  },
  { sequelize, tableName: "snapshot_chain_heads", createdAt: false },
);
