"use strict";
/**
 * Quarter snapshots: one entity's figures at one quarter end, frozen for the four-eyes sign-off
 * (server/modules/snapshots). Approved snapshots of an entity form a hash chain.
 */
const { id, timestamps, version, notNull, nullable } = require("./support/columns.cjs");

module.exports = {
  async up(qi) {
    await qi.createTable("snapshots", {
      id: id(),
      entity_id: notNull.ref("entities"),
      quarter_end: notNull.dateOnly(),
      status: notNull.oneOf("draft", "submitted", "approved", "returned", "filed"),
      // The headline figures as columns (history, sorting), every figure in figures_json.
      zone: notNull.oneOf("green", "yellow", "red"),
      counted: notNull.integer(),
      plus_factor: notNull.decimal(6, 4),
      multiplier: notNull.decimal(6, 4),
      capital: nullable.money(),
      add_on: nullable.money(),
      window_start: nullable.dateOnly(),
      as_of: notNull.dateOnly(),
      figures_json: notNull.text("long"),
      inputs_sha256: notNull.char(64),
      engine_version: notNull.varchar(20),
      prepared_by: notNull.ref("users"),
      prepared_at: notNull.dateTime(),
      submitted_by: nullable.ref("users"),
      submitted_at: nullable.dateTime(),
      approved_by: nullable.ref("users"),
      approved_at: nullable.dateTime(),
      history_json: notNull.text("long"),
      prev_hash: nullable.char(64),
      hash: { ...nullable.char(64), unique: true },
      restated_at: nullable.dateTime(),
      restatement_detail: nullable.text(),
      version: version(),
      ...timestamps(),
    });
    await qi.addIndex("snapshots", ["entity_id", "quarter_end"], { unique: true, name: "snapshots_one_per_quarter" });
  },

  async down(qi) {
    await qi.dropTable("snapshots");
  },
};
