"use strict";
/** Users, entities, portfolios, holiday calendars, regulator assignments and the audit log. */
module.exports = {
  async up(qi, Sequelize) {
    const { DataTypes } = Sequelize;
    const timestamps = {
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
    };

    await qi.createTable("users", {
      id: { type: DataTypes.INTEGER, primaryKey: true, autoIncrement: true },
      email: { type: DataTypes.STRING(190), allowNull: false, unique: true },
      name: { type: DataTypes.STRING(120), allowNull: false },
      role: { type: DataTypes.ENUM("analyst", "cro", "treasury", "regulator", "admin"), allowNull: false },
      password_hash: { type: DataTypes.STRING(100), allowNull: false },
      disabled: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: false },
      token_version: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 1 },
      last_sign_in_at: { type: DataTypes.DATE(3), allowNull: true },
      ...timestamps,
    });

    await qi.createTable("entities", {
      id: { type: DataTypes.INTEGER, primaryKey: true, autoIncrement: true },
      code: { type: DataTypes.STRING(20), allowNull: false, unique: true },
      name: { type: DataTypes.STRING(120), allowNull: false },
      regime: { type: DataTypes.ENUM("basel", "us", "eu", "frtb"), allowNull: false },
      pnl_basis: { type: DataTypes.ENUM("actual", "hypothetical", "max"), allowNull: false },
      currency: { type: DataTypes.CHAR(3), allowNull: false },
      qualitative_addend: { type: DataTypes.DECIMAL(6, 4), allowNull: false, defaultValue: 0 },
      supervisor_name: { type: DataTypes.STRING(120), allowNull: true },
      supervisor_emails: { type: DataTypes.TEXT, allowNull: false },
      // Row version: two admins editing the same entity cannot both win (optimistic locking).
      version: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 1 },
      ...timestamps,
    });

    await qi.createTable("portfolios", {
      id: { type: DataTypes.INTEGER, primaryKey: true, autoIncrement: true },
      entity_id: {
        type: DataTypes.INTEGER,
        allowNull: false,
        references: { model: "entities", key: "id" },
        onDelete: "RESTRICT",
      },
      code: { type: DataTypes.STRING(40), allowNull: false, unique: true },
      name: { type: DataTypes.STRING(120), allowNull: false },
      level: { type: DataTypes.ENUM("top", "desk"), allowNull: false },
      ...timestamps,
    });

    await qi.createTable("holidays", {
      id: { type: DataTypes.INTEGER, primaryKey: true, autoIncrement: true },
      entity_id: {
        type: DataTypes.INTEGER,
        allowNull: false,
        references: { model: "entities", key: "id" },
        onDelete: "CASCADE",
      },
      date: { type: DataTypes.DATEONLY, allowNull: false },
      name: { type: DataTypes.STRING(120), allowNull: false },
      ...timestamps,
    });
    await qi.addIndex("holidays", ["entity_id", "date"], { unique: true, name: "holidays_entity_date" });

    await qi.createTable("regulator_assignments", {
      user_id: {
        type: DataTypes.INTEGER,
        allowNull: false,
        primaryKey: true,
        references: { model: "users", key: "id" },
        onDelete: "CASCADE",
      },
      entity_id: {
        type: DataTypes.INTEGER,
        allowNull: false,
        primaryKey: true,
        references: { model: "entities", key: "id" },
        onDelete: "CASCADE",
      },
      created_at: timestamps.created_at,
    });

    await qi.createTable("audit_events", {
      id: { type: DataTypes.BIGINT, primaryKey: true, autoIncrement: true },
      at: { type: DataTypes.DATE(3), allowNull: false, defaultValue: Sequelize.literal("CURRENT_TIMESTAMP(3)") },
      actor_user_id: { type: DataTypes.INTEGER, allowNull: true },
      actor_email: { type: DataTypes.STRING(190), allowNull: true },
      action: { type: DataTypes.STRING(60), allowNull: false },
      target: { type: DataTypes.STRING(190), allowNull: true },
      ip: { type: DataTypes.STRING(64), allowNull: true },
      request_id: { type: DataTypes.STRING(64), allowNull: true },
      before_json: { type: DataTypes.TEXT("long"), allowNull: true },
      after_json: { type: DataTypes.TEXT("long"), allowNull: true },
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
