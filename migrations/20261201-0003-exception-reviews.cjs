"use strict";
/** Exception reviews (cause, narrative, exclusion request and the supervisor's decision) and their evidence files. */
module.exports = {
  async up(qi, Sequelize) {
    const { DataTypes } = Sequelize;
    const now = () => ({
      type: DataTypes.DATE(3),
      allowNull: false,
      defaultValue: Sequelize.literal("CURRENT_TIMESTAMP(3)"),
    });
    await qi.createTable("exception_reviews", {
      id: { type: DataTypes.INTEGER, primaryKey: true, autoIncrement: true },
      portfolio_id: { type: DataTypes.INTEGER, allowNull: false, references: { model: "portfolios", key: "id" } },
      business_date: { type: DataTypes.DATEONLY, allowNull: false },
      cause: {
        type: DataTypes.ENUM("market_move", "model_limitation", "data_issue", "intraday_trading", "pricing", "other"),
        allowNull: false,
      },
      narrative: { type: DataTypes.TEXT, allowNull: false },
      exclusion_status: {
        type: DataTypes.ENUM("none", "requested", "approved", "rejected"),
        allowNull: false,
        defaultValue: "none",
      },
      decision_reference: { type: DataTypes.STRING(120), allowNull: true },
      decision_date: { type: DataTypes.DATEONLY, allowNull: true },
      decided_by: { type: DataTypes.INTEGER, allowNull: true, references: { model: "users", key: "id" } },
      reviewed_by: { type: DataTypes.INTEGER, allowNull: false, references: { model: "users", key: "id" } },
      version: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 1 },
      created_at: now(),
      updated_at: now(),
    });
    await qi.addIndex("exception_reviews", ["portfolio_id", "business_date"], {
      unique: true,
      name: "exception_reviews_day",
    });

    await qi.createTable("evidence_files", {
      id: { type: DataTypes.INTEGER, primaryKey: true, autoIncrement: true },
      review_id: { type: DataTypes.INTEGER, allowNull: false, references: { model: "exception_reviews", key: "id" } },
      file_name: { type: DataTypes.STRING(255), allowNull: false },
      content_type: { type: DataTypes.STRING(100), allowNull: false },
      size_bytes: { type: DataTypes.INTEGER, allowNull: false },
      sha256: { type: DataTypes.CHAR(64), allowNull: false },
      content: { type: DataTypes.BLOB("long"), allowNull: false },
      uploaded_by: { type: DataTypes.INTEGER, allowNull: false, references: { model: "users", key: "id" } },
      created_at: now(),
    });
  },
  async down(qi) {
    await qi.dropTable("evidence_files");
    await qi.dropTable("exception_reviews");
  },
};
