import { sequelize } from "../db/sequelize";
import { IssuedSecretModel, issuedSecretColumns, notNull, nullable } from "./kit";
import { UserModel } from "./user";

/** A personal API token: its owner, the SHA-256 of its secret (never the secret) and its life. */
export class ApiTokenModel extends IssuedSecretModel<ApiTokenModel> {
  declare name: string;
  declare prefix: string;
  declare lastUsedAt: Date | null;
}

ApiTokenModel.init(
  {
    ...issuedSecretColumns(),
    name: notNull.varchar(80),
    prefix: notNull.varchar(16),
    lastUsedAt: nullable.dateTime(),
  },
  { sequelize, tableName: "api_tokens", updatedAt: false },
);
ApiTokenModel.belongsTo(UserModel, { foreignKey: "userId", as: "user" });
