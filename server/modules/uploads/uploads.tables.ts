import type { UploadSummary } from "../../../shared/schemas/upload";
import { col, type Column, type Table } from "../../kit/table-export";

const columns: Column<UploadSummary>[] = [
  col.integer("Upload", (u) => u.id),
  col.text("File", (u) => u.fileName),
  col.text("Status", (u) => u.status),
  col.integer("Rows", (u) => u.rows),
  col.integer("Valid", (u) => u.valid),
  col.integer("Invalid", (u) => u.invalid),
  col.integer("New days", (u) => u.newRows),
  col.integer("Restated days", (u) => u.restatements),
  col.integer("Unchanged days", (u) => u.unchanged),
  col.list("Portfolios", (u) => u.portfolios),
  col.date("First day", (u) => u.from),
  col.date("Last day", (u) => u.to),
  col.text("Uploaded by", (u) => u.uploadedBy),
  col.datetime("Uploaded at", (u) => u.uploadedAt),
  col.text("Committed by", (u) => u.committedBy),
  col.datetime("Committed at", (u) => u.committedAt),
  col.text("File sha256", (u) => u.sha256),
];

/** The upload history, as the Data screen lists it. */
export function uploadsTable(rows: UploadSummary[]): Table<UploadSummary> {
  return { title: "Upload history", columns, rows };
}
