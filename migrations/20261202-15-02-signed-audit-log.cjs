"use strict";
/**
 * The audit log becomes a signed chain (server/modules/audit/audit-chain.ts): each event keeps the
 * signature of its content (mac), its place in the chain (seq) and the link's signature
 * (chain_mac); one signed head row names the newest. Existing events are signed and chained once
 * here, in id order, with the chain key.
 */
const path = require("node:path");
const { pathToFileURL } = require("node:url");
const { notNull, nullable } = require("./support/columns.cjs");

module.exports = {
  async up(qi, Sequelize) {
    await qi.addColumn("audit_events", "mac", nullable.char(64));
    await qi.addColumn("audit_events", "seq", nullable.bigint());
    await qi.addColumn("audit_events", "chain_mac", nullable.char(64));
    await qi.addIndex("audit_events", ["seq"], { unique: true, name: "audit_events_seq" });
    await qi.addIndex("audit_events", ["mac"], { name: "audit_events_mac" });
    await qi.createTable("audit_chain_head", {
      id: { type: Sequelize.DataTypes.TINYINT, primaryKey: true },
      seq: notNull.bigint(),
      chain_mac: nullable.char(64),
      head_mac: notNull.char(64),
    });
    const backfill = path.join(__dirname, "..", "server", "modules", "snapshot-chain", "backfill.ts");
    const { backfillAuditChain } = await import(pathToFileURL(backfill).href);
    await backfillAuditChain();
  },

  async down(qi) {
    await qi.dropTable("audit_chain_head");
    await qi.removeIndex("audit_events", "audit_events_mac");
    await qi.removeIndex("audit_events", "audit_events_seq");
    await qi.removeColumn("audit_events", "chain_mac");
    await qi.removeColumn("audit_events", "seq");
    await qi.removeColumn("audit_events", "mac");
  },
};
