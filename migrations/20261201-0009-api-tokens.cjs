"use strict";
/**
 * Personal API tokens (docs/architecture.md#roles: treasury creates them for scripts). Only the SHA-256 of the
 * secret is stored, unique so that a presented token is found by its hash; the prefix is the
 * non-secret start of it, shown in lists so people can tell their tokens apart.
 */
const { id, now, notNull, nullable } = require("./support/columns.cjs");

module.exports = {
  async up(qi) {
    await qi.createTable("api_tokens", {
      id: id(),
      user_id: notNull.ref("users", { onDelete: "CASCADE" }),
      name: notNull.varchar(80),
      token_hash: { ...notNull.char(64), unique: true },
      prefix: notNull.varchar(16),
      created_at: now(),
      last_used_at: nullable.dateTime(),
      expires_at: notNull.dateTime(),
      revoked_at: nullable.dateTime(),
    });
    await qi.addIndex("api_tokens", ["user_id", "created_at"], { name: "api_tokens_user_created" });
  },

  async down(qi) {
    await qi.dropTable("api_tokens");
  },
};
