import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes } from "sequelize";
import { sequelize } from "../db/sequelize";
import type { Role } from "../../shared/schemas/common";

export class UserModel extends Model<InferAttributes<UserModel>, InferCreationAttributes<UserModel>> {
  declare id: CreationOptional<number>;
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
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;
}

UserModel.init(
  {
    id: { type: DataTypes.INTEGER, primaryKey: true, autoIncrement: true },
    email: { type: DataTypes.STRING(190), allowNull: false, unique: true },
    name: { type: DataTypes.STRING(120), allowNull: false },
    role: { type: DataTypes.ENUM("analyst", "cro", "treasury", "regulator", "admin"), allowNull: false },
    passwordHash: { type: DataTypes.STRING(100), allowNull: true },
    disabled: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: false },
    tokenVersion: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 1 },
    version: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 1 },
    lastSignInAt: { type: DataTypes.DATE(3), allowNull: true },
    createdAt: DataTypes.DATE(3),
    updatedAt: DataTypes.DATE(3),
  },
  { sequelize, tableName: "users" },
);
