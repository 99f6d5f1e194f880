import {
  DataTypes,
  Model,
  type CreationOptional,
  type ForeignKey,
  type InferAttributes,
  type InferCreationAttributes,
} from "sequelize";
import { sequelize } from "../db/sequelize";
import type { PortfolioLevel } from "../../shared/schemas/common";
import { EntityModel } from "./entity";

export class PortfolioModel extends Model<InferAttributes<PortfolioModel>, InferCreationAttributes<PortfolioModel>> {
  declare id: CreationOptional<number>;
  declare entityId: ForeignKey<EntityModel["id"]>;
  declare code: string;
  declare name: string;
  declare level: PortfolioLevel;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;
}

PortfolioModel.init(
  {
    id: { type: DataTypes.INTEGER, primaryKey: true, autoIncrement: true },
    code: { type: DataTypes.STRING(40), allowNull: false, unique: true },
    name: { type: DataTypes.STRING(120), allowNull: false },
    level: { type: DataTypes.ENUM("top", "desk"), allowNull: false },
    createdAt: DataTypes.DATE(3),
    updatedAt: DataTypes.DATE(3),
  },
  { sequelize, tableName: "portfolios" },
);
EntityModel.hasMany(PortfolioModel, { foreignKey: "entityId", as: "portfolios" });
PortfolioModel.belongsTo(EntityModel, { foreignKey: "entityId", as: "entity" });
