import { DataTypes, type CreationOptional, type InferAttributes } from "sequelize";
import { sequelize } from "../db/sequelize";
import { TableModel, notNull } from "./kit";
import { decimalAttribute } from "./decimal";

/**
 * One version of one portfolio's business day. A restatement adds a version and clears
 * is_current on the old one; the database allows one current version per day. Bulk writes go
 * through server/modules/observations/observations.repository.ts (multi-row INSERTs).
 */
export class ObservationModel extends TableModel<ObservationModel> {
  declare portfolioId: number;
  declare businessDate: string;
  declare version: CreationOptional<number>;
  declare isCurrent: CreationOptional<boolean>;
  declare actualPnl: number | null;
  declare hypotheticalPnl: number | null;
  declare var99: number | null;
  declare var975: number | null;
  declare svar99: number | null;
  declare var10d: number | null;
  declare svar10d: number | null;
  declare es975: number | null;
  declare ses: number | null;
  declare rtpl: number | null;
  declare imaDrc: number | null;
  declare sbm: number | null;
  declare rrao: number | null;
  declare saDrc: number | null;
  declare saGa: number | null;
  declare feesCommissions: number | null;
  declare reservesAdjustments: number | null;
  declare netInterestIncome: number | null;
  declare intradayPnl: number | null;
  declare newTradePnl: number | null;
  /** The upload whose commit wrote this version: its committer and commit time are the version's who and when. */
  declare uploadId: number;
}

const money = (attribute: keyof InferAttributes<ObservationModel>, field: string) =>
  decimalAttribute<ObservationModel>(attribute, 20, 2, { allowNull: true, field });

ObservationModel.init(
  {
    // The key is the day's identity: portfolio, business day, version.
    portfolioId: { type: DataTypes.INTEGER, allowNull: false, primaryKey: true },
    businessDate: { type: DataTypes.DATEONLY, allowNull: false, primaryKey: true },
    version: { type: DataTypes.INTEGER, allowNull: false, primaryKey: true, defaultValue: 1 },
    isCurrent: { ...notNull.boolean(), defaultValue: true },
    actualPnl: money("actualPnl", "actual_pnl"),
    hypotheticalPnl: money("hypotheticalPnl", "hypothetical_pnl"),
    var99: money("var99", "var_99"),
    var975: money("var975", "var_975"),
    svar99: money("svar99", "svar_99"),
    var10d: money("var10d", "var_10d"),
    svar10d: money("svar10d", "svar_10d"),
    es975: money("es975", "es_975"),
    ses: money("ses", "ses"),
    rtpl: money("rtpl", "rtpl"),
    imaDrc: money("imaDrc", "ima_drc"),
    sbm: money("sbm", "sbm"),
    rrao: money("rrao", "rrao"),
    saDrc: money("saDrc", "sa_drc"),
    saGa: money("saGa", "sa_ga"),
    feesCommissions: money("feesCommissions", "fees_commissions"),
    reservesAdjustments: money("reservesAdjustments", "reserves_adjustments"),
    netInterestIncome: money("netInterestIncome", "net_interest_income"),
    intradayPnl: money("intradayPnl", "intraday_pnl"),
    newTradePnl: money("newTradePnl", "new_trade_pnl"),
    uploadId: notNull.integer(),
  },
  { sequelize, tableName: "observations", timestamps: false },
);
