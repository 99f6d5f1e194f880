"use strict";
/**
 * The migrations' column kit: what their tables repeat, written once, so that a migration states
 * only what is particular to its tables (the models' twin is server/models/kit.ts).
 *
 *   const { id, notNull, nullable, timestamps, version } = require("./support/columns.cjs");
 *   await qi.createTable("notes", {
 *     id: id(),
 *     portfolio_id: notNull.ref("portfolios", { onDelete: "CASCADE" }),
 *     body: notNull.text(),
 *     kind: { ...notNull.oneOf("plain", "urgent"), defaultValue: "plain" },
 *     version: version(),
 *     ...timestamps(),
 *   });
 *
 * Every helper returns a new attribute object for queryInterface.createTable / addColumn /
 * changeColumn. Migrations that have run must keep producing the same schema: never change what a
 * helper returns; add a helper instead. Not a migration itself: the migrator's glob is
 * migrations/*.cjs, which does not reach this folder.
 */
const { DataTypes, literal } = require("sequelize");

/** The INTEGER AUTO_INCREMENT primary key `id`. */
const id = () => ({ type: DataTypes.INTEGER, primaryKey: true, autoIncrement: true });

/** The BIGINT AUTO_INCREMENT primary key `id`, for tables that grow by the million. */
const bigId = () => ({ type: DataTypes.BIGINT, primaryKey: true, autoIncrement: true });

/** An instant set by the database when the row is written: DATETIME(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3). */
const now = () => ({ type: DataTypes.DATE(3), allowNull: false, defaultValue: literal("CURRENT_TIMESTAMP(3)") });

/** created_at and updated_at, both now(). */
const timestamps = () => ({ created_at: now(), updated_at: now() });

/** The row version of optimistic locking (server/kit/stale.ts): 1 when created. */
const version = () => ({ type: DataTypes.INTEGER, allowNull: false, defaultValue: 1 });

/** The column types, in `notNull` and `nullable` forms (`note: nullable.text()`). */
function columnTypes(allowNull) {
  return {
    integer: () => ({ type: DataTypes.INTEGER, allowNull }),
    bigint: () => ({ type: DataTypes.BIGINT, allowNull }),
    double: () => ({ type: DataTypes.DOUBLE, allowNull }),
    boolean: () => ({ type: DataTypes.BOOLEAN, allowNull }),
    decimal: (precision, scale) => ({ type: DataTypes.DECIMAL(precision, scale), allowNull }),
    /** An amount of money: DECIMAL(20,2). */
    money: () => ({ type: DataTypes.DECIMAL(20, 2), allowNull }),
    /** A calendar day (DATE). */
    dateOnly: () => ({ type: DataTypes.DATEONLY, allowNull }),
    /** An instant (DATETIME(3)). */
    dateTime: () => ({ type: DataTypes.DATE(3), allowNull }),
    varchar: (length) => ({ type: DataTypes.STRING(length), allowNull }),
    /** Fixed length: CHAR(64) holds a sha256 or an HMAC in hex. */
    char: (length) => ({ type: DataTypes.CHAR(length), allowNull }),
    /** TEXT, or MEDIUMTEXT / LONGTEXT with "medium" / "long". */
    text: (length) => ({ type: length ? DataTypes.TEXT(length) : DataTypes.TEXT, allowNull }),
    /** MEDIUMBLOB or LONGBLOB. */
    blob: (length) => ({ type: DataTypes.BLOB(length), allowNull }),
    oneOf: (...values) => ({ type: DataTypes.ENUM(...values), allowNull }),
    /**
     * A foreign key to `table`.id (INTEGER); `more` adds what is particular to it: onDelete,
     * unique or primaryKey. Without onDelete the database refuses to delete a row still referred to.
     */
    ref: (table, more = {}) => ({
      type: DataTypes.INTEGER,
      allowNull,
      ...more,
      references: { model: table, key: "id" },
    }),
  };
}

const notNull = columnTypes(false);
const nullable = columnTypes(true);

/** The whole of a migration that adds one column (`attributes` from the helpers above) and, going down, removes it. */
const columnAdded = (table, column, attributes) => ({
  up: (qi) => qi.addColumn(table, column, attributes),
  down: (qi) => qi.removeColumn(table, column),
});

/**
 * The whole of a migration that adds several columns of one SQL definition ("DECIMAL(20,2) NULL")
 * in one ALTER TABLE, so a large table is rebuilt once, not once per column; going down, drops them.
 */
const columnsAdded = (table, columns, definition) => ({
  up: (qi) =>
    qi.sequelize.query(`ALTER TABLE ${table} ${columns.map((c) => `ADD COLUMN ${c} ${definition}`).join(", ")}`),
  down: (qi) => qi.sequelize.query(`ALTER TABLE ${table} ${columns.map((c) => `DROP COLUMN ${c}`).join(", ")}`),
});

module.exports = { id, bigId, now, timestamps, version, notNull, nullable, columnAdded, columnsAdded };
