import { DataTypes, type CreationOptional, type NonAttribute } from "sequelize";
import { sequelize } from "../db/sequelize";
import { TableModel, idColumn, notNull, nullable } from "./kit";
import { UserModel } from "./user";

/** A personal API token: its owner, the SHA-256 of its secret (never the secret) and its life. */
export class ApiTokenModel extends TableModel<ApiTokenModel> {
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
    ...idColumn(),
    userId: notNull.integer(),
    name: notNull.varchar(80),
    tokenHash: { ...notNull.char(64), unique: true },
    prefix: notNull.varchar(16),
    createdAt: DataTypes.DATE(3),
    lastUsedAt: nullable.dateTime(),
    expiresAt: notNull.dateTime(),
    revokedAt: nullable.dateTime(),
  },
  { sequelize, tableName: "api_tokens", updatedAt: false },
);
ApiTokenModel.belongsTo(UserModel, { foreignKey: "userId", as: "user" });
