"use strict";
/** Filings: a signed-off snapshot's pack sent to the supervisor, and their acknowledgement (server/modules/filings). */
const { id, timestamps, notNull, nullable } = require("./support/columns.cjs");

module.exports = {
  async up(qi) {
    await qi.createTable("filings", {
      id: id(),
      snapshot_id: notNull.ref("snapshots", { unique: true }),
      // The pack exactly as sent; its sha256 is what a supervisor verifies.
      pack_pdf: notNull.blob("long"),
      pack_sha256: notNull.char(64),
      file_name: notNull.varchar(255),
      recipients_json: notNull.text(),
      message_id: notNull.varchar(255),
      sent_by: notNull.ref("users"),
      sent_at: notNull.dateTime(),
      acknowledged_by: nullable.ref("users"),
      acknowledged_at: nullable.dateTime(),
      ...timestamps(),
    });
  },

  async down(qi) {
    await qi.dropTable("filings");
  },
};
