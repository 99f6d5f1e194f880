"use strict";
/**
 * Personal API tokens (docs/architecture.md#roles: treasury creates them for scripts). Only the SHA-256 of the
 * secret is stored, unique so that a presented token is found by its hash; the prefix is the
 * non-secret start of it, shown in lists so people can tell their tokens apart.
 */
module.exports = {
  async up(qi, Sequelize) {
    const { DataTypes } = Sequelize;
    await qi.createTable("api_tokens", {
      id: { type: DataTypes.INTEGER, primaryKey: true, autoIncrement: true },
      user_id: {
        type: DataTypes.INTEGER,
        allowNull: false,
        references: { model: "users", key: "id" },
        onDelete: "CASCADE",
      },
      name: { type: DataTypes.STRING(80), allowNull: false },
      token_hash: { type: DataTypes.CHAR(64), allowNull: false, unique: true },
      prefix: { type: DataTypes.STRING(16), allowNull: false },
      created_at: {
        type: DataTypes.DATE(3),
        allowNull: false,
        defaultValue: Sequelize.literal("CURRENT_TIMESTAMP(3)"),
      },
      last_used_at: { type: DataTypes.DATE(3), allowNull: true },
      expires_at: { type: DataTypes.DATE(3), allowNull: false },
      revoked_at: { type: DataTypes.DATE(3), allowNull: true },
    });
    await qi.addIndex("api_tokens", ["user_id", "created_at"], { name: "api_tokens_user_created" });
  },

  async down(qi) {
    await qi.dropTable("api_tokens");
  },
};
