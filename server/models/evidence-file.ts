import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes } from "sequelize";
import { sequelize } from "../db/sequelize";

export class EvidenceFileModel extends Model<
  InferAttributes<EvidenceFileModel>,
  InferCreationAttributes<EvidenceFileModel>
> {
  declare id: CreationOptional<number>;
  declare reviewId: number;
  declare fileName: string;
  declare contentType: string;
  declare sizeBytes: number;
  declare sha256: string;
  declare content: Buffer;
  declare uploadedBy: number;
  declare createdAt: CreationOptional<Date>;
}

EvidenceFileModel.init(
  {
    id: { type: DataTypes.INTEGER, primaryKey: true, autoIncrement: true },
    reviewId: { type: DataTypes.INTEGER, allowNull: false },
    fileName: { type: DataTypes.STRING(255), allowNull: false },
    contentType: { type: DataTypes.STRING(100), allowNull: false },
    sizeBytes: { type: DataTypes.INTEGER, allowNull: false },
    sha256: { type: DataTypes.CHAR(64), allowNull: false },
    content: { type: DataTypes.BLOB("long"), allowNull: false },
    uploadedBy: { type: DataTypes.INTEGER, allowNull: false },
    createdAt: DataTypes.DATE(3),
  },
  {
    sequelize,
    tableName: "evidence_files",
    updatedAt: false,
    defaultScope: { attributes: { exclude: ["content"] } },
    scopes: { withContent: {} },
  },
);
