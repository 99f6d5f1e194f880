import type { Finding } from "../../../shared/schemas/finding";
import type { Column, Table } from "../../kit/table-export";

const columns: Column<Finding>[] = [
  { header: "Finding", kind: "integer", value: (f) => f.id },
  { header: "Entity", kind: "text", value: (f) => f.entity },
  { header: "Portfolio", kind: "text", value: (f) => f.portfolio },
  { header: "Kind", kind: "text", value: (f) => f.kind },
  { header: "From", kind: "date", value: (f) => f.from },
  { header: "To", kind: "date", value: (f) => f.to },
  { header: "Detail", kind: "text", value: (f) => f.detail },
  { header: "Status", kind: "text", value: (f) => f.status },
  { header: "Note", kind: "text", value: (f) => f.note },
  { header: "Closed by", kind: "text", value: (f) => f.closedBy },
  { header: "Closed at", kind: "datetime", value: (f) => f.closedAt },
];

/** Data-quality findings with the filter of the Data screen applied. */
export function findingsTable(rows: Finding[], filter: { entity?: string; status?: string }): Table<Finding> {
  const scope = [filter.entity, filter.status].filter(Boolean).join(" ");
  return { title: `Findings${scope ? ` ${scope}` : ""}`, columns, rows };
}
