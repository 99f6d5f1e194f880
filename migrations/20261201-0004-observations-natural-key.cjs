"use strict";
/**
 * Observations are keyed by what they are — portfolio, day, version — instead of a surrogate id
 * that nothing referred to: one index fewer to maintain on every row an upload writes (measured
 * about a quarter faster for a 100,000-row commit, bench/ingest.bench.ts). The preview's checked
 * rows are no longer stored: the commit uses the rows the preview kept in memory, or parses the
 * stored file again (server/modules/uploads/preview-cache.ts).
 */
const { nullable } = require("./support/columns.cjs");

module.exports = {
  async up(qi) {
    await qi.sequelize.query(
      "ALTER TABLE observations DROP COLUMN id, ADD PRIMARY KEY (portfolio_id, business_date, version), DROP INDEX observations_version",
    );
    await qi.removeColumn("uploads", "checked_rows");
  },

  async down(qi) {
    await qi.addColumn("uploads", "checked_rows", nullable.blob("long"));
    await qi.sequelize.query(
      "ALTER TABLE observations DROP PRIMARY KEY, ADD UNIQUE INDEX observations_version (portfolio_id, business_date, version), " +
        "ADD COLUMN id BIGINT NOT NULL AUTO_INCREMENT PRIMARY KEY FIRST",
    );
  },
};
