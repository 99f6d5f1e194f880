import { DataTypes, type CreationOptional } from "sequelize";
import { sequelize } from "../db/sequelize";
import { TableModel } from "./kit";
import { EntityModel } from "./entity";
import { UserModel } from "./user";

/** Which supervisor's staff member may read which entity's filed packs. */
export class RegulatorAssignmentModel extends TableModel<RegulatorAssignmentModel> {
  declare userId: number;
  declare entityId: number;
  declare createdAt: CreationOptional<Date>;
}

RegulatorAssignmentModel.init(
  {
    userId: { type: DataTypes.INTEGER, primaryKey: true },
    entityId: { type: DataTypes.INTEGER, primaryKey: true },
    createdAt: DataTypes.DATE(3),
  },
  { sequelize, tableName: "regulator_assignments", updatedAt: false },
);
RegulatorAssignmentModel.belongsTo(UserModel, { foreignKey: "userId", as: "user" });
RegulatorAssignmentModel.belongsTo(EntityModel, { foreignKey: "entityId", as: "entity" });
