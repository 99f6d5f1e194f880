"use strict";
/**
 * Which e-mail notifications a person has chosen to receive: one row per person and kind (only
 * kinds whose audience includes their role). Nobody is sent anything they did not choose.
 */
const { now, notNull } = require("./support/columns.cjs");

module.exports = {
  async up(qi) {
    await qi.createTable("notification_subscriptions", {
      user_id: notNull.ref("users", { primaryKey: true, onDelete: "CASCADE" }),
      kind: { ...notNull.varchar(40), primaryKey: true },
      created_at: now(),
    });
  },

  async down(qi) {
    await qi.dropTable("notification_subscriptions");
  },
};
