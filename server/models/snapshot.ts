import type { CreationOptional, InferAttributes } from "sequelize";
import { sequelize } from "../db/sequelize";
import { RowModel, idColumn, notNull, nullable, timestampColumns, versionColumn } from "./kit";
import { decimalAttribute } from "./decimal";
import type { SnapshotStatus } from "../../shared/schemas/snapshot";
import type { Zone } from "../../shared/backtest/types";

/** One entity's figures at one quarter end, frozen for sign-off (server/modules/snapshots). */
export class SnapshotModel extends RowModel<SnapshotModel> {
  declare entityId: number;
  declare quarterEnd: string;
  declare status: SnapshotStatus;
  declare zone: Zone;
  declare counted: number;
  declare plusFactor: number;
  declare multiplier: number;
  declare capital: number | null;
  declare addOn: number | null;
  declare windowStart: string | null;
  declare asOf: string;
  declare figuresJson: string;
  declare inputsSha256: string;
  declare engineVersion: string;
  declare preparedBy: number;
  declare preparedAt: Date;
  declare submittedBy: number | null;
  declare submittedAt: Date | null;
  declare approvedBy: number | null;
  declare approvedAt: Date | null;
  declare historyJson: string;
  declare prevHash: string | null;
  declare hash: string | null;
  declare restatedAt: Date | null;
  declare restatementDetail: string | null;
  /** The filed snapshot this one amends, and what the amendment changes (frozen when prepared). */
  declare amendsId: number | null;
  declare amendmentJson: string | null;
  declare version: CreationOptional<number>;
}

/** The headline figures a snapshot keeps in columns beside figures_json (what lists and the chain read). */
export const SNAPSHOT_HEADLINE_COLUMNS = ["zone", "counted", "plusFactor", "multiplier", "capital", "addOn"] as const;

const decimal = (
  attribute: keyof InferAttributes<SnapshotModel>,
  precision: number,
  scale: number,
  allowNull: boolean,
) => decimalAttribute<SnapshotModel>(attribute, precision, scale, { allowNull });

SnapshotModel.init(
  {
    ...idColumn(),
    entityId: notNull.integer(),
    quarterEnd: notNull.dateOnly(),
    status: notNull.oneOf("draft", "submitted", "approved", "returned", "filed"),
    zone: notNull.oneOf("green", "yellow", "red"),
    counted: notNull.integer(),
    plusFactor: decimal("plusFactor", 6, 4, false),
    multiplier: decimal("multiplier", 6, 4, false),
    capital: decimal("capital", 20, 2, true),
    addOn: decimal("addOn", 20, 2, true),
    windowStart: nullable.dateOnly(),
    asOf: notNull.dateOnly(),
    figuresJson: notNull.text("long"),
    inputsSha256: notNull.char(64),
    engineVersion: notNull.varchar(20),
    preparedBy: notNull.integer(),
    preparedAt: notNull.dateTime(),
    submittedBy: nullable.integer(),
    submittedAt: nullable.dateTime(),
    approvedBy: nullable.integer(),
    approvedAt: nullable.dateTime(),
    historyJson: notNull.text("long"),
    prevHash: nullable.char(64),
    hash: nullable.char(64),
    restatedAt: nullable.dateTime(),
    restatementDetail: nullable.text(),
    amendsId: nullable.integer(),
    amendmentJson: nullable.text("long"),
    ...versionColumn(),
    ...timestampColumns(),
  },
  { sequelize, tableName: "snapshots" },
);
