import type { CreationOptional } from "sequelize";
import { sequelize } from "../db/sequelize";
import { RowModel, idColumn, notNull, nullable, timestampColumns, versionColumn } from "./kit";
import { PortfolioModel } from "./portfolio";
import { findingKindSchema, type FindingKind } from "../../shared/schemas/finding";

export class DataFindingModel extends RowModel<DataFindingModel> {
  declare portfolioId: number;
  declare kind: FindingKind;
  declare dateFrom: string;
  declare dateTo: string;
  declare detail: string;
  declare status: CreationOptional<"open" | "resolved" | "explained">;
  declare note: string | null;
  declare closedBy: number | null;
  declare closedAt: Date | null;
  declare version: CreationOptional<number>;
}

DataFindingModel.init(
  {
    ...idColumn(),
    portfolioId: notNull.integer(),
    kind: notNull.oneOf(...findingKindSchema.options),
    dateFrom: notNull.dateOnly(),
    dateTo: notNull.dateOnly(),
    detail: notNull.varchar(500),
    status: { ...notNull.oneOf("open", "resolved", "explained"), defaultValue: "open" },
    note: nullable.text(),
    closedBy: nullable.integer(),
    closedAt: nullable.dateTime(),
    ...versionColumn(),
    ...timestampColumns(),
  },
  { sequelize, tableName: "data_findings" },
);
DataFindingModel.belongsTo(PortfolioModel, { foreignKey: "portfolioId", as: "portfolio" });
