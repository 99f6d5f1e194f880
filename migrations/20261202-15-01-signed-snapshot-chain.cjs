"use strict";
/**
 * The signed snapshot chain (server/modules/snapshot-chain): one signed link per event on a
 * signed-off snapshot, numbered per entity, and a signed head per entity. Existing signed-off
 * snapshots, their filings and acknowledgements are signed once here, in approval order, with the
 * chain key (CHAIN_KEY or .data/chain-key) — the backfill is the server's own code, so the links
 * are exactly what the server would have written.
 */
const path = require("node:path");
const { pathToFileURL } = require("node:url");

module.exports = {
  async up(qi, Sequelize) {
    const { DataTypes } = Sequelize;
    const now = () => ({
      type: DataTypes.DATE(3),
      allowNull: false,
      defaultValue: Sequelize.literal("CURRENT_TIMESTAMP(3)"),
    });
    await qi.createTable("snapshot_chain_links", {
      id: { type: DataTypes.INTEGER, primaryKey: true, autoIncrement: true },
      entity_id: { type: DataTypes.INTEGER, allowNull: false, references: { model: "entities", key: "id" } },
      seq: { type: DataTypes.INTEGER, allowNull: false },
      snapshot_id: { type: DataTypes.INTEGER, allowNull: false, references: { model: "snapshots", key: "id" } },
      kind: {
        type: DataTypes.ENUM("sealed", "filed", "restated", "acknowledged", "backfilled"),
        allowNull: false,
      },
      // The canonical JSON the mac signs (HMAC-SHA256 with the chain key).
      body: { type: DataTypes.TEXT("long"), allowNull: false },
      mac: { type: DataTypes.CHAR(64), allowNull: false },
      created_at: now(),
    });
    await qi.addIndex("snapshot_chain_links", ["entity_id", "seq"], { unique: true, name: "snapshot_chain_links_seq" });
    await qi.addIndex("snapshot_chain_links", ["snapshot_id"], { name: "snapshot_chain_links_snapshot" });
    await qi.createTable("snapshot_chain_heads", {
      entity_id: { type: DataTypes.INTEGER, primaryKey: true, references: { model: "entities", key: "id" } },
      seq: { type: DataTypes.INTEGER, allowNull: false },
      mac: { type: DataTypes.CHAR(64), allowNull: false },
      head_mac: { type: DataTypes.CHAR(64), allowNull: false },
      updated_at: now(),
    });
    const backfill = path.join(__dirname, "..", "server", "modules", "snapshot-chain", "backfill.ts");
    const { backfillSnapshotChains } = await import(pathToFileURL(backfill).href);
    await backfillSnapshotChains();
  },

  async down(qi) {
    await qi.dropTable("snapshot_chain_heads");
    await qi.dropTable("snapshot_chain_links");
  },
};
