import { DataTypes, type CreationOptional } from "sequelize";
import { sequelize } from "../db/sequelize";
import { TableModel, idColumn, notNull } from "./kit";

export type ChainLinkKind = "sealed" | "filed" | "restated" | "acknowledged" | "backfilled";

/**
 * One signed link of an entity's snapshot chain (server/modules/snapshot-chain): what a signed-off
 * snapshot held after an event (sealed, filed, restated, acknowledged), numbered per entity and
 * linked to the link before it. Rows are only ever added. `body` is the canonical JSON that `mac`
 * signs; the other columns repeat parts of it for lookups and are checked against it.
 */
export class ChainLinkModel extends TableModel<ChainLinkModel> {
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
    ...idColumn(),
    entityId: notNull.integer(),
    seq: notNull.integer(),
    snapshotId: notNull.integer(),
    kind: notNull.oneOf("sealed", "filed", "restated", "acknowledged", "backfilled"),
    body: notNull.text("long"),
    mac: notNull.char(64),
    createdAt: DataTypes.DATE(3),
  },
  { sequelize, tableName: "snapshot_chain_links", updatedAt: false },
);

/** The signed head of an entity's chain: its length and newest link, so that a deleted newest link shows. */
export class ChainHeadModel extends TableModel<ChainHeadModel> {
  declare entityId: number;
  declare seq: number;
  declare mac: string;
  declare headMac: string;
  declare updatedAt: CreationOptional<Date>;
}

ChainHeadModel.init(
  {
    entityId: { type: DataTypes.INTEGER, primaryKey: true },
    seq: notNull.integer(),
    mac: notNull.char(64),
    headMac: notNull.char(64),
    updatedAt: DataTypes.DATE(3),
  },
  { sequelize, tableName: "snapshot_chain_heads", createdAt: false },
);
