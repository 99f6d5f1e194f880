import type { CreationOptional } from "sequelize";
import { sequelize } from "../db/sequelize";
import { TableModel, idColumn, notNull, nullable } from "./kit";

/**
 * A decision the CRO recorded on an exclusion request; never updated. A correction is a new row
 * naming the one it supersedes, with its reason (migrations/20261202-23-01-exclusion-decisions.cjs).
 */
export class ExclusionDecisionModel extends TableModel<ExclusionDecisionModel> {
  declare id: CreationOptional<number>;
  declare reviewId: number;
  declare decision: "approved" | "rejected";
  declare reference: string;
  declare decidedOn: string;
  declare decidedBy: number | null;
  declare recordedAt: Date;
  declare supersedesId: number | null;
  declare correctionReason: string | null;
}

ExclusionDecisionModel.init(
  {
    ...idColumn(),
    reviewId: notNull.integer(),
    decision: notNull.oneOf("approved", "rejected"),
    reference: notNull.varchar(120),
    decidedOn: notNull.dateOnly(),
    decidedBy: nullable.integer(),
    recordedAt: notNull.dateTime(),
    supersedesId: nullable.integer(),
    correctionReason: nullable.varchar(500),
  },
  { sequelize, tableName: "exclusion_decisions", timestamps: false },
);
