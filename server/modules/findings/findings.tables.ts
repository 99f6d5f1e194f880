import type { Finding } from "../../../shared/schemas/finding";
import { col, type Column, type Table } from "../../kit/table-export";

const columns: Column<Finding>[] = [
  col.integer("Finding", (f) => f.id),
  col.text("Entity", (f) => f.entity),
  col.text("Portfolio", (f) => f.portfolio),
  col.text("Kind", (f) => f.kind),
  col.date("From", (f) => f.from),
  col.date("To", (f) => f.to),
  col.text("Detail", (f) => f.detail),
  col.text("Status", (f) => f.status),
  col.text("Note", (f) => f.note),
  col.text("Closed by", (f) => f.closedBy),
  col.datetime("Closed at", (f) => f.closedAt),
];

/** Data-quality findings with the filter of the Data screen applied. */
export function findingsTable(rows: Finding[], filter: { entity?: string; status?: string }): Table<Finding> {
  const scope = [filter.entity, filter.status].filter(Boolean).join(" ");
  return { title: `Findings${scope ? ` ${scope}` : ""}`, columns, rows };
}
