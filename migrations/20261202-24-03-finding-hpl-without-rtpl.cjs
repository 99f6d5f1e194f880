"use strict";
/**
 * A data-quality finding for FRTB desks: a day with hypothetical P&L but no risk-theoretical P&L,
 * which the P&L attribution test leaves out (docs/rules.md#pla), is said instead of dropped.
 */
const BEFORE = ["missing_day", "stale_var", "pnl_without_var", "var_without_pnl", "outlier"];
const AFTER = ["missing_day", "stale_var", "pnl_without_var", "var_without_pnl", "hpl_without_rtpl", "outlier"];
const enumOf = (values) => `ENUM(${values.map((v) => `'${v}'`).join(", ")})`;

module.exports = {
  async up(qi) {
    await qi.sequelize.query(`ALTER TABLE data_findings MODIFY kind ${enumOf(AFTER)} NOT NULL`);
  },

  async down(qi) {
    await qi.sequelize.query("DELETE FROM data_findings WHERE kind = 'hpl_without_rtpl'");
    await qi.sequelize.query(`ALTER TABLE data_findings MODIFY kind ${enumOf(BEFORE)} NOT NULL`);
  },
};
