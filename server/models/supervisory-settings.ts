import type { InferAttributes } from "sequelize";
import { sequelize } from "../db/sequelize";
import { RowModel, idColumn, notNull, nullable, timestampColumns } from "./kit";
import { decimalAttribute } from "./decimal";
import type { PnlBasis } from "../../shared/schemas/common";
import type { DeterminationFrequency } from "../../shared/backtest/determination";

export type SettingsStatus = "proposed" | "approved" | "rejected";

/** One dated, governed record of an entity's supervisory settings (server/modules/settings). */
export class SupervisorySettingsModel extends RowModel<SupervisorySettingsModel> {
  declare entityId: number;
  declare effectiveFrom: string;
  declare reference: string;
  declare pnlBasis: PnlBasis;
  declare qualitativeAddend: number;
  declare qualitativeAddendSvar: number | null;
  declare multiplierFloor: number | null;
  declare determinationFrequency: DeterminationFrequency;
  declare status: SettingsStatus;
  declare proposedBy: number | null;
  declare proposedAt: Date | null;
  declare decidedBy: number | null;
  declare decidedAt: Date | null;
  declare decisionComment: string | null;
}

const decimal = (attribute: keyof InferAttributes<SupervisorySettingsModel>, allowNull: boolean) =>
  decimalAttribute<SupervisorySettingsModel>(attribute, 6, 4, { allowNull });

SupervisorySettingsModel.init(
  {
    ...idColumn(),
    entityId: notNull.integer(),
    effectiveFrom: notNull.dateOnly(),
    reference: notNull.varchar(200),
    pnlBasis: notNull.oneOf("actual", "hypothetical", "max"),
    qualitativeAddend: decimal("qualitativeAddend", false) as never,
    qualitativeAddendSvar: decimal("qualitativeAddendSvar", true),
    multiplierFloor: decimal("multiplierFloor", true),
    determinationFrequency: notNull.oneOf("quarterly", "monthly"),
    status: notNull.oneOf("proposed", "approved", "rejected"),
    proposedBy: nullable.integer(),
    proposedAt: nullable.dateTime(),
    decidedBy: nullable.integer(),
    decidedAt: nullable.dateTime(),
    decisionComment: nullable.varchar(500),
    ...timestampColumns(),
  },
  { sequelize, tableName: "supervisory_settings" },
);
