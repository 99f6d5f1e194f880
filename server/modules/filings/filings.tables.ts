import type { Filing } from "../../../shared/schemas/filing";
import type { Column, Table } from "../../kit/table-export";

const columns: Column<Filing>[] = [
  { header: "Filing", kind: "integer", value: (f) => f.id },
  { header: "Entity", kind: "text", value: (f) => f.entity },
  { header: "Entity name", kind: "text", value: (f) => f.entityName },
  { header: "Quarter end", kind: "date", value: (f) => f.quarterEnd },
  { header: "Zone", kind: "text", value: (f) => f.zone },
  { header: "Exceptions counted", kind: "integer", value: (f) => f.counted },
  { header: "Multiplier", kind: "number", decimals: 2, value: (f) => f.multiplier },
  { header: "Delivery", kind: "text", value: (f) => f.delivery },
  { header: "What happened", kind: "text", value: (f) => f.summary },
  { header: "Recipients", kind: "text", value: (f) => f.recipients.join("; ") },
  { header: "Filed by", kind: "text", value: (f) => f.sentBy },
  { header: "Sent at", kind: "datetime", value: (f) => f.sentAt },
  { header: "Acknowledged by", kind: "text", value: (f) => f.acknowledgedBy },
  { header: "Acknowledged at", kind: "datetime", value: (f) => f.acknowledgedAt },
  { header: "Pack file", kind: "text", value: (f) => f.fileName },
  { header: "Pack sha256", kind: "text", value: (f) => f.sha256 },
  { header: "Snapshot", kind: "integer", value: (f) => f.snapshotId },
  { header: "Snapshot hash", kind: "text", value: (f) => f.snapshotHash },
  { header: "Amends snapshot", kind: "integer", value: (f) => f.amends },
  { header: "Amended by snapshot", kind: "integer", value: (f) => f.amendedBy },
];

/** The filings the reader may see, as the Filings screen lists them. */
export function filingsTable(rows: Filing[]): Table<Filing> {
  return { title: "Filings", columns, rows };
}
