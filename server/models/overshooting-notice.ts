import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes } from "sequelize";
import { sequelize } from "../db/sequelize";
import { decimalAttribute } from "./decimal";
import type { NoticeStatus } from "../../shared/schemas/notice";

/** An overshooting notice to the supervisor (docs/rules.md#overshooting-notice). */
export class OvershootingNoticeModel extends Model<
  InferAttributes<OvershootingNoticeModel>,
  InferCreationAttributes<OvershootingNoticeModel>
> {
  declare id: CreationOptional<number>;
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
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;
}

type M = OvershootingNoticeModel;

OvershootingNoticeModel.init(
  {
    id: { type: DataTypes.INTEGER, primaryKey: true, autoIncrement: true },
    portfolioId: { type: DataTypes.INTEGER, allowNull: false },
    businessDate: { type: DataTypes.DATEONLY, allowNull: false },
    status: { type: DataTypes.ENUM("open", "sent", "withdrawn"), allowNull: false, defaultValue: "open" },
    revealedOn: { type: DataTypes.DATEONLY, allowNull: false },
    dueOn: { type: DataTypes.DATEONLY, allowNull: false },
    uploadId: { type: DataTypes.INTEGER, allowNull: true },
    series: { type: DataTypes.ENUM("actual", "hypothetical", "both"), allowNull: false },
    actualPnl: decimalAttribute<M>("actualPnl", 20, 2, { allowNull: true }),
    hypotheticalPnl: decimalAttribute<M>("hypotheticalPnl", 20, 2, { allowNull: true }),
    var99: decimalAttribute<M>("var99", 20, 2, { allowNull: true, field: "var_99" }),
    excess: decimalAttribute<M>("excess", 20, 2, { allowNull: true }),
    cause: { type: DataTypes.TEXT, allowNull: true },
    draftedBy: { type: DataTypes.INTEGER, allowNull: true },
    draftedAt: { type: DataTypes.DATE(3), allowNull: true },
    sentBy: { type: DataTypes.INTEGER, allowNull: true },
    sentAt: { type: DataTypes.DATE(3), allowNull: true },
    recipientsJson: { type: DataTypes.TEXT, allowNull: true },
    messageId: { type: DataTypes.STRING(200), allowNull: true },
    pdfSha256: { type: DataTypes.CHAR(64), allowNull: true },
    pdf: { type: DataTypes.BLOB("medium"), allowNull: true },
    withdrawnAt: { type: DataTypes.DATE(3), allowNull: true },
    note: { type: DataTypes.STRING(500), allowNull: true },
    remindedAt: { type: DataTypes.DATE(3), allowNull: true },
    version: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 1 },
    createdAt: DataTypes.DATE(3),
    updatedAt: DataTypes.DATE(3),
  },
  {
    sequelize,
    tableName: "overshooting_notices",
    defaultScope: { attributes: { exclude: ["pdf"] } },
    scopes: { withPdf: {} },
  },
);
