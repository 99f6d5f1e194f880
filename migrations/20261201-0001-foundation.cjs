"use strict";
/** Users, entities, portfolios, holiday calendars, regulator assignments and the audit log. */
const { id, bigId, now, timestamps, version, notNull, nullable } = require("./support/columns.cjs");

module.exports = {
  async up(qi) {
    await qi.createTable("users", {
      id: id(),
      email: { ...notNull.varchar(190), unique: true },
      name: notNull.varchar(120),
      role: notNull.oneOf("analyst", "cro", "treasury", "regulator", "admin"),
      password_hash: notNull.varchar(100),
      disabled: { ...notNull.boolean(), defaultValue: false },
      token_version: { ...notNull.integer(), defaultValue: 1 },
      last_sign_in_at: nullable.dateTime(),
      ...timestamps(),
    });

    await qi.createTable("entities", {
      id: id(),
      code: { ...notNull.varchar(20), unique: true },
      name: notNull.varchar(120),
      regime: notNull.oneOf("basel", "us", "eu", "frtb"),
      pnl_basis: notNull.oneOf("actual", "hypothetical", "max"),
      currency: notNull.char(3),
      qualitative_addend: { ...notNull.decimal(6, 4), defaultValue: 0 },
      supervisor_name: nullable.varchar(120),
      supervisor_emails: notNull.text(),
      // Row version: two admins editing the same entity cannot both win (optimistic locking).
      version: version(),
      ...timestamps(),
    });

    await qi.createTable("portfolios", {
      id: id(),
      entity_id: notNull.ref("entities", { onDelete: "RESTRICT" }),
      code: { ...notNull.varchar(40), unique: true },
      name: notNull.varchar(120),
      level: notNull.oneOf("top", "desk"),
      ...timestamps(),
    });

    await qi.createTable("holidays", {
      id: id(),
      entity_id: notNull.ref("entities", { onDelete: "CASCADE" }),
      date: notNull.dateOnly(),
      name: notNull.varchar(120),
      ...timestamps(),
    });
    await qi.addIndex("holidays", ["entity_id", "date"], { unique: true, name: "holidays_entity_date" });

    await qi.createTable("regulator_assignments", {
      user_id: notNull.ref("users", { primaryKey: true, onDelete: "CASCADE" }),
      entity_id: notNull.ref("entities", { primaryKey: true, onDelete: "CASCADE" }),
      created_at: now(),
    });

    await qi.createTable("audit_events", {
      id: bigId(),
      at: now(),
      actor_user_id: nullable.integer(),
      actor_email: nullable.varchar(190),
      action: notNull.varchar(60),
      target: nullable.varchar(190),
      ip: nullable.varchar(64),
      request_id: nullable.varchar(64),
      before_json: nullable.text("long"),
      after_json: nullable.text("long"),
    });
    await qi.addIndex("audit_events", ["at"], { name: "audit_events_at" });
    await qi.addIndex("audit_events", ["action"], { name: "audit_events_action" });
  },

  async down(qi) {
    await qi.dropTable("audit_events");
    await qi.dropTable("regulator_assignments");
    await qi.dropTable("holidays");
    await qi.dropTable("portfolios");
    await qi.dropTable("entities");
    await qi.dropTable("users");
  },
};
