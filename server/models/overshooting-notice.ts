import type { CreationOptional } from "sequelize";
import { sequelize } from "../db/sequelize";
import { RowModel, idColumn, notNull, nullable, timestampColumns, versionColumn } from "./kit";
import { decimalAttribute } from "./decimal";
import type { NoticeStatus } from "../../shared/schemas/notice";

/** An overshooting notice to the supervisor (docs/rules.md#overshooting-notice). */
export class OvershootingNoticeModel extends RowModel<OvershootingNoticeModel> {
  declare portfolioId: number;
  declare businessDate: string;
  declare status: CreationOptional<NoticeStatus>;
  declare revealedOn: string;
  declare dueOn: string;
  declare uploadId: number | null;
  declare series: "actual" | "hypothetical" | "both";
  declare actualPnl: number | null;
  declare hypotheticalPnl: number | null;
  declare var99: number | null;
  declare excess: number | null;
  declare cause: CreationOptional<string | null>;
  declare draftedBy: CreationOptional<number | null>;
  declare draftedAt: CreationOptional<Date | null>;
  declare sentBy: CreationOptional<number | null>;
  declare sentAt: CreationOptional<Date | null>;
  declare recipientsJson: CreationOptional<string | null>;
  declare messageId: CreationOptional<string | null>;
  declare pdfSha256: CreationOptional<string | null>;
  /** The PDF as sent (read only through the "withPdf" scope). */
  declare pdf: CreationOptional<Buffer | null>;
  declare withdrawnAt: CreationOptional<Date | null>;
  declare note: CreationOptional<string | null>;
  declare remindedAt: CreationOptional<Date | null>;
  declare version: CreationOptional<number>;
}

type M = OvershootingNoticeModel;

OvershootingNoticeModel.init(
  {
    ...idColumn(),
    portfolioId: notNull.integer(),
    businessDate: notNull.dateOnly(),
    status: { ...notNull.oneOf("open", "sent", "withdrawn"), defaultValue: "open" },
    revealedOn: notNull.dateOnly(),
    dueOn: notNull.dateOnly(),
    uploadId: nullable.integer(),
    series: notNull.oneOf("actual", "hypothetical", "both"),
    actualPnl: decimalAttribute<M>("actualPnl", 20, 2, { allowNull: true }),
    hypotheticalPnl: decimalAttribute<M>("hypotheticalPnl", 20, 2, { allowNull: true }),
    var99: decimalAttribute<M>("var99", 20, 2, { allowNull: true, field: "var_99" }),
    excess: decimalAttribute<M>("excess", 20, 2, { allowNull: true }),
    cause: nullable.text(),
    draftedBy: nullable.integer(),
    draftedAt: nullable.dateTime(),
    sentBy: nullable.integer(),
    sentAt: nullable.dateTime(),
    recipientsJson: nullable.text(),
    messageId: nullable.varchar(200),
    pdfSha256: nullable.char(64),
    pdf: nullable.blob("medium"),
    withdrawnAt: nullable.dateTime(),
    note: nullable.varchar(500),
    remindedAt: nullable.dateTime(),
    ...versionColumn(),
    ...timestampColumns(),
  },
  {
    sequelize,
    tableName: "overshooting_notices",
    defaultScope: { attributes: { exclude: ["pdf"] } },
    scopes: { withPdf: {} },
  },
);
