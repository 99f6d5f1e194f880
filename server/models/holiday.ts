import { type CreationOptional, type ForeignKey } from "sequelize";
import { sequelize } from "../db/sequelize";
import { TableModel, idColumn, notNull, timestampColumns } from "./kit";
import { EntityModel } from "./entity";
import type { HolidaySource } from "../../shared/schemas/entity";

export class HolidayModel extends TableModel<HolidayModel> {
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
    ...idColumn(),
    date: notNull.dateOnly(),
    name: notNull.varchar(120),
    source: { ...notNull.oneOf("bank", "library"), defaultValue: "bank" },
    ...timestampColumns(),
  },
  { sequelize, tableName: "holidays" },
);
EntityModel.hasMany(HolidayModel, { foreignKey: "entityId", as: "holidays" });
