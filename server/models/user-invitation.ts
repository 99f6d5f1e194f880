import type { NonAttribute } from "sequelize";
import { sequelize } from "../db/sequelize";
import { IssuedSecretModel, issuedSecretColumns, notNull, nullable } from "./kit";
import { UserModel } from "./user";

export type InvitationPurpose = "invite" | "reset";

/** A one-time link to set a password: for whom, why, the SHA-256 of its token (never the token) and its life. */
export class UserInvitationModel extends IssuedSecretModel<UserInvitationModel> {
  declare purpose: InvitationPurpose;
  declare createdBy: number | null;
  declare usedAt: Date | null;
  declare creator?: NonAttribute<UserModel | null>;
}

UserInvitationModel.init(
  {
    ...issuedSecretColumns(),
    purpose: notNull.oneOf("invite", "reset"),
    createdBy: nullable.integer(),
    usedAt: nullable.dateTime(),
  },
  { sequelize, tableName: "user_invitations", updatedAt: false },
);
UserInvitationModel.belongsTo(UserModel, { foreignKey: "userId", as: "user" });
UserInvitationModel.belongsTo(UserModel, { foreignKey: "createdBy", as: "creator" });
