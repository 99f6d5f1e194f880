"use strict";
/**
 * The engine's results per portfolio, stored so that reads read them instead of recomputing from
 * the raw days: the standing at the latest day (the backtest), the rolling series, and for an
 * entity's headline book its Overview line. Every write that
 * changes them refreshes them in its own transaction (server/modules/figures/stored-figures.ts).
 * A portfolio without a row (made before this table, or new) is computed on its first read.
 */
const { notNull, nullable } = require("./support/columns.cjs");

module.exports = {
  async up(qi) {
    await qi.createTable("portfolio_figures", {
      portfolio_id: notNull.ref("portfolios", { primaryKey: true, onDelete: "CASCADE" }),
      entity_id: notNull.ref("entities"),
      engine_version: notNull.varchar(20),
      as_of: nullable.dateOnly(),
      backtest_json: nullable.text("long"),
      rolling_json: notNull.text("long"),
      overview_json: nullable.text(),
      refreshed_at: notNull.dateTime(),
    });
    await qi.addIndex("portfolio_figures", ["entity_id"], { name: "portfolio_figures_entity" });
  },

  async down(qi) {
    await qi.dropTable("portfolio_figures");
  },
};
