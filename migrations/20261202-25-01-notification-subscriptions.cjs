"use strict";
/**
 * Which e-mail notifications a person has chosen to receive: one row per person and kind (only
 * kinds whose audience includes their role). Nobody is sent anything they did not choose.
 */
module.exports = {
  async up(qi, Sequelize) {
    const { DataTypes } = Sequelize;
    await qi.createTable("notification_subscriptions", {
      user_id: {
        type: DataTypes.INTEGER,
        allowNull: false,
        primaryKey: true,
        references: { model: "users", key: "id" },
        onDelete: "CASCADE",
      },
      kind: { type: DataTypes.STRING(40), allowNull: false, primaryKey: true },
      created_at: {
        type: DataTypes.DATE(3),
        allowNull: false,
        defaultValue: Sequelize.literal("CURRENT_TIMESTAMP(3)"),
      },
    });
  },

  async down(qi) {
    await qi.dropTable("notification_subscriptions");
  },
};
