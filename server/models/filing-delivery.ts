import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes } from "sequelize";
import { sequelize } from "../db/sequelize";

export type DeliveryStatus = "pending" | "sending" | "accepted" | "refused" | "unknown";

/**
 * One recipient of a filing's message (server/modules/filings): written with the filing, then
 * claimed ("sending") before the message goes to the SMTP server, and settled with the server's
 * answer — accepted, refused, back to pending (it did not answer), or unknown (the connection
 * broke mid-message and the mail journal cannot tell).
 */
export class FilingDeliveryModel extends Model<
  InferAttributes<FilingDeliveryModel>,
  InferCreationAttributes<FilingDeliveryModel>
> {
  declare id: CreationOptional<number>;
  declare filingId: number;
  declare recipient: string;
  declare status: CreationOptional<DeliveryStatus>;
  declare attempts: CreationOptional<number>;
  declare claimedAt: Date | null;
  declare detail: string | null;
  declare acceptedAt: Date | null;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;
}

FilingDeliveryModel.init(
  {
    id: { type: DataTypes.INTEGER, primaryKey: true, autoIncrement: true },
    filingId: { type: DataTypes.INTEGER, allowNull: false },
    recipient: { type: DataTypes.STRING(254), allowNull: false },
    status: {
      type: DataTypes.ENUM("pending", "sending", "accepted", "refused", "unknown"),
      allowNull: false,
      defaultValue: "pending",
    },
    attempts: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 0 },
    claimedAt: { type: DataTypes.DATE(3), allowNull: true },
    detail: { type: DataTypes.STRING(500), allowNull: true },
    acceptedAt: { type: DataTypes.DATE(3), allowNull: true },
    createdAt: DataTypes.DATE(3),
    updatedAt: DataTypes.DATE(3),
  },
  { sequelize, tableName: "filing_deliveries" },
);
