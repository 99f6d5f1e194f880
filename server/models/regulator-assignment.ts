import { DataTypes } from "sequelize";
import { sequelize } from "../db/sequelize";
import { AddedRowModel, createdAtColumn } from "./kit";
import { EntityModel } from "./entity";
import { UserModel } from "./user";

/** Which supervisor's staff member may read which entity's filed packs. */
export class RegulatorAssignmentModel extends AddedRowModel<RegulatorAssignmentModel> {
  declare userId: number;
  declare entityId: number;
}

RegulatorAssignmentModel.init(
  {
    userId: { type: DataTypes.INTEGER, primaryKey: true },
    entityId: { type: DataTypes.INTEGER, primaryKey: true },
    ...createdAtColumn(),
  },
  { sequelize, tableName: "regulator_assignments", updatedAt: false },
);
RegulatorAssignmentModel.belongsTo(UserModel, { foreignKey: "userId", as: "user" });
RegulatorAssignmentModel.belongsTo(EntityModel, { foreignKey: "entityId", as: "entity" });
