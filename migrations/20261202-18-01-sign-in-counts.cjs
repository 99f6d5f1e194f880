"use strict";
/**
 * The sign-in limiter's counts, shared by every server process: one row per limited key (an
 * address or an account) with its failed attempts in the current window and when the window ends.
 * Kept in the database so that N worker processes enforce one limit, not N.
 */
const { notNull } = require("./support/columns.cjs");

module.exports = {
  async up(qi) {
    await qi.createTable("sign_in_counts", {
      counter_key: { ...notNull.varchar(320), primaryKey: true },
      hits: notNull.integer(),
      reset_at: notNull.dateTime(),
    });
    await qi.addIndex("sign_in_counts", ["reset_at"], { name: "sign_in_counts_reset_at" });
  },

  async down(qi) {
    await qi.dropTable("sign_in_counts");
  },
};
