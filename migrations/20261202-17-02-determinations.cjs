"use strict";
/**
 * The determinations of the multiplier, stored on write (server/modules/determinations): one per
 * entity and period end (a quarter end by default), with the count, zone, plus factor, the
 * multipliers (m_c and m_s), the settings used, the span in force and the status
 * (provisional until the quarter's snapshot is approved, then approved, then filed). A
 * determination whose snapshot is signed off is frozen with it and never recomputed.
 */
module.exports = {
  async up(qi, Sequelize) {
    const { DataTypes } = Sequelize;
    const now = () => ({
      type: DataTypes.DATE(3),
      allowNull: false,
      defaultValue: Sequelize.literal("CURRENT_TIMESTAMP(3)"),
    });
    await qi.createTable("determinations", {
      id: { type: DataTypes.INTEGER, primaryKey: true, autoIncrement: true },
      entity_id: { type: DataTypes.INTEGER, allowNull: false, references: { model: "entities", key: "id" } },
      period_end: { type: DataTypes.DATEONLY, allowNull: false },
      as_of: { type: DataTypes.DATEONLY, allowNull: false },
      effective_from: { type: DataTypes.DATEONLY, allowNull: false },
      effective_to: { type: DataTypes.DATEONLY, allowNull: true },
      counted: { type: DataTypes.INTEGER, allowNull: false },
      actual: { type: DataTypes.INTEGER, allowNull: false },
      hypothetical: { type: DataTypes.INTEGER, allowNull: false },
      zone: { type: DataTypes.ENUM("green", "yellow", "red"), allowNull: false },
      plus_factor: { type: DataTypes.DECIMAL(6, 4), allowNull: false },
      multiplier: { type: DataTypes.DECIMAL(6, 4), allowNull: false },
      multiplier_svar: { type: DataTypes.DECIMAL(6, 4), allowNull: false },
      window_start: { type: DataTypes.DATEONLY, allowNull: true },
      window_observations: { type: DataTypes.INTEGER, allowNull: false },
      window_complete: { type: DataTypes.BOOLEAN, allowNull: false },
      settings_id: { type: DataTypes.INTEGER, allowNull: true },
      settings_json: { type: DataTypes.TEXT, allowNull: false },
      status: { type: DataTypes.ENUM("provisional", "approved", "filed"), allowNull: false },
      snapshot_id: { type: DataTypes.INTEGER, allowNull: true, references: { model: "snapshots", key: "id" } },
      created_at: now(),
      updated_at: now(),
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
