"use strict";
/**
 * The determinations of the multiplier, stored on write (server/modules/determinations): one per
 * entity and period end (a quarter end by default), with the count, zone, plus factor, the
 * multipliers (m_c and m_s), the settings used, the span in force and the status
 * (provisional until the quarter's snapshot is approved, then approved, then filed). A
 * determination whose snapshot is signed off is frozen with it and never recomputed.
 */
const { id, timestamps, notNull, nullable } = require("./support/columns.cjs");

module.exports = {
  async up(qi) {
    await qi.createTable("determinations", {
      id: id(),
      entity_id: notNull.ref("entities"),
      period_end: notNull.dateOnly(),
      as_of: notNull.dateOnly(),
      effective_from: notNull.dateOnly(),
      effective_to: nullable.dateOnly(),
      counted: notNull.integer(),
      actual: notNull.integer(),
      hypothetical: notNull.integer(),
      zone: notNull.oneOf("green", "yellow", "red"),
      plus_factor: notNull.decimal(6, 4),
      multiplier: notNull.decimal(6, 4),
      multiplier_svar: notNull.decimal(6, 4),
      window_start: nullable.dateOnly(),
      window_observations: notNull.integer(),
      window_complete: notNull.boolean(),
      settings_id: nullable.integer(),
      settings_json: notNull.text(),
      status: notNull.oneOf("provisional", "approved", "filed"),
      snapshot_id: nullable.ref("snapshots"),
      ...timestamps(),
    });
    await qi.addIndex("determinations", ["entity_id", "period_end"], {
      unique: true,
      name: "determinations_one_per_period",
    });
  },

  async down(qi) {
    await qi.dropTable("determinations");
  },
};
