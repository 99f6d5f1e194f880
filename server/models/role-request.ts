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
import type { Role } from "../../shared/schemas/common";

export type RoleRequestKind = "invite" | "change";
export type RoleRequestStatus = "pending" | "approved" | "rejected";

/**
 * A grant or removal of the CRO or administrator role, waiting for a second administrator:
 * `invite` creates the person (nobody yet: `userId` is null until approval), `change` moves an
 * existing user from `fromRole` to `toRole`.
 */
export class RoleRequestModel extends Model<
  InferAttributes<RoleRequestModel>,
  InferCreationAttributes<RoleRequestModel>
> {
  declare id: CreationOptional<number>;
  declare kind: RoleRequestKind;
  declare userId: number | null;
  declare email: string;
  declare name: string;
  declare fromRole: Role | null;
  declare toRole: Role;
  declare status: CreationOptional<RoleRequestStatus>;
  declare proposedBy: number;
  declare proposedAt: CreationOptional<Date>;
  declare decidedBy: number | null;
  declare decidedAt: Date | null;
  declare proposer?: NonAttribute<UserModel>;
  declare decider?: NonAttribute<UserModel | null>;
}

const ROLE = DataTypes.ENUM("analyst", "cro", "treasury", "regulator", "admin");

RoleRequestModel.init(
  {
    id: { type: DataTypes.INTEGER, primaryKey: true, autoIncrement: true },
    kind: { type: DataTypes.ENUM("invite", "change"), allowNull: false },
    userId: { type: DataTypes.INTEGER, allowNull: true },
    email: { type: DataTypes.STRING(190), allowNull: false },
    name: { type: DataTypes.STRING(120), allowNull: false },
    fromRole: { type: ROLE, allowNull: true },
    toRole: { type: ROLE, allowNull: false },
    status: { type: DataTypes.ENUM("pending", "approved", "rejected"), allowNull: false, defaultValue: "pending" },
    proposedBy: { type: DataTypes.INTEGER, allowNull: false },
    proposedAt: DataTypes.DATE(3),
    decidedBy: { type: DataTypes.INTEGER, allowNull: true },
    decidedAt: { type: DataTypes.DATE(3), allowNull: true },
  },
  { sequelize, tableName: "role_requests", createdAt: "proposedAt", updatedAt: false },
);
RoleRequestModel.belongsTo(UserModel, { foreignKey: "proposedBy", as: "proposer" });
RoleRequestModel.belongsTo(UserModel, { foreignKey: "decidedBy", as: "decider" });
