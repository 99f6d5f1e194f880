import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes } from "sequelize";
import { sequelize } from "../db/sequelize";
import { UserModel } from "./user";

export class UploadModel extends Model<InferAttributes<UploadModel>, InferCreationAttributes<UploadModel>> {
  declare id: CreationOptional<number>;
  declare fileName: string;
  declare sha256: string;
  declare committedSha256: string | null;
  declare sizeBytes: number;
  declare content: Buffer | null;
  declare uploadedBy: number;
  declare status: "preview" | "committed" | "discarded";
  declare rowCount: number;
  declare validCount: number;
  declare invalidCount: number;
  declare newCount: number;
  declare restatedCount: number;
  declare unchangedCount: number;
  declare insertedCount: number | null;
  declare errorsJson: string | null;
  declare summaryJson: string | null;
  declare committedAt: Date | null;
  /** Who committed it: the who of every version it wrote (committedAt is their when). */
  declare committedBy: number | null;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;
}

UploadModel.init(
  {
    id: { type: DataTypes.INTEGER, primaryKey: true, autoIncrement: true },
    fileName: { type: DataTypes.STRING(255), allowNull: false },
    sha256: { type: DataTypes.CHAR(64), allowNull: false },
    committedSha256: { type: DataTypes.CHAR(64), allowNull: true },
    sizeBytes: { type: DataTypes.INTEGER, allowNull: false },
    content: { type: DataTypes.BLOB("long"), allowNull: true },
    uploadedBy: { type: DataTypes.INTEGER, allowNull: false },
    status: { type: DataTypes.ENUM("preview", "committed", "discarded"), allowNull: false },
    rowCount: { type: DataTypes.INTEGER, allowNull: false },
    validCount: { type: DataTypes.INTEGER, allowNull: false },
    invalidCount: { type: DataTypes.INTEGER, allowNull: false },
    newCount: { type: DataTypes.INTEGER, allowNull: false },
    restatedCount: { type: DataTypes.INTEGER, allowNull: false },
    unchangedCount: { type: DataTypes.INTEGER, allowNull: false },
    insertedCount: { type: DataTypes.INTEGER, allowNull: true },
    errorsJson: { type: DataTypes.TEXT("long"), allowNull: true },
    summaryJson: { type: DataTypes.TEXT, allowNull: true },
    committedAt: { type: DataTypes.DATE(3), allowNull: true },
    committedBy: { type: DataTypes.INTEGER, allowNull: true },
    createdAt: DataTypes.DATE(3),
    updatedAt: DataTypes.DATE(3),
  },
  {
    sequelize,
    tableName: "uploads",
    defaultScope: { attributes: { exclude: ["content"] } },
    scopes: { withContent: {} },
  },
);
UploadModel.belongsTo(UserModel, { foreignKey: "uploadedBy", as: "uploader" });
