import { sequelize } from "../db/sequelize";
import { RowModel, idColumn, notNull, nullable, timestampColumns } from "./kit";
import { UserModel } from "./user";

export class UploadModel extends RowModel<UploadModel> {
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
}

UploadModel.init(
  {
    ...idColumn(),
    fileName: notNull.varchar(255),
    sha256: notNull.char(64),
    committedSha256: nullable.char(64),
    sizeBytes: notNull.integer(),
    content: nullable.blob("long"),
    uploadedBy: notNull.integer(),
    status: notNull.oneOf("preview", "committed", "discarded"),
    rowCount: notNull.integer(),
    validCount: notNull.integer(),
    invalidCount: notNull.integer(),
    newCount: notNull.integer(),
    restatedCount: notNull.integer(),
    unchangedCount: notNull.integer(),
    insertedCount: nullable.integer(),
    errorsJson: nullable.text("long"),
    summaryJson: nullable.text(),
    committedAt: nullable.dateTime(),
    committedBy: nullable.integer(),
    ...timestampColumns(),
  },
  {
    sequelize,
    tableName: "uploads",
    defaultScope: { attributes: { exclude: ["content"] } },
    scopes: { withContent: {} },
  },
);
UploadModel.belongsTo(UserModel, { foreignKey: "uploadedBy", as: "uploader" });
