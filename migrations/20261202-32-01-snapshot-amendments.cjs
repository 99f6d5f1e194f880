"use strict";
/**
 * Amended filings (server/modules/snapshots/snapshots.amendments.ts): a snapshot may amend a filed
 * snapshot of the same entity and quarter. `amends_id` names the snapshot it amends (unique: a
 * snapshot is amended at most once; a later correction amends the amendment), and
 * `amendment_json` freezes, when the amendment is prepared, the before and after of every figure
 * that changed and its capital impact. A quarter now holds its original snapshot and its line of
 * amendments: the one-per-quarter rule becomes one original per quarter (`amends_key` is 0 for an
 * original and the amended snapshot's id otherwise).
 */
const { nullable } = require("./support/columns.cjs");

module.exports = {
  async up(qi) {
    await qi.addColumn("snapshots", "amends_id", nullable.ref("snapshots", { unique: true }));
    await qi.addColumn("snapshots", "amendment_json", nullable.text("long"));
    await qi.sequelize.query("ALTER TABLE snapshots ADD COLUMN amends_key INT AS (COALESCE(amends_id, 0)) PERSISTENT");
    // The new unique index first: it starts with entity_id, so the foreign key keeps an index.
    await qi.addIndex("snapshots", ["entity_id", "quarter_end", "amends_key"], {
      unique: true,
      name: "snapshots_one_original_per_quarter",
    });
    await qi.removeIndex("snapshots", "snapshots_one_per_quarter");
  },

  async down(qi) {
    await qi.addIndex("snapshots", ["entity_id", "quarter_end"], { unique: true, name: "snapshots_one_per_quarter" });
    await qi.removeIndex("snapshots", "snapshots_one_original_per_quarter");
    await qi.removeColumn("snapshots", "amends_key");
    await qi.removeColumn("snapshots", "amendment_json");
    await qi.removeColumn("snapshots", "amends_id");
  },
};
