import type { Filing } from "../../../shared/schemas/filing";
import { col, type Column, type Table } from "../../kit/table-export";

const columns: Column<Filing>[] = [
  col.integer("Filing", (f) => f.id),
  col.text("Entity", (f) => f.entity),
  col.text("Entity name", (f) => f.entityName),
  col.date("Quarter end", (f) => f.quarterEnd),
  col.text("Zone", (f) => f.zone),
  col.integer("Exceptions counted", (f) => f.counted),
  col.factor("Multiplier", (f) => f.multiplier),
  col.text("Delivery", (f) => f.delivery),
  col.text("What happened", (f) => f.summary),
  col.list("Recipients", (f) => f.recipients),
  col.text("Filed by", (f) => f.sentBy),
  col.datetime("Sent at", (f) => f.sentAt),
  col.text("Acknowledged by", (f) => f.acknowledgedBy),
  col.datetime("Acknowledged at", (f) => f.acknowledgedAt),
  col.text("Pack file", (f) => f.fileName),
  col.text("Pack sha256", (f) => f.sha256),
  col.integer("Snapshot", (f) => f.snapshotId),
  col.text("Snapshot hash", (f) => f.snapshotHash),
  col.integer("Amends snapshot", (f) => f.amends),
  col.integer("Amended by snapshot", (f) => f.amendedBy),
];

/** The filings the reader may see, as the Filings screen lists them. */
export function filingsTable(rows: Filing[]): Table<Filing> {
  return { title: "Filings", columns, rows };
}
