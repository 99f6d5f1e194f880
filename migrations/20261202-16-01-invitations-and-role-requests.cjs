"use strict";
/**
 * Separation of duties. An administrator no longer chooses anyone's password: a user is created
 * by invitation (a one-time link by e-mail), so `users.password_hash` is empty until the invitee
 * sets it. `user_invitations` keeps each link (set a first password, or a new one) by the SHA-256
 * of its token only, with its expiry, use and withdrawal. `role_requests` keeps each grant or
 * removal of the CRO or administrator role, proposed by one administrator and approved or
 * rejected by another; `pending_email` lets only one request per person wait at a time.
 */
const ROLES = ["analyst", "cro", "treasury", "regulator", "admin"];

module.exports = {
  async up(qi, Sequelize) {
    const { DataTypes } = Sequelize;
    await qi.changeColumn("users", "password_hash", { type: DataTypes.STRING(100), allowNull: true });

    await qi.createTable("user_invitations", {
      id: { type: DataTypes.INTEGER, primaryKey: true, autoIncrement: true },
      user_id: {
        type: DataTypes.INTEGER,
        allowNull: false,
        references: { model: "users", key: "id" },
        onDelete: "CASCADE",
      },
      purpose: { type: DataTypes.ENUM("invite", "reset"), allowNull: false },
      token_hash: { type: DataTypes.CHAR(64), allowNull: false, unique: true },
      created_by: { type: DataTypes.INTEGER, allowNull: true, references: { model: "users", key: "id" } },
      created_at: {
        type: DataTypes.DATE(3),
        allowNull: false,
        defaultValue: Sequelize.literal("CURRENT_TIMESTAMP(3)"),
      },
      expires_at: { type: DataTypes.DATE(3), allowNull: false },
      used_at: { type: DataTypes.DATE(3), allowNull: true },
      revoked_at: { type: DataTypes.DATE(3), allowNull: true },
    });
    await qi.addIndex("user_invitations", ["user_id", "created_at"], { name: "user_invitations_user_created" });

    await qi.createTable("role_requests", {
      id: { type: DataTypes.INTEGER, primaryKey: true, autoIncrement: true },
      kind: { type: DataTypes.ENUM("invite", "change"), allowNull: false },
      user_id: {
        type: DataTypes.INTEGER,
        allowNull: true,
        references: { model: "users", key: "id" },
        onDelete: "CASCADE",
      },
      email: { type: DataTypes.STRING(190), allowNull: false },
      name: { type: DataTypes.STRING(120), allowNull: false },
      from_role: { type: DataTypes.ENUM(...ROLES), allowNull: true },
      to_role: { type: DataTypes.ENUM(...ROLES), allowNull: false },
      status: { type: DataTypes.ENUM("pending", "approved", "rejected"), allowNull: false, defaultValue: "pending" },
      proposed_by: { type: DataTypes.INTEGER, allowNull: false, references: { model: "users", key: "id" } },
      proposed_at: {
        type: DataTypes.DATE(3),
        allowNull: false,
        defaultValue: Sequelize.literal("CURRENT_TIMESTAMP(3)"),
      },
      decided_by: { type: DataTypes.INTEGER, allowNull: true, references: { model: "users", key: "id" } },
      decided_at: { type: DataTypes.DATE(3), allowNull: true },
    });
    await qi.sequelize.query(
      "ALTER TABLE role_requests ADD COLUMN pending_email VARCHAR(190) AS (IF(status = 'pending', email, NULL)) PERSISTENT, " +
        "ADD UNIQUE INDEX role_requests_one_pending (pending_email)",
    );
  },

  async down(qi, Sequelize) {
    const { DataTypes } = Sequelize;
    await qi.dropTable("role_requests");
    await qi.dropTable("user_invitations");
    // Accounts still waiting for their first password get one nobody can match ("!" is no bcrypt hash).
    await qi.sequelize.query("UPDATE users SET password_hash = '!' WHERE password_hash IS NULL");
    await qi.changeColumn("users", "password_hash", { type: DataTypes.STRING(100), allowNull: false });
  },
};
