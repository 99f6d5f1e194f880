"use strict";
/**
 * Separation of duties. An administrator no longer chooses anyone's password: a user is created
 * by invitation (a one-time link by e-mail), so `users.password_hash` is empty until the invitee
 * sets it. `user_invitations` keeps each link (set a first password, or a new one) by the SHA-256
 * of its token only, with its expiry, use and withdrawal. `role_requests` keeps each grant or
 * removal of the CRO or administrator role, proposed by one administrator and approved or
 * rejected by another; `pending_email` lets only one request per person wait at a time.
 */
const { id, now, notNull, nullable } = require("./support/columns.cjs");

const ROLES = ["analyst", "cro", "treasury", "regulator", "admin"];

module.exports = {
  async up(qi) {
    await qi.changeColumn("users", "password_hash", nullable.varchar(100));

    await qi.createTable("user_invitations", {
      id: id(),
      user_id: notNull.ref("users", { onDelete: "CASCADE" }),
      purpose: notNull.oneOf("invite", "reset"),
      token_hash: { ...notNull.char(64), unique: true },
      created_by: nullable.ref("users"),
      created_at: now(),
      expires_at: notNull.dateTime(),
      used_at: nullable.dateTime(),
      revoked_at: nullable.dateTime(),
    });
    await qi.addIndex("user_invitations", ["user_id", "created_at"], { name: "user_invitations_user_created" });

    await qi.createTable("role_requests", {
      id: id(),
      kind: notNull.oneOf("invite", "change"),
      user_id: nullable.ref("users", { onDelete: "CASCADE" }),
      email: notNull.varchar(190),
      name: notNull.varchar(120),
      from_role: nullable.oneOf(...ROLES),
      to_role: notNull.oneOf(...ROLES),
      status: { ...notNull.oneOf("pending", "approved", "rejected"), defaultValue: "pending" },
      proposed_by: notNull.ref("users"),
      proposed_at: now(),
      decided_by: nullable.ref("users"),
      decided_at: nullable.dateTime(),
    });
    await qi.sequelize.query(
      "ALTER TABLE role_requests ADD COLUMN pending_email VARCHAR(190) AS (IF(status = 'pending', email, NULL)) PERSISTENT, " +
        "ADD UNIQUE INDEX role_requests_one_pending (pending_email)",
    );
  },

  async down(qi) {
    await qi.dropTable("role_requests");
    await qi.dropTable("user_invitations");
    // Accounts still waiting for their first password get one nobody can match ("!" is no bcrypt hash).
    await qi.sequelize.query("UPDATE users SET password_hash = '!' WHERE password_hash IS NULL");
    await qi.changeColumn("users", "password_hash", notNull.varchar(100));
  },
};
