"use strict";
/** Filings: a signed-off snapshot's pack sent to the supervisor, and their acknowledgement (server/modules/filings). */
module.exports = {
  async up(qi, Sequelize) {
    const { DataTypes } = Sequelize;
    const now = () => ({
      type: DataTypes.DATE(3),
      allowNull: false,
      defaultValue: Sequelize.literal("CURRENT_TIMESTAMP(3)"),
    });
    await qi.createTable("filings", {
      id: { type: DataTypes.INTEGER, primaryKey: true, autoIncrement: true },
      snapshot_id: {
        type: DataTypes.INTEGER,
        allowNull: false,
        unique: true,
        references: { model: "snapshots", key: "id" },
      },
      // The pack exactly as sent; its sha256 is what a supervisor verifies.
      pack_pdf: { type: DataTypes.BLOB("long"), allowNull: false },
      pack_sha256: { type: DataTypes.CHAR(64), allowNull: false },
      file_name: { type: DataTypes.STRING(255), allowNull: false },
      recipients_json: { type: DataTypes.TEXT, allowNull: false },
      message_id: { type: DataTypes.STRING(255), allowNull: false },
      sent_by: { type: DataTypes.INTEGER, allowNull: false, references: { model: "users", key: "id" } },
      sent_at: { type: DataTypes.DATE(3), allowNull: false },
      acknowledged_by: { type: DataTypes.INTEGER, allowNull: true, references: { model: "users", key: "id" } },
      acknowledged_at: { type: DataTypes.DATE(3), allowNull: true },
      created_at: now(),
      updated_at: now(),
    });
  },

  async down(qi) {
    await qi.dropTable("filings");
  },
};
