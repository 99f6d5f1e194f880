"use strict";
/**
 * Filing exactly once (server/modules/filings): a filing's message and its recipients are written
 * in the filing's own transaction (an outbox); each recipient's delivery is a row with its state
 * (pending, sending, accepted, refused, unknown), attempts and the mail server's last answer. A
 * filing is "partial" when the pack reached some recipients and not all. The hash the supervisor
 * acknowledged is kept on the filing. Existing filings get one row per recipient (accepted if sent),
 * and every filing a Message-ID.
 */
const { randomBytes } = require("node:crypto");
const { id, timestamps, notNull, nullable } = require("./support/columns.cjs");

/** filings.delivery before and after this migration. */
const delivery = (values, defaultValue) => ({ ...notNull.oneOf(...values), defaultValue });

module.exports = {
  async up(qi) {
    await qi.createTable("filing_deliveries", {
      id: id(),
      filing_id: notNull.ref("filings", { onDelete: "CASCADE" }),
      recipient: notNull.varchar(254),
      status: { ...notNull.oneOf("pending", "sending", "accepted", "refused", "unknown"), defaultValue: "pending" },
      attempts: { ...notNull.integer(), defaultValue: 0 },
      claimed_at: nullable.dateTime(),
      // The mail server's last answer for this recipient ("250 …", "550 …") or why it could not be reached.
      detail: nullable.varchar(500),
      accepted_at: nullable.dateTime(),
      ...timestamps(),
    });
    await qi.addIndex("filing_deliveries", ["filing_id", "recipient"], {
      unique: true,
      name: "filing_deliveries_one_per_recipient",
    });
    await qi.addIndex("filing_deliveries", ["status"], { name: "filing_deliveries_status" });
    await qi.changeColumn("filings", "delivery", delivery(["pending", "partial", "sent"], "pending"));
    await qi.addColumn("filings", "acknowledged_sha256", nullable.char(64));

    const [filings] = await qi.sequelize.query(
      "SELECT id, recipients_json, delivery, message_id, sent_at, pack_sha256, acknowledged_at FROM filings",
    );
    for (const f of filings) {
      const messageId = f.message_id ?? `<filing-${f.id}-${randomBytes(12).toString("hex")}@quartermark>`;
      await qi.sequelize.query(
        "UPDATE filings SET message_id = :messageId, acknowledged_sha256 = :ack WHERE id = :id",
        { replacements: { id: f.id, messageId, ack: f.acknowledged_at ? f.pack_sha256 : null } },
      );
      for (const recipient of JSON.parse(f.recipients_json)) {
        const sent = f.delivery === "sent";
        await qi.bulkInsert("filing_deliveries", [
          {
            filing_id: f.id,
            recipient,
            status: sent ? "accepted" : "pending",
            attempts: sent ? 1 : 0,
            detail: sent ? "accepted before per-recipient delivery was recorded" : null,
            accepted_at: sent ? f.sent_at : null,
          },
        ]);
      }
    }
  },

  async down(qi) {
    await qi.removeColumn("filings", "acknowledged_sha256");
    await qi.sequelize.query("UPDATE filings SET delivery = 'sent' WHERE delivery = 'partial'");
    await qi.changeColumn("filings", "delivery", delivery(["pending", "sent"], "sent"));
    await qi.dropTable("filing_deliveries");
  },
};
