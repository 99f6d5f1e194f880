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

export type InvitationPurpose = "invite" | "reset";

/** A one-time link to set a password: for whom, why, the SHA-256 of its token (never the token) and its life. */
export class UserInvitationModel extends Model<
  InferAttributes<UserInvitationModel>,
  InferCreationAttributes<UserInvitationModel>
> {
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
    id: { type: DataTypes.INTEGER, primaryKey: true, autoIncrement: true },
    userId: { type: DataTypes.INTEGER, allowNull: false },
    purpose: { type: DataTypes.ENUM("invite", "reset"), allowNull: false },
    tokenHash: { type: DataTypes.CHAR(64), allowNull: false, unique: true },
    createdBy: { type: DataTypes.INTEGER, allowNull: true },
    createdAt: DataTypes.DATE(3),
    expiresAt: { type: DataTypes.DATE(3), allowNull: false },
    usedAt: { type: DataTypes.DATE(3), allowNull: true },
    revokedAt: { type: DataTypes.DATE(3), allowNull: true },
  },
  { sequelize, tableName: "user_invitations", updatedAt: false },
);
UserInvitationModel.belongsTo(UserModel, { foreignKey: "userId", as: "user" });
UserInvitationModel.belongsTo(UserModel, { foreignKey: "createdBy", as: "creator" });
