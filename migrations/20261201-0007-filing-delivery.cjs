"use strict";
/**
 * Filings wait for the mail server when it does not answer: a filing is kept as `pending` and
 * sent by the delivery loop once the server is back (server/modules/filings/delivery.ts).
 */
const { notNull, nullable } = require("./support/columns.cjs");

module.exports = {
  async up(qi) {
    await qi.addColumn("filings", "delivery", { ...notNull.oneOf("pending", "sent"), defaultValue: "sent" });
    await qi.addColumn("filings", "attempts", { ...notNull.integer(), defaultValue: 1 });
    await qi.addColumn("filings", "last_error", nullable.varchar(500));
    await qi.changeColumn("filings", "message_id", nullable.varchar(255));
    await qi.changeColumn("filings", "sent_at", nullable.dateTime());
    await qi.addIndex("filings", ["delivery"], { name: "filings_delivery" });
  },

  async down(qi) {
    await qi.removeIndex("filings", "filings_delivery");
    await qi.sequelize.query("DELETE FROM filings WHERE delivery = 'pending'");
    await qi.changeColumn("filings", "sent_at", notNull.dateTime());
    await qi.changeColumn("filings", "message_id", notNull.varchar(255));
    await qi.removeColumn("filings", "last_error");
    await qi.removeColumn("filings", "attempts");
    await qi.removeColumn("filings", "delivery");
  },
};
