"use strict";
/**
 * The engine's results per portfolio, stored so that reads read them instead of recomputing from
 * the raw days: the standing at the latest day (the backtest), the rolling series, and for an
 * entity's headline book its Overview line. Every write that
 * changes them refreshes them in its own transaction (server/modules/figures/stored-figures.ts).
 * A portfolio without a row (made before this table, or new) is computed on its first read.
 */
module.exports = {
  async up(qi, Sequelize) {
    const { DataTypes } = Sequelize;
    await qi.createTable("portfolio_figures", {
      portfolio_id: {
        type: DataTypes.INTEGER,
        allowNull: false,
        primaryKey: true,
        references: { model: "portfolios", key: "id" },
        onDelete: "CASCADE",
      },
      entity_id: { type: DataTypes.INTEGER, allowNull: false, references: { model: "entities", key: "id" } },
      engine_version: { type: DataTypes.STRING(20), allowNull: false },
      as_of: { type: DataTypes.DATEONLY, allowNull: true },
      backtest_json: { type: DataTypes.TEXT("long"), allowNull: true },
      rolling_json: { type: DataTypes.TEXT("long"), allowNull: false },
      overview_json: { type: DataTypes.TEXT, allowNull: true },
      refreshed_at: { type: DataTypes.DATE(3), allowNull: false },
    });
    await qi.addIndex("portfolio_figures", ["entity_id"], { name: "portfolio_figures_entity" });
  },

  async down(qi) {
    await qi.dropTable("portfolio_figures");
  },
};
