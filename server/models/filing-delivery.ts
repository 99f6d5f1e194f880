import type { CreationOptional } from "sequelize";
import { sequelize } from "../db/sequelize";
import { RowModel, idColumn, notNull, nullable, timestampColumns } from "./kit";

export type DeliveryStatus = "pending" | "sending" | "accepted" | "refused" | "unknown";

/**
 * One recipient of a filing's message (server/modules/filings): written with the filing, then
 * claimed ("sending") before the message goes to the SMTP server, and settled with the server's
 * answer — accepted, refused, back to pending (it did not answer), or unknown (the connection
 * broke mid-message and the mail journal cannot tell).
 */
export class FilingDeliveryModel extends RowModel<FilingDeliveryModel> {
  declare filingId: number;
  declare recipient: string;
  declare status: CreationOptional<DeliveryStatus>;
  declare attempts: CreationOptional<number>;
  declare claimedAt: Date | null;
  declare detail: string | null;
  declare acceptedAt: Date | null;
}

FilingDeliveryModel.init(
  {
    ...idColumn(),
    filingId: notNull.integer(),
    recipient: notNull.varchar(254),
    status: { ...notNull.oneOf("pending", "sending", "accepted", "refused", "unknown"), defaultValue: "pending" },
    attempts: { ...notNull.integer(), defaultValue: 0 },
    claimedAt: nullable.dateTime(),
    detail: nullable.varchar(500),
    acceptedAt: nullable.dateTime(),
    ...timestampColumns(),
  },
  { sequelize, tableName: "filing_deliveries" },
);
