import type { UploadSummary } from "../../../shared/schemas/upload";
import type { Column, Table } from "../../kit/table-export";

const columns: Column<UploadSummary>[] = [
  { header: "Upload", kind: "integer", value: (u) => u.id },
  { header: "File", kind: "text", value: (u) => u.fileName },
  { header: "Status", kind: "text", value: (u) => u.status },
  { header: "Rows", kind: "integer", value: (u) => u.rows },
  { header: "Valid", kind: "integer", value: (u) => u.valid },
  { header: "Invalid", kind: "integer", value: (u) => u.invalid },
  { header: "New days", kind: "integer", value: (u) => u.newRows },
  { header: "Restated days", kind: "integer", value: (u) => u.restatements },
  { header: "Unchanged days", kind: "integer", value: (u) => u.unchanged },
  { header: "Portfolios", kind: "text", value: (u) => u.portfolios.join("; ") },
  { header: "First day", kind: "date", value: (u) => u.from },
  { header: "Last day", kind: "date", value: (u) => u.to },
  { header: "Uploaded by", kind: "text", value: (u) => u.uploadedBy },
  { header: "Uploaded at", kind: "datetime", value: (u) => u.uploadedAt },
  { header: "Committed by", kind: "text", value: (u) => u.committedBy },
  { header: "Committed at", kind: "datetime", value: (u) => u.committedAt },
  { header: "File sha256", kind: "text", value: (u) => u.sha256 },
];

/** The upload history, as the Data screen lists it. */
export function uploadsTable(rows: UploadSummary[]): Table<UploadSummary> {
  return { title: "Upload history", columns, rows };
}
