"use strict";
/**
 * Each FRTB desk's status at each determination of its entity (docs/rules.md#frtb-eligibility):
 * in the model, amber (in the model with the capital surcharge) or out of the model, with the
 * backtesting counts and PLA zone that decided it. Refreshed with the determinations inside every
 * writing transaction (server/modules/determinations/determinations.store.ts).
 */
const { id, notNull, nullable } = require("./support/columns.cjs");

module.exports = {
  async up(qi) {
    await qi.createTable("frtb_desk_statuses", {
      id: id(),
      entity_id: notNull.ref("entities"),
      portfolio_id: notNull.ref("portfolios", { onDelete: "CASCADE" }),
      period_end: notNull.dateOnly(),
      as_of: notNull.dateOnly(),
      effective_from: notNull.dateOnly(),
      status: notNull.oneOf("in-model", "amber", "out-of-model"),
      reason: notNull.varchar(300),
      backtest99: notNull.integer(),
      backtest975: notNull.integer(),
      backtest_passes: notNull.boolean(),
      pla_zone: nullable.oneOf("green", "amber", "red"),
      pla_observations: notNull.integer(),
      spearman: nullable.double(),
      ks: nullable.double(),
    });
    await qi.addIndex("frtb_desk_statuses", ["portfolio_id", "period_end"], {
      unique: true,
      name: "frtb_desk_statuses_desk_period",
    });
    await qi.addIndex("frtb_desk_statuses", ["entity_id", "period_end"], { name: "frtb_desk_statuses_entity" });
  },

  async down(qi) {
    await qi.dropTable("frtb_desk_statuses");
  },
};
