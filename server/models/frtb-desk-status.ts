import type { CreationOptional } from "sequelize";
import { sequelize } from "../db/sequelize";
import { TableModel, idColumn, notNull, nullable } from "./kit";
import type { DeskStatus } from "../../shared/backtest/frtb-capital";
import type { PlaZone } from "../../shared/backtest/pla";

/** One FRTB desk's status at one determination of its entity (docs/rules.md#frtb-eligibility). */
export class FrtbDeskStatusModel extends TableModel<FrtbDeskStatusModel> {
  declare id: CreationOptional<number>;
  declare entityId: number;
  declare portfolioId: number;
  declare periodEnd: string;
  declare asOf: string;
  declare effectiveFrom: string;
  declare status: DeskStatus;
  declare reason: string;
  declare backtest99: number;
  declare backtest975: number;
  declare backtestPasses: boolean;
  declare plaZone: PlaZone | null;
  declare plaObservations: number;
  declare spearman: number | null;
  declare ks: number | null;
}

FrtbDeskStatusModel.init(
  {
    ...idColumn(),
    entityId: notNull.integer(),
    portfolioId: notNull.integer(),
    periodEnd: notNull.dateOnly(),
    asOf: notNull.dateOnly(),
    effectiveFrom: notNull.dateOnly(),
    status: notNull.oneOf("in-model", "amber", "out-of-model"),
    reason: notNull.varchar(300),
    backtest99: { ...notNull.integer(), field: "backtest99" },
    backtest975: { ...notNull.integer(), field: "backtest975" },
    backtestPasses: notNull.boolean(),
    plaZone: nullable.oneOf("green", "amber", "red"),
    plaObservations: notNull.integer(),
    spearman: nullable.double(),
    ks: nullable.double(),
  },
  { sequelize, tableName: "frtb_desk_statuses", timestamps: false },
);
