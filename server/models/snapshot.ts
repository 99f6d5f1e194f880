import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes } from "sequelize";
import { sequelize } from "../db/sequelize";
import { decimalAttribute } from "./decimal";
import type { SnapshotStatus } from "../../shared/schemas/snapshot";
import type { Zone } from "../../shared/backtest/types";

/** One entity's figures at one quarter end, frozen for sign-off (server/modules/snapshots). */
export class SnapshotModel extends Model<InferAttributes<SnapshotModel>, InferCreationAttributes<SnapshotModel>> {
  declare id: CreationOptional<number>;
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
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;
}

const decimal = (
  attribute: keyof InferAttributes<SnapshotModel>,
  precision: number,
  scale: number,
  allowNull: boolean,
) => decimalAttribute<SnapshotModel>(attribute, precision, scale, { allowNull });

SnapshotModel.init(
  {
    id: { type: DataTypes.INTEGER, primaryKey: true, autoIncrement: true },
    entityId: { type: DataTypes.INTEGER, allowNull: false },
    quarterEnd: { type: DataTypes.DATEONLY, allowNull: false },
    status: { type: DataTypes.ENUM("draft", "submitted", "approved", "returned", "filed"), allowNull: false },
    zone: { type: DataTypes.ENUM("green", "yellow", "red"), allowNull: false },
    counted: { type: DataTypes.INTEGER, allowNull: false },
    plusFactor: decimal("plusFactor", 6, 4, false),
    multiplier: decimal("multiplier", 6, 4, false),
    capital: decimal("capital", 20, 2, true),
    addOn: decimal("addOn", 20, 2, true),
    windowStart: { type: DataTypes.DATEONLY, allowNull: true },
    asOf: { type: DataTypes.DATEONLY, allowNull: false },
    figuresJson: { type: DataTypes.TEXT("long"), allowNull: false },
    inputsSha256: { type: DataTypes.CHAR(64), allowNull: false },
    engineVersion: { type: DataTypes.STRING(20), allowNull: false },
    preparedBy: { type: DataTypes.INTEGER, allowNull: false },
    preparedAt: { type: DataTypes.DATE(3), allowNull: false },
    submittedBy: { type: DataTypes.INTEGER, allowNull: true },
    submittedAt: { type: DataTypes.DATE(3), allowNull: true },
    approvedBy: { type: DataTypes.INTEGER, allowNull: true },
    approvedAt: { type: DataTypes.DATE(3), allowNull: true },
    historyJson: { type: DataTypes.TEXT("long"), allowNull: false },
    prevHash: { type: DataTypes.CHAR(64), allowNull: true },
    hash: { type: DataTypes.CHAR(64), allowNull: true },
    restatedAt: { type: DataTypes.DATE(3), allowNull: true },
    restatementDetail: { type: DataTypes.TEXT, allowNull: true },
    amendsId: { type: DataTypes.INTEGER, allowNull: true },
    amendmentJson: { type: DataTypes.TEXT("long"), allowNull: true },
    version: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 1 },
    createdAt: DataTypes.DATE(3),
    updatedAt: DataTypes.DATE(3),
  },
  { sequelize, tableName: "snapshots" },
);
