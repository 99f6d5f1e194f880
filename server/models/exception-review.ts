import type { CreationOptional } from "sequelize";
import { sequelize } from "../db/sequelize";
import { RowModel, idColumn, notNull, nullable, timestampColumns, versionColumn } from "./kit";
import type { ExceptionCause, ExclusionStatus } from "../../shared/schemas/review";

export class ExceptionReviewModel extends RowModel<ExceptionReviewModel> {
  declare portfolioId: number;
  declare businessDate: string;
  declare cause: ExceptionCause;
  declare narrative: string;
  declare exclusionStatus: CreationOptional<ExclusionStatus>;
  declare decisionReference: string | null;
  declare decisionDate: string | null;
  declare decidedBy: number | null;
  declare reviewedBy: number;
  declare version: CreationOptional<number>;
}

ExceptionReviewModel.init(
  {
    ...idColumn(),
    portfolioId: notNull.integer(),
    businessDate: notNull.dateOnly(),
    cause: notNull.oneOf("market_move", "model_limitation", "data_issue", "intraday_trading", "pricing", "other"),
    narrative: notNull.text(),
    exclusionStatus: { ...notNull.oneOf("none", "requested", "approved", "rejected"), defaultValue: "none" },
    decisionReference: nullable.varchar(120),
    decisionDate: nullable.dateOnly(),
    decidedBy: nullable.integer(),
    reviewedBy: notNull.integer(),
    ...versionColumn(),
    ...timestampColumns(),
  },
  { sequelize, tableName: "exception_reviews" },
);
