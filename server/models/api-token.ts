import {
  DataTypes,
  Model,
  type CreationOptional,
  type InferAttributes,
  type InferCreationAttributes,
  type NonAttribute,
} from "sequelize";
import { sequelize } from "../db/sequelize";
import { UserModel } from "./user";

/** A personal API token: its owner, the SHA-256 of its secret (never the secret) and its life. */
export class ApiTokenModel extends Model<InferAttributes<ApiTokenModel>, InferCreationAttributes<ApiTokenModel>> {
  declare id: CreationOptional<number>;
  declare userId: number;
  declare name: string;
  declare tokenHash: string;
  declare prefix: string;
  declare createdAt: CreationOptional<Date>;
  declare lastUsedAt: Date | null;
  declare expiresAt: Date;
  declare revokedAt: Date | null;
  declare user?: NonAttribute<UserModel>;
}

ApiTokenModel.init(
  {
    id: { type: DataTypes.INTEGER, primaryKey: true, autoIncrement: true },
    userId: { type: DataTypes.INTEGER, allowNull: false },
    name: { type: DataTypes.STRING(80), allowNull: false },
    tokenHash: { type: DataTypes.CHAR(64), allowNull: false, unique: true },
    prefix: { type: DataTypes.STRING(16), allowNull: false },
    createdAt: DataTypes.DATE(3),
    lastUsedAt: { type: DataTypes.DATE(3), allowNull: true },
    expiresAt: { type: DataTypes.DATE(3), allowNull: false },
    revokedAt: { type: DataTypes.DATE(3), allowNull: true },
  },
  { sequelize, tableName: "api_tokens", updatedAt: false },
);
ApiTokenModel.belongsTo(UserModel, { foreignKey: "userId", as: "user" });
