import { DataTypes, type CreationOptional } from "sequelize";
import { sequelize } from "../db/sequelize";
import { TableModel, idColumn, notNull } from "./kit";

export class EvidenceFileModel extends TableModel<EvidenceFileModel> {
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
    ...idColumn(),
    reviewId: notNull.integer(),
    fileName: notNull.varchar(255),
    contentType: notNull.varchar(100),
    sizeBytes: notNull.integer(),
    sha256: notNull.char(64),
    content: notNull.blob("long"),
    uploadedBy: notNull.integer(),
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
