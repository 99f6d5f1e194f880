import { DataTypes, type CreationOptional, type NonAttribute } from "sequelize";
import { sequelize } from "../db/sequelize";
import { TableModel, idColumn, notNull, nullable } from "./kit";
import { UserModel } from "./user";
import { roleSchema, type Role } from "../../shared/schemas/common";

export type RoleRequestKind = "invite" | "change";
export type RoleRequestStatus = "pending" | "approved" | "rejected";

/**
 * A grant or removal of the CRO or administrator role, waiting for a second administrator:
 * `invite` creates the person (nobody yet: `userId` is null until approval), `change` moves an
 * existing user from `fromRole` to `toRole`.
 */
export class RoleRequestModel extends TableModel<RoleRequestModel> {
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

RoleRequestModel.init(
  {
    ...idColumn(),
    kind: notNull.oneOf("invite", "change"),
    userId: nullable.integer(),
    email: notNull.varchar(190),
    name: notNull.varchar(120),
    fromRole: nullable.oneOf(...roleSchema.options),
    toRole: notNull.oneOf(...roleSchema.options),
    status: { ...notNull.oneOf("pending", "approved", "rejected"), defaultValue: "pending" },
    proposedBy: notNull.integer(),
    proposedAt: DataTypes.DATE(3),
    decidedBy: nullable.integer(),
    decidedAt: nullable.dateTime(),
  },
  { sequelize, tableName: "role_requests", createdAt: "proposedAt", updatedAt: false },
);
RoleRequestModel.belongsTo(UserModel, { foreignKey: "proposedBy", as: "proposer" });
RoleRequestModel.belongsTo(UserModel, { foreignKey: "decidedBy", as: "decider" });
