"use strict";
/** Uploads, versioned daily observations and data-quality findings. */
const { id, bigId, now, timestamps, version, notNull, nullable } = require("./support/columns.cjs");

/** One of the upload's row counts, 0 until the file is checked. */
const count = () => ({ ...notNull.integer(), defaultValue: 0 });

module.exports = {
  async up(qi) {
    await qi.createTable("uploads", {
      id: id(),
      file_name: notNull.varchar(255),
      sha256: notNull.char(64),
      // Set only once committed: the unique index makes "the same file twice" impossible, even at once.
      committed_sha256: { ...nullable.char(64), unique: true },
      size_bytes: notNull.integer(),
      // The uploaded file, gzip-compressed (server/modules/uploads/stored-bytes.ts).
      content: nullable.blob("long"),
      // The preview's valid rows, already checked and converted, so the commit need not parse the file again (gzip).
      checked_rows: nullable.blob("long"),
      uploaded_by: notNull.ref("users"),
      status: notNull.oneOf("preview", "committed", "discarded"),
      row_count: count(),
      valid_count: count(),
      invalid_count: count(),
      new_count: count(),
      restated_count: count(),
      unchanged_count: count(),
      inserted_count: nullable.integer(),
      errors_json: nullable.text("long"),
      summary_json: nullable.text(),
      committed_at: nullable.dateTime(),
      ...timestamps(),
    });
    await qi.addIndex("uploads", ["sha256"], { name: "uploads_sha256" });

    await qi.createTable("observations", {
      id: bigId(),
      portfolio_id: notNull.ref("portfolios"),
      business_date: notNull.dateOnly(),
      version: notNull.integer(),
      is_current: notNull.boolean(),
      actual_pnl: nullable.money(),
      hypothetical_pnl: nullable.money(),
      var_99: nullable.money(),
      var_975: nullable.money(),
      svar_99: nullable.money(),
      var_10d: nullable.money(),
      svar_10d: nullable.money(),
      es_975: nullable.money(),
      ses: nullable.money(),
      rtpl: nullable.money(),
      upload_id: notNull.ref("uploads"),
      created_by: notNull.integer(),
      created_at: now(),
    });
    await qi.addIndex("observations", ["portfolio_id", "business_date", "version"], {
      unique: true,
      name: "observations_version",
    });
    // At most one current version per portfolio and day, enforced by the database itself; the same
    // index serves every read of the current series (WHERE portfolio_id = ? AND current_day …).
    await qi.sequelize.query(
      "ALTER TABLE observations ADD COLUMN current_day DATE AS (IF(is_current, business_date, NULL)) PERSISTENT, " +
        "ADD UNIQUE INDEX observations_one_current (portfolio_id, current_day)",
    );

    await qi.createTable("data_findings", {
      id: id(),
      portfolio_id: notNull.ref("portfolios"),
      kind: notNull.oneOf("missing_day", "stale_var", "pnl_without_var", "var_without_pnl", "outlier"),
      date_from: notNull.dateOnly(),
      date_to: notNull.dateOnly(),
      detail: notNull.varchar(500),
      status: { ...notNull.oneOf("open", "resolved", "explained"), defaultValue: "open" },
      note: nullable.text(),
      closed_by: nullable.integer(),
      closed_at: nullable.dateTime(),
      version: version(),
      ...timestamps(),
    });
    await qi.addIndex("data_findings", ["portfolio_id", "kind", "date_from"], {
      unique: true,
      name: "data_findings_key",
    });
  },

  async down(qi) {
    await qi.dropTable("data_findings");
    await qi.dropTable("observations");
    await qi.dropTable("uploads");
  },
};
