"use strict";
/**
 * Overshooting notices (docs/rules.md#overshooting-notice): one row per overshooting of an EU
 * entity's top-of-house book, opened by the upload commit that revealed it, due five working days
 * later on the entity's calendar. The analyst drafts the cause (version: optimistic locking), the
 * CRO sends it; a restatement that leaves the day no overshooting withdraws an unsent one (kept).
 * `reminded_at` is claimed once by whichever server process sends the "coming due" e-mail.
 */
const { id, timestamps, version, notNull, nullable } = require("./support/columns.cjs");

module.exports = {
  async up(qi) {
    await qi.createTable("overshooting_notices", {
      id: id(),
      portfolio_id: notNull.ref("portfolios", { onDelete: "CASCADE" }),
      business_date: notNull.dateOnly(),
      status: { ...notNull.oneOf("open", "sent", "withdrawn"), defaultValue: "open" },
      revealed_on: notNull.dateOnly(),
      due_on: notNull.dateOnly(),
      upload_id: nullable.ref("uploads"),
      series: notNull.oneOf("actual", "hypothetical", "both"),
      actual_pnl: nullable.money(),
      hypothetical_pnl: nullable.money(),
      var_99: nullable.money(),
      excess: nullable.money(),
      cause: nullable.text(),
      drafted_by: nullable.ref("users"),
      drafted_at: nullable.dateTime(),
      sent_by: nullable.ref("users"),
      sent_at: nullable.dateTime(),
      recipients_json: nullable.text(),
      message_id: nullable.varchar(200),
      pdf_sha256: nullable.char(64),
      withdrawn_at: nullable.dateTime(),
      note: nullable.varchar(500),
      reminded_at: nullable.dateTime(),
      version: version(),
      ...timestamps(),
    });
    await qi.addIndex("overshooting_notices", ["portfolio_id", "business_date"], {
      name: "overshooting_notices_day",
      unique: true,
    });
    await qi.addIndex("overshooting_notices", ["status", "due_on"], { name: "overshooting_notices_status" });
  },

  async down(qi) {
    await qi.dropTable("overshooting_notices");
  },
};
