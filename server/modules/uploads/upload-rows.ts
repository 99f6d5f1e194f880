import { UploadModel } from "../../models/upload";
import { ConflictError, NotFoundError } from "../../errors";
import { unpackBytes } from "./stored-bytes";
import { decodeCsvBytes, splitCsv } from "../../../shared/ingest/parse-csv";
import type { RowError, UploadRowsPage } from "../../../shared/schemas/upload";

/** A page of the uploaded file's rows as text, each with its errors: the preview table. */
export async function getUploadRows(
  id: number,
  query: { offset: number; limit: number; invalidOnly: boolean },
): Promise<UploadRowsPage> {
  const upload = await UploadModel.scope("withContent").findByPk(id);
  if (!upload) throw new NotFoundError(`No upload #${id}.`);
  if (!upload.content) throw new ConflictError(`Upload #${id} was discarded; its rows are no longer kept.`);
  const text = decodeCsvBytes(unpackBytes(upload.content));
  const data = splitCsv(text).data;
  const columns = (data[0] ?? []).map((h) => h.trim().toLowerCase());
  const errors = upload.errorsJson ? (JSON.parse(upload.errorsJson) as RowError[]) : [];
  const byLine = new Map<number, RowError[]>();
  for (const e of errors) {
    if (!byLine.has(e.line)) byLine.set(e.line, []);
    byLine.get(e.line)!.push(e);
  }
  const lines: { line: number; cells: Record<string, string>; errors: RowError[] }[] = [];
  for (let i = 1; i < data.length; i++) {
    const cells = data[i];
    if (cells.length === 1 && cells[0].trim() === "") continue;
    const line = i + 1;
    const lineErrors = byLine.get(line) ?? [];
    if (query.invalidOnly && lineErrors.length === 0) continue;
    const record: Record<string, string> = {};
    columns.forEach((c, j) => {
      record[c] = cells[j] ?? "";
    });
    lines.push({ line, cells: record, errors: lineErrors });
  }
  return { columns, rows: lines.slice(query.offset, query.offset + query.limit), total: lines.length };
}
