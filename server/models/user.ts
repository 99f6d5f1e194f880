import type { CreationOptional } from "sequelize";
import { sequelize } from "../db/sequelize";
import { RowModel, idColumn, notNull, nullable, timestampColumns, versionColumn } from "./kit";
import { roleSchema, type Role } from "../../shared/schemas/common";

export class UserModel extends RowModel<UserModel> {
  declare email: string;
  declare name: string;
  declare role: Role;
  /** Empty until the person sets their first password from their invitation link. */
  declare passwordHash: string | null;
  declare disabled: CreationOptional<boolean>;
  /** Raised on logout, disable and role change: every token carrying an older version is refused. */
  declare tokenVersion: CreationOptional<number>;
  /** Row version of the admin's edits (optimistic locking): a stale one is refused with 409. */
  declare version: CreationOptional<number>;
  declare lastSignInAt: Date | null;
}

UserModel.init(
  {
    ...idColumn(),
    email: { ...notNull.varchar(190), unique: true },
    name: notNull.varchar(120),
    role: notNull.oneOf(...roleSchema.options),
    passwordHash: nullable.varchar(100),
    disabled: { ...notNull.boolean(), defaultValue: false },
    tokenVersion: { ...notNull.integer(), defaultValue: 1 },
    ...versionColumn(),
    lastSignInAt: nullable.dateTime(),
    ...timestampColumns(),
  },
  { sequelize, tableName: "users" },
);
