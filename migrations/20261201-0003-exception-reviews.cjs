"use strict";
/** Exception reviews (cause, narrative, exclusion request and the supervisor's decision) and their evidence files. */
const { id, now, timestamps, version, notNull, nullable } = require("./support/columns.cjs");

module.exports = {
  async up(qi) {
    await qi.createTable("exception_reviews", {
      id: id(),
      portfolio_id: notNull.ref("portfolios"),
      business_date: notNull.dateOnly(),
      cause: notNull.oneOf("market_move", "model_limitation", "data_issue", "intraday_trading", "pricing", "other"),
      narrative: notNull.text(),
      exclusion_status: { ...notNull.oneOf("none", "requested", "approved", "rejected"), defaultValue: "none" },
      decision_reference: nullable.varchar(120),
      decision_date: nullable.dateOnly(),
      decided_by: nullable.ref("users"),
      reviewed_by: notNull.ref("users"),
      version: version(),
      ...timestamps(),
    });
    await qi.addIndex("exception_reviews", ["portfolio_id", "business_date"], {
      unique: true,
      name: "exception_reviews_day",
    });

    await qi.createTable("evidence_files", {
      id: id(),
      review_id: notNull.ref("exception_reviews"),
      file_name: notNull.varchar(255),
      content_type: notNull.varchar(100),
      size_bytes: notNull.integer(),
      sha256: notNull.char(64),
      content: notNull.blob("long"),
      uploaded_by: notNull.ref("users"),
      created_at: now(),
    });
  },
  async down(qi) {
    await qi.dropTable("evidence_files");
    await qi.dropTable("exception_reviews");
  },
};
