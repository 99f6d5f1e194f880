import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes } from "sequelize";
import { sequelize } from "../db/sequelize";

/** A signed-off snapshot's pack as sent to the supervisor (server/modules/filings). */
export class FilingModel extends Model<InferAttributes<FilingModel>, InferCreationAttributes<FilingModel>> {
  declare id: CreationOptional<number>;
  declare snapshotId: number;
  declare packPdf: Buffer;
  declare packSha256: string;
  declare fileName: string;
  declare recipientsJson: string;
  declare messageId: string | null;
  /** Who filed it. */
  declare sentBy: number;
  /** When the mail server took it; null while it waits (delivery "pending"). */
  declare sentAt: Date | null;
  /** pending: it reached nobody yet; partial: some recipients accepted it, not all; sent: all did. */
  declare delivery: CreationOptional<"pending" | "partial" | "sent">;
  declare attempts: CreationOptional<number>;
  declare lastError: string | null;
  declare acknowledgedBy: number | null;
  declare acknowledgedAt: Date | null;
  /** The pack's sha256 as the supervisor acknowledged it (also signed into the snapshot chain). */
  declare acknowledgedSha256: CreationOptional<string | null>;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;
}

FilingModel.init(
  {
    id: { type: DataTypes.INTEGER, primaryKey: true, autoIncrement: true },
    snapshotId: { type: DataTypes.INTEGER, allowNull: false },
    packPdf: { type: DataTypes.BLOB("long"), allowNull: false },
    packSha256: { type: DataTypes.CHAR(64), allowNull: false },
    fileName: { type: DataTypes.STRING(255), allowNull: false },
    recipientsJson: { type: DataTypes.TEXT, allowNull: false },
    messageId: { type: DataTypes.STRING(255), allowNull: true },
    sentBy: { type: DataTypes.INTEGER, allowNull: false },
    sentAt: { type: DataTypes.DATE(3), allowNull: true },
    delivery: { type: DataTypes.ENUM("pending", "partial", "sent"), allowNull: false, defaultValue: "pending" },
    attempts: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 1 },
    lastError: { type: DataTypes.STRING(500), allowNull: true },
    acknowledgedBy: { type: DataTypes.INTEGER, allowNull: true },
    acknowledgedAt: { type: DataTypes.DATE(3), allowNull: true },
    acknowledgedSha256: { type: DataTypes.CHAR(64), allowNull: true },
    createdAt: DataTypes.DATE(3),
    updatedAt: DataTypes.DATE(3),
  },
  { sequelize, tableName: "filings", defaultScope: { attributes: { exclude: ["packPdf"] } }, scopes: { withPack: {} } },
);
