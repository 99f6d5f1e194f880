"use strict";
/**
 * Quarter snapshots: one entity's figures at one quarter end, frozen for the four-eyes sign-off
 * (server/modules/snapshots). Approved snapshots of an entity form a hash chain.
 */
module.exports = {
  async up(qi, Sequelize) {
    const { DataTypes } = Sequelize;
    const now = () => ({
      type: DataTypes.DATE(3),
      allowNull: false,
      defaultValue: Sequelize.literal("CURRENT_TIMESTAMP(3)"),
    });
    await qi.createTable("snapshots", {
      id: { type: DataTypes.INTEGER, primaryKey: true, autoIncrement: true },
      entity_id: { type: DataTypes.INTEGER, allowNull: false, references: { model: "entities", key: "id" } },
      quarter_end: { type: DataTypes.DATEONLY, allowNull: false },
      status: { type: DataTypes.ENUM("draft", "submitted", "approved", "returned", "filed"), allowNull: false },
      // The headline figures as columns (history, sorting), every figure in figures_json.
      zone: { type: DataTypes.ENUM("green", "yellow", "red"), allowNull: false },
      counted: { type: DataTypes.INTEGER, allowNull: false },
      plus_factor: { type: DataTypes.DECIMAL(6, 4), allowNull: false },
      multiplier: { type: DataTypes.DECIMAL(6, 4), allowNull: false },
      capital: { type: DataTypes.DECIMAL(20, 2), allowNull: true },
      add_on: { type: DataTypes.DECIMAL(20, 2), allowNull: true },
      window_start: { type: DataTypes.DATEONLY, allowNull: true },
      as_of: { type: DataTypes.DATEONLY, allowNull: false },
      figures_json: { type: DataTypes.TEXT("long"), allowNull: false },
      inputs_sha256: { type: DataTypes.CHAR(64), allowNull: false },
      engine_version: { type: DataTypes.STRING(20), allowNull: false },
      prepared_by: { type: DataTypes.INTEGER, allowNull: false, references: { model: "users", key: "id" } },
      prepared_at: { type: DataTypes.DATE(3), allowNull: false },
      submitted_by: { type: DataTypes.INTEGER, allowNull: true, references: { model: "users", key: "id" } },
      submitted_at: { type: DataTypes.DATE(3), allowNull: true },
      approved_by: { type: DataTypes.INTEGER, allowNull: true, references: { model: "users", key: "id" } },
      approved_at: { type: DataTypes.DATE(3), allowNull: true },
      history_json: { type: DataTypes.TEXT("long"), allowNull: false },
      prev_hash: { type: DataTypes.CHAR(64), allowNull: true },
      hash: { type: DataTypes.CHAR(64), allowNull: true, unique: true },
      restated_at: { type: DataTypes.DATE(3), allowNull: true },
      restatement_detail: { type: DataTypes.TEXT, allowNull: true },
      version: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 1 },
      created_at: now(),
      updated_at: now(),
    });
    await qi.addIndex("snapshots", ["entity_id", "quarter_end"], { unique: true, name: "snapshots_one_per_quarter" });
  },

  async down(qi) {
    await qi.dropTable("snapshots");
  },
};
