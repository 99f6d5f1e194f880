"use strict";
/** Uploads, versioned daily observations and data-quality findings. */
module.exports = {
  async up(qi, Sequelize) {
    const { DataTypes } = Sequelize;
    const now = () => ({
      type: DataTypes.DATE(3),
      allowNull: false,
      defaultValue: Sequelize.literal("CURRENT_TIMESTAMP(3)"),
    });
    const money = () => ({ type: DataTypes.DECIMAL(20, 2), allowNull: true });

    await qi.createTable("uploads", {
      id: { type: DataTypes.INTEGER, primaryKey: true, autoIncrement: true },
      file_name: { type: DataTypes.STRING(255), allowNull: false },
      sha256: { type: DataTypes.CHAR(64), allowNull: false },
      // Set only once committed: the unique index makes "the same file twice" impossible, even at once.
      committed_sha256: { type: DataTypes.CHAR(64), allowNull: true, unique: true },
      size_bytes: { type: DataTypes.INTEGER, allowNull: false },
      // The uploaded file, gzip-compressed (server/modules/uploads/stored-bytes.ts).
      content: { type: DataTypes.BLOB("long"), allowNull: true },
      // The preview's valid rows, already checked and converted, so the commit need not parse the file again (gzip).
      checked_rows: { type: DataTypes.BLOB("long"), allowNull: true },
      uploaded_by: { type: DataTypes.INTEGER, allowNull: false, references: { model: "users", key: "id" } },
      status: { type: DataTypes.ENUM("preview", "committed", "discarded"), allowNull: false },
      row_count: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 0 },
      valid_count: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 0 },
      invalid_count: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 0 },
      new_count: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 0 },
      restated_count: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 0 },
      unchanged_count: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 0 },
      inserted_count: { type: DataTypes.INTEGER, allowNull: true },
      errors_json: { type: DataTypes.TEXT("long"), allowNull: true },
      summary_json: { type: DataTypes.TEXT, allowNull: true },
      committed_at: { type: DataTypes.DATE(3), allowNull: true },
      created_at: now(),
      updated_at: now(),
    });
    await qi.addIndex("uploads", ["sha256"], { name: "uploads_sha256" });

    await qi.createTable("observations", {
      id: { type: DataTypes.BIGINT, primaryKey: true, autoIncrement: true },
      portfolio_id: { type: DataTypes.INTEGER, allowNull: false, references: { model: "portfolios", key: "id" } },
      business_date: { type: DataTypes.DATEONLY, allowNull: false },
      version: { type: DataTypes.INTEGER, allowNull: false },
      is_current: { type: DataTypes.BOOLEAN, allowNull: false },
      actual_pnl: money(),
      hypothetical_pnl: money(),
      var_99: money(),
      var_975: money(),
      svar_99: money(),
      var_10d: money(),
      svar_10d: money(),
      es_975: money(),
      ses: money(),
      rtpl: money(),
      upload_id: { type: DataTypes.INTEGER, allowNull: false, references: { model: "uploads", key: "id" } },
      created_by: { type: DataTypes.INTEGER, allowNull: false },
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
      id: { type: DataTypes.INTEGER, primaryKey: true, autoIncrement: true },
      portfolio_id: { type: DataTypes.INTEGER, allowNull: false, references: { model: "portfolios", key: "id" } },
      kind: {
        type: DataTypes.ENUM("missing_day", "stale_var", "pnl_without_var", "var_without_pnl", "outlier"),
        allowNull: false,
      },
      date_from: { type: DataTypes.DATEONLY, allowNull: false },
      date_to: { type: DataTypes.DATEONLY, allowNull: false },
      detail: { type: DataTypes.STRING(500), allowNull: false },
      status: { type: DataTypes.ENUM("open", "resolved", "explained"), allowNull: false, defaultValue: "open" },
      note: { type: DataTypes.TEXT, allowNull: true },
      closed_by: { type: DataTypes.INTEGER, allowNull: true },
      closed_at: { type: DataTypes.DATE(3), allowNull: true },
      version: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 1 },
      created_at: now(),
      updated_at: now(),
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
