"use strict";
/**
 * Stored figures were computed with the entity's own columns (P&L basis, addend) even after an
 * approved supervisory settings record changed them, and a settings approval refreshed only the
 * determinations. From now on every stored figure uses the record in force on its own day
 * (server/modules/figures/engine-inputs.ts, settingsAt). The rows computed the old way are removed:
 * a portfolio without a row is computed afresh, with its entity's determinations, on its first read.
 */
module.exports = {
  async up(qi) {
    await qi.sequelize.query("DELETE FROM portfolio_figures");
  },

  async down() {
    // Nothing to restore: the rows are recomputed on read.
  },
};
