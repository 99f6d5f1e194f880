import type { ParsedRow } from "../../../shared/ingest/parse-csv";

/**
 * The checked rows of recent previews, kept in this process so that the commit that usually
 * follows within seconds need not parse the stored file again. Only an optimisation: a commit
 * that finds nothing here (another process, a restart, an evicted entry) parses the stored file,
 * and either way the rows are checked again against the reference data inside the commit.
 * Bounded by rows, oldest out first, so its memory stays small (about 20 MB at the bound).
 */
const MAX_ROWS = 250_000;

interface Entry {
  sha256: string;
  rows: readonly ParsedRow[];
}

const entries = new Map<number, Entry>();
let heldRows = 0;

export function keepCheckedRows(uploadId: number, sha256: string, rows: readonly ParsedRow[]): void {
  if (rows.length > MAX_ROWS) return;
  forgetCheckedRows(uploadId);
  entries.set(uploadId, { sha256, rows });
  heldRows += rows.length;
  for (const [id, entry] of entries) {
    if (heldRows <= MAX_ROWS) break;
    entries.delete(id);
    heldRows -= entry.rows.length;
  }
}

/** The rows kept for this upload, if they are of this very file. */
export function checkedRowsOf(uploadId: number, sha256: string): readonly ParsedRow[] | undefined {
  const entry = entries.get(uploadId);
  return entry && entry.sha256 === sha256 ? entry.rows : undefined;
}

export function forgetCheckedRows(uploadId: number): void {
  const entry = entries.get(uploadId);
  if (!entry) return;
  entries.delete(uploadId);
  heldRows -= entry.rows.length;
}
