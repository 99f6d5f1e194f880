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
const { id, now, notNull } = require("./support/columns.cjs");

module.exports = {
  async up(qi) {
    await qi.createTable("snapshot_chain_links", {
      id: id(),
      entity_id: notNull.ref("entities"),
      seq: notNull.integer(),
      snapshot_id: notNull.ref("snapshots"),
      kind: notNull.oneOf("sealed", "filed", "restated", "acknowledged", "backfilled"),
      // The canonical JSON the mac signs (HMAC-SHA256 with the chain key).
      body: notNull.text("long"),
      mac: notNull.char(64),
      created_at: now(),
    });
    await qi.addIndex("snapshot_chain_links", ["entity_id", "seq"], { unique: true, name: "snapshot_chain_links_seq" });
    await qi.addIndex("snapshot_chain_links", ["snapshot_id"], { name: "snapshot_chain_links_snapshot" });
    await qi.createTable("snapshot_chain_heads", {
      entity_id: notNull.ref("entities", { primaryKey: true }),
      seq: notNull.integer(),
      mac: notNull.char(64),
      head_mac: notNull.char(64),
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
