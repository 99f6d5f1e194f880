import { type CreationOptional, type ForeignKey } from "sequelize";
import { sequelize } from "../db/sequelize";
import { TableModel, idColumn, notNull, timestampColumns } from "./kit";
import type { PortfolioLevel } from "../../shared/schemas/common";
import { EntityModel } from "./entity";

export class PortfolioModel extends TableModel<PortfolioModel> {
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
    ...idColumn(),
    code: { ...notNull.varchar(40), unique: true },
    name: notNull.varchar(120),
    level: notNull.oneOf("top", "desk"),
    ...timestampColumns(),
  },
  { sequelize, tableName: "portfolios" },
);
EntityModel.hasMany(PortfolioModel, { foreignKey: "entityId", as: "portfolios" });
PortfolioModel.belongsTo(EntityModel, { foreignKey: "entityId", as: "entity" });
