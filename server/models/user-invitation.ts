import { DataTypes, type CreationOptional, type NonAttribute } from "sequelize";
import { sequelize } from "../db/sequelize";
import { TableModel, idColumn, notNull, nullable } from "./kit";
import { UserModel } from "./user";

export type InvitationPurpose = "invite" | "reset";

/** A one-time link to set a password: for whom, why, the SHA-256 of its token (never the token) and its life. */
export class UserInvitationModel extends TableModel<UserInvitationModel> {
  declare id: CreationOptional<number>;
  declare userId: number;
  declare purpose: InvitationPurpose;
  declare tokenHash: string;
  declare createdBy: number | null;
  declare createdAt: CreationOptional<Date>;
  declare expiresAt: Date;
  declare usedAt: Date | null;
  declare revokedAt: Date | null;
  declare user?: NonAttribute<UserModel>;
  declare creator?: NonAttribute<UserModel | null>;
}

UserInvitationModel.init(
  {
    ...idColumn(),
    userId: notNull.integer(),
    purpose: notNull.oneOf("invite", "reset"),
    tokenHash: { ...notNull.char(64), unique: true },
    createdBy: nullable.integer(),
    createdAt: DataTypes.DATE(3),
    expiresAt: notNull.dateTime(),
    usedAt: nullable.dateTime(),
    revokedAt: nullable.dateTime(),
  },
  { sequelize, tableName: "user_invitations", updatedAt: false },
);
UserInvitationModel.belongsTo(UserModel, { foreignKey: "userId", as: "user" });
UserInvitationModel.belongsTo(UserModel, { foreignKey: "createdBy", as: "creator" });
