import type { CreationOptional, ForeignKey } from "sequelize";
import { sequelize } from "../db/sequelize";
import { RowModel, idColumn, notNull, timestampColumns } from "./kit";
import { EntityModel } from "./entity";
import type { HolidaySource } from "../../shared/schemas/entity";

export class HolidayModel extends RowModel<HolidayModel> {
  declare entityId: ForeignKey<EntityModel["id"]>;
  declare date: string;
  declare name: string;
  declare source: CreationOptional<HolidaySource>;
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
