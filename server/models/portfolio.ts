import type { ForeignKey } from "sequelize";
import { sequelize } from "../db/sequelize";
import { RowModel, idColumn, notNull, timestampColumns } from "./kit";
import type { PortfolioLevel } from "../../shared/schemas/common";
import { EntityModel } from "./entity";

export class PortfolioModel extends RowModel<PortfolioModel> {
  declare entityId: ForeignKey<EntityModel["id"]>;
  declare code: string;
  declare name: string;
  declare level: PortfolioLevel;
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
