import {
  DataTypes,
  Model,
  type CreationOptional,
  type InferAttributes,
  type InferCreationAttributes,
  type NonAttribute,
} from "sequelize";
import type { UserModel } from "./user";

/**
 * What every model repeats, written once. The migrations hold the schema; these only describe its
 * columns to Sequelize, with the same types.
 */

/** A model whose attributes are the fields it declares (`class UserModel extends TableModel<UserModel>`). */
export abstract class TableModel<M extends Model> extends Model<InferAttributes<M>, InferCreationAttributes<M>> {}

/** A table model with the columns of idColumn() and timestampColumns(). */
export abstract class RowModel<M extends Model> extends TableModel<M> {
  declare id: CreationOptional<number>;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;
}

/** A table model whose rows are added, never updated: createdAt only (createdAtColumn(), `updatedAt: false`). */
export abstract class AddedRowModel<M extends Model> extends TableModel<M> {
  declare createdAt: CreationOptional<Date>;
}

/**
 * A secret issued to a user (an API token, a set-password link): the SHA-256 of the secret, never
 * the secret, and its life (issuedSecretColumns()).
 */
export abstract class IssuedSecretModel<M extends Model> extends AddedRowModel<M> {
  declare id: CreationOptional<number>;
  declare userId: number;
  declare tokenHash: string;
  declare expiresAt: Date;
  declare revokedAt: Date | null;
  declare user?: NonAttribute<UserModel>;
}

/** The INTEGER AUTO_INCREMENT primary key `id`. */
export const idColumn = () => ({ id: { type: DataTypes.INTEGER, primaryKey: true, autoIncrement: true } });

/** createdAt and updatedAt as DATETIME(3), set by Sequelize. */
export const timestampColumns = () => ({ createdAt: DataTypes.DATE(3), updatedAt: DataTypes.DATE(3) });

/** createdAt alone as DATETIME(3), set by Sequelize (the model says `updatedAt: false`). */
export const createdAtColumn = () => ({ createdAt: DataTypes.DATE(3) });

/** The columns of an IssuedSecretModel but its own: the key, its holder, the secret's hash and its life. */
export const issuedSecretColumns = () => ({
  ...idColumn(),
  userId: notNull.integer(),
  tokenHash: { ...notNull.char(64), unique: true },
  ...createdAtColumn(),
  expiresAt: notNull.dateTime(),
  revokedAt: nullable.dateTime(),
});

/** The row version of optimistic locking (server/kit/stale.ts): 1 when created. */
export const versionColumn = () => ({ version: { ...notNull.integer(), defaultValue: 1 } });

/** The column types the migrations use, in `notNull` and `nullable` forms (`note: nullable.text()`). */
function columnTypes<AllowNull extends boolean>(allowNull: AllowNull) {
  return {
    integer: () => ({ type: DataTypes.INTEGER, allowNull }),
    double: () => ({ type: DataTypes.DOUBLE, allowNull }),
    boolean: () => ({ type: DataTypes.BOOLEAN, allowNull }),
    /** A calendar day (DATE). */
    dateOnly: () => ({ type: DataTypes.DATEONLY, allowNull }),
    /** An instant (DATETIME(3)). */
    dateTime: () => ({ type: DataTypes.DATE(3), allowNull }),
    varchar: (length: number) => ({ type: DataTypes.STRING(length), allowNull }),
    /** Fixed length: CHAR(64) holds a sha256 or an HMAC in hex. */
    char: (length: number) => ({ type: DataTypes.CHAR(length), allowNull }),
    text: (length?: "medium" | "long") => ({ type: length ? DataTypes.TEXT(length) : DataTypes.TEXT, allowNull }),
    blob: (length: "medium" | "long") => ({ type: DataTypes.BLOB(length), allowNull }),
    oneOf: (...values: string[]) => ({ type: DataTypes.ENUM(...values), allowNull }),
  };
}

export const notNull = columnTypes(false);
export const nullable = columnTypes(true);
