"use strict";
/**
 * The headline of a snapshot's frozen figures, kept by MariaDB beside them (a stored generated
 * column): GET /api/snapshots lists it instead of taking the window's days, exceptions and details
 * out of every row's figures on every read (server/modules/snapshots/snapshots.read.ts). It follows
 * figures_json on every write by construction; nothing writes it.
 */
const HEAVY = [
  "days",
  "exceptionDetail",
  "exceptionDates",
  "desks",
  "capitalDetail",
  "tests",
  "frtb",
  "frtbNote",
  "analystInputs",
  "settings",
  "determination",
];

module.exports = {
  async up(qi) {
    const paths = HEAVY.map((k) => `'$.${k}'`).join(", ");
    await qi.sequelize.query(
      `ALTER TABLE snapshots ADD COLUMN figures_headline LONGTEXT AS (JSON_REMOVE(figures_json, ${paths})) STORED`,
    );
  },

  async down(qi) {
    await qi.removeColumn("snapshots", "figures_headline");
  },
};
