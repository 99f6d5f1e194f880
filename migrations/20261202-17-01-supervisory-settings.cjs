"use strict";
/**
 * Supervisory settings become governed, dated records (server/modules/settings): the P&L basis
 * permission, the qualitative addends (VaR and, under the EU CRR, stressed VaR), a supervisor-imposed
 * multiplier floor and the determination frequency. Each record carries the supervisor's decision
 * reference and the date it is in force from; an admin proposes it and a CRO approves it. Each
 * entity's current columns (pnl_basis, qualitative_addend) become its first approved record, in
 * force from the start, so no figure of the past changes.
 */
const { id, timestamps, notNull, nullable } = require("./support/columns.cjs");

module.exports = {
  async up(qi) {
    await qi.createTable("supervisory_settings", {
      id: id(),
      entity_id: notNull.ref("entities"),
      effective_from: notNull.dateOnly(),
      reference: notNull.varchar(200),
      pnl_basis: notNull.oneOf("actual", "hypothetical", "max"),
      qualitative_addend: notNull.decimal(6, 4),
      qualitative_addend_svar: nullable.decimal(6, 4),
      multiplier_floor: nullable.decimal(6, 4),
      determination_frequency: { ...notNull.oneOf("quarterly", "monthly"), defaultValue: "quarterly" },
      status: notNull.oneOf("proposed", "approved", "rejected"),
      proposed_by: nullable.ref("users"),
      proposed_at: nullable.dateTime(),
      decided_by: nullable.ref("users"),
      decided_at: nullable.dateTime(),
      decision_comment: nullable.varchar(500),
      ...timestamps(),
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
