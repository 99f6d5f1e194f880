"use strict";
/**
 * Overshooting notices (docs/rules.md#overshooting-notice): one row per overshooting of an EU
 * entity's top-of-house book, opened by the upload commit that revealed it, due five working days
 * later on the entity's calendar. The analyst drafts the cause (version: optimistic locking), the
 * CRO sends it; a restatement that leaves the day no overshooting withdraws an unsent one (kept).
 * `reminded_at` is claimed once by whichever server process sends the "coming due" e-mail.
 */
module.exports = {
  async up(qi, Sequelize) {
    const { DataTypes } = Sequelize;
    const money = { type: DataTypes.DECIMAL(20, 2), allowNull: true };
    const who = { type: DataTypes.INTEGER, allowNull: true, references: { model: "users", key: "id" } };
    await qi.createTable("overshooting_notices", {
      id: { type: DataTypes.INTEGER, primaryKey: true, autoIncrement: true },
      portfolio_id: {
        type: DataTypes.INTEGER,
        allowNull: false,
        references: { model: "portfolios", key: "id" },
        onDelete: "CASCADE",
      },
      business_date: { type: DataTypes.DATEONLY, allowNull: false },
      status: { type: DataTypes.ENUM("open", "sent", "withdrawn"), allowNull: false, defaultValue: "open" },
      revealed_on: { type: DataTypes.DATEONLY, allowNull: false },
      due_on: { type: DataTypes.DATEONLY, allowNull: false },
      upload_id: { type: DataTypes.INTEGER, allowNull: true, references: { model: "uploads", key: "id" } },
      series: { type: DataTypes.ENUM("actual", "hypothetical", "both"), allowNull: false },
      actual_pnl: money,
      hypothetical_pnl: money,
      var_99: money,
      excess: money,
      cause: { type: DataTypes.TEXT, allowNull: true },
      drafted_by: who,
      drafted_at: { type: DataTypes.DATE(3), allowNull: true },
      sent_by: who,
      sent_at: { type: DataTypes.DATE(3), allowNull: true },
      recipients_json: { type: DataTypes.TEXT, allowNull: true },
      message_id: { type: DataTypes.STRING(200), allowNull: true },
      pdf_sha256: { type: DataTypes.CHAR(64), allowNull: true },
      withdrawn_at: { type: DataTypes.DATE(3), allowNull: true },
      note: { type: DataTypes.STRING(500), allowNull: true },
      reminded_at: { type: DataTypes.DATE(3), allowNull: true },
      version: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 1 },
      created_at: {
        type: DataTypes.DATE(3),
        allowNull: false,
        defaultValue: Sequelize.literal("CURRENT_TIMESTAMP(3)"),
      },
      updated_at: {
        type: DataTypes.DATE(3),
        allowNull: false,
        defaultValue: Sequelize.literal("CURRENT_TIMESTAMP(3)"),
      },
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
