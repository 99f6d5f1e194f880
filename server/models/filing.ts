import type { CreationOptional } from "sequelize";
import { sequelize } from "../db/sequelize";
import { RowModel, idColumn, notNull, nullable, timestampColumns } from "./kit";

/** A signed-off snapshot's pack as sent to the supervisor (server/modules/filings). */
export class FilingModel extends RowModel<FilingModel> {
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
}

FilingModel.init(
  {
    ...idColumn(),
    snapshotId: notNull.integer(),
    packPdf: notNull.blob("long"),
    packSha256: notNull.char(64),
    fileName: notNull.varchar(255),
    recipientsJson: notNull.text(),
    messageId: nullable.varchar(255),
    sentBy: notNull.integer(),
    sentAt: nullable.dateTime(),
    delivery: { ...notNull.oneOf("pending", "partial", "sent"), defaultValue: "pending" },
    attempts: { ...notNull.integer(), defaultValue: 1 },
    lastError: nullable.varchar(500),
    acknowledgedBy: nullable.integer(),
    acknowledgedAt: nullable.dateTime(),
    acknowledgedSha256: nullable.char(64),
    ...timestampColumns(),
  },
  { sequelize, tableName: "filings", defaultScope: { attributes: { exclude: ["packPdf"] } }, scopes: { withPack: {} } },
);
