"use strict";
/**
 * Each FRTB desk's status at each determination of its entity (docs/rules.md#frtb-eligibility):
 * in the model, amber (in the model with the capital surcharge) or out of the model, with the
 * backtesting counts and PLA zone that decided it. Refreshed with the determinations inside every
 * writing transaction (server/modules/determinations/determinations.store.ts).
 */
module.exports = {
  async up(qi, Sequelize) {
    const { DataTypes } = Sequelize;
    await qi.createTable("frtb_desk_statuses", {
      id: { type: DataTypes.INTEGER, primaryKey: true, autoIncrement: true },
      entity_id: { type: DataTypes.INTEGER, allowNull: false, references: { model: "entities", key: "id" } },
      portfolio_id: {
        type: DataTypes.INTEGER,
        allowNull: false,
        references: { model: "portfolios", key: "id" },
        onDelete: "CASCADE",
      },
      period_end: { type: DataTypes.DATEONLY, allowNull: false },
      as_of: { type: DataTypes.DATEONLY, allowNull: false },
      effective_from: { type: DataTypes.DATEONLY, allowNull: false },
      status: { type: DataTypes.ENUM("in-model", "amber", "out-of-model"), allowNull: false },
      reason: { type: DataTypes.STRING(300), allowNull: false },
      backtest99: { type: DataTypes.INTEGER, allowNull: false },
      backtest975: { type: DataTypes.INTEGER, allowNull: false },
      backtest_passes: { type: DataTypes.BOOLEAN, allowNull: false },
      pla_zone: { type: DataTypes.ENUM("green", "amber", "red"), allowNull: true },
      pla_observations: { type: DataTypes.INTEGER, allowNull: false },
      spearman: { type: DataTypes.DOUBLE, allowNull: true },
      ks: { type: DataTypes.DOUBLE, allowNull: true },
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
