import {
  DataTypes,
  Model,
  type CreationOptional,
  type ForeignKey,
  type InferAttributes,
  type InferCreationAttributes,
} from "sequelize";
import { sequelize } from "../db/sequelize";
import { EntityModel } from "./entity";
import type { HolidaySource } from "../../shared/schemas/entity";

export class HolidayModel extends Model<InferAttributes<HolidayModel>, InferCreationAttributes<HolidayModel>> {
  declare id: CreationOptional<number>;
  declare entityId: ForeignKey<EntityModel["id"]>;
  declare date: string;
  declare name: string;
  declare source: CreationOptional<HolidaySource>;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;
}

HolidayModel.init(
  {
    id: { type: DataTypes.INTEGER, primaryKey: true, autoIncrement: true },
    date: { type: DataTypes.DATEONLY, allowNull: false },
    name: { type: DataTypes.STRING(120), allowNull: false },
    source: { type: DataTypes.ENUM("bank", "library"), allowNull: false, defaultValue: "bank" },
    createdAt: DataTypes.DATE(3),
    updatedAt: DataTypes.DATE(3),
  },
  { sequelize, tableName: "holidays" },
);
EntityModel.hasMany(HolidayModel, { foreignKey: "entityId", as: "holidays" });
