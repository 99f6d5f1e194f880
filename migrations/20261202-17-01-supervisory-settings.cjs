"use strict";
/**
 * Supervisory settings become governed, dated records (server/modules/settings): the P&L basis
 * permission, the qualitative addends (VaR and, under the EU CRR, stressed VaR), a supervisor-imposed
 * multiplier floor and the determination frequency. Each record carries the supervisor's decision
 * reference and the date it is in force from; an admin proposes it and a CRO approves it. Each
 * entity's current columns (pnl_basis, qualitative_addend) become its first approved record, in
 * force from the start, so no figure of the past changes.
 */
module.exports = {
  async up(qi, Sequelize) {
    const { DataTypes } = Sequelize;
    const now = () => ({
      type: DataTypes.DATE(3),
      allowNull: false,
      defaultValue: Sequelize.literal("CURRENT_TIMESTAMP(3)"),
    });
    await qi.createTable("supervisory_settings", {
      id: { type: DataTypes.INTEGER, primaryKey: true, autoIncrement: true },
      entity_id: { type: DataTypes.INTEGER, allowNull: false, references: { model: "entities", key: "id" } },
      effective_from: { type: DataTypes.DATEONLY, allowNull: false },
      reference: { type: DataTypes.STRING(200), allowNull: false },
      pnl_basis: { type: DataTypes.ENUM("actual", "hypothetical", "max"), allowNull: false },
      qualitative_addend: { type: DataTypes.DECIMAL(6, 4), allowNull: false },
      qualitative_addend_svar: { type: DataTypes.DECIMAL(6, 4), allowNull: true },
      multiplier_floor: { type: DataTypes.DECIMAL(6, 4), allowNull: true },
      determination_frequency: {
        type: DataTypes.ENUM("quarterly", "monthly"),
        allowNull: false,
        defaultValue: "quarterly",
      },
      status: { type: DataTypes.ENUM("proposed", "approved", "rejected"), allowNull: false },
      proposed_by: { type: DataTypes.INTEGER, allowNull: true, references: { model: "users", key: "id" } },
      proposed_at: { type: DataTypes.DATE(3), allowNull: true },
      decided_by: { type: DataTypes.INTEGER, allowNull: true, references: { model: "users", key: "id" } },
      decided_at: { type: DataTypes.DATE(3), allowNull: true },
      decision_comment: { type: DataTypes.STRING(500), allowNull: true },
      created_at: now(),
      updated_at: now(),
    });
    await qi.addIndex("supervisory_settings", ["entity_id", "status", "effective_from"], {
      name: "supervisory_settings_in_force",
    });
    await qi.sequelize.query(
      `INSERT INTO supervisory_settings
         (entity_id, effective_from, reference, pnl_basis, qualitative_addend, determination_frequency, status, decided_at)
       SELECT id, '1900-01-01', 'Entity settings before governed records', pnl_basis, qualitative_addend,
              'quarterly', 'approved', CURRENT_TIMESTAMP(3)
         FROM entities`,
    );
  },

  async down(qi) {
    await qi.dropTable("supervisory_settings");
  },
};
