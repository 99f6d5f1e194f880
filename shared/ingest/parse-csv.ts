import Papa from "papaparse";
import {
  ALL_COLUMNS,
  REQUIRED_COLUMNS,
  observationRowSchema,
  type CsvColumn,
  type ObservationRow,
  type RowError,
} from "../schemas/upload";
import { dayNumber } from "../backtest/calendar";

/** What the parser needs to know about the portfolios a file may name. */
export interface CsvReferenceData {
  portfolios: ReadonlyMap<string, { entityCode: string; holidays: ReadonlyMap<string, string> }>;
}

export interface ParsedRow extends ObservationRow {
  line: number;
}

export interface ParsedCsv {
  columns: CsvColumn[];
  /** Rows that passed every check, in file order. */
  rows: ParsedRow[];
  /** Every problem found, in line order. */
  errors: RowError[];
  /** Data lines in the file (blank lines not counted). */
  totalRows: number;
  invalidLines: Set<number>;
}

/** A problem with the file as a whole: nothing in it can be used. */
export class CsvFileError extends Error {
  constructor(
    message: string,
    readonly errors: RowError[] = [],
    readonly status: 415 | 422 = 422,
  ) {
    super(message);
    this.name = "CsvFileError";
  }
}

const KNOWN: ReadonlySet<string> = new Set(ALL_COLUMNS);
const WEEKDAYS = ["Sunday", "Monday", "Tuesday", "Wednesday", "Thursday", "Friday", "Saturday"];

/** Text of an uploaded file, or why it is not a text CSV at all. */
export function decodeCsvBytes(bytes: Uint8Array): string {
  if (bytes.length === 0) throw new CsvFileError("The file is empty.");
  if (bytes.includes(0)) throw new CsvFileError("This is not a text CSV file (it contains binary data).", [], 415);
  let text: string;
  try {
    text = new TextDecoder("utf-8", { fatal: true }).decode(bytes);
  } catch {
    throw new CsvFileError("This is not a UTF-8 text CSV file.", [], 415);
  }
  return text.charCodeAt(0) === 0xfeff ? text.slice(1) : text;
}

function checkHeader(header: string[]): CsvColumn[] {
  const errors: RowError[] = [];
  const seen = new Set<string>();
  const columns = header.map((h) => h.trim().toLowerCase());
  columns.forEach((name, i) => {
    const column = name || `column ${i + 1}`;
    if (!KNOWN.has(name)) {
      errors.push({ line: 1, column, message: `Unknown column "${header[i].trim().slice(0, 40)}". Allowed: ${ALL_COLUMNS.join(", ")}` });
    } else if (seen.has(name)) {
      errors.push({ line: 1, column, message: `Column "${name}" appears twice` });
    }
    seen.add(name);
  });
  for (const required of REQUIRED_COLUMNS) {
    if (!seen.has(required)) errors.push({ line: 1, column: required, message: `Required column "${required}" is missing` });
  }
  if (errors.length) throw new CsvFileError("The header row is not valid: nothing in the file was read.", errors);
  return columns as CsvColumn[];
}

/**
 * Parses and checks a daily data file: header, every cell against the row schema, then the
 * reference data (known portfolio, the entity's business days, one row per portfolio and day).
 */
export function parseObservationCsv(text: string, ref: CsvReferenceData): ParsedCsv {
  if (text.trim() === "") throw new CsvFileError("The file is empty.");
  const parsed = Papa.parse<string[]>(text, { header: false, delimiter: ",", skipEmptyLines: false });
  const data = parsed.data;
  const columns = checkHeader(data[0] ?? []);
  if (data.slice(1).every((r) => r.length === 1 && r[0].trim() === "")) {
    throw new CsvFileError("The file has a header row but no data rows.");
  }

  const errors: RowError[] = [];
  const invalidLines = new Set<number>();
  const fail = (line: number, column: string, message: string) => {
    errors.push({ line, column, message });
    invalidLines.add(line);
  };
  // Structural problems papaparse saw (an unclosed quote swallows the rest of the file).
  for (const e of parsed.errors) {
    if (e.code === "UndetectableDelimiter") continue;
    const line = (e.row ?? 0) + 1;
    if (e.code === "MissingQuotes") fail(line, "—", "A quoted field is never closed: the rest of the file cannot be read reliably");
    else if (e.code !== "TooFewFields" && e.code !== "TooManyFields") fail(line, "—", e.message);
  }

  const rows: ParsedRow[] = [];
  const firstLineOf = new Map<string, number>();
  let totalRows = 0;
  for (let i = 1; i < data.length; i++) {
    const cells = data[i];
    const line = i + 1;
    if (cells.length === 1 && cells[0].trim() === "") continue; // blank line
    totalRows++;
    if (invalidLines.has(line)) continue;
    if (cells.length !== columns.length) {
      fail(line, "—", `Expected ${columns.length} fields as in the header, found ${cells.length}`);
      continue;
    }
    const record: Record<string, string> = {};
    for (let c = 0; c < columns.length; c++) record[columns[c]] = cells[c];
    const result = observationRowSchema.safeParse(record);
    if (!result.success) {
      for (const issue of result.error.issues) fail(line, String(issue.path[0] ?? "—"), issue.message);
      continue;
    }
    const row = result.data;
    const portfolio = ref.portfolios.get(row.portfolio);
    if (!portfolio) {
      fail(line, "portfolio", `Unknown portfolio "${row.portfolio}"; an admin adds portfolios under Admin › Entities`);
      continue;
    }
    const weekday = ((dayNumber(row.date) + 4) % 7 + 7) % 7;
    if (weekday === 0 || weekday === 6) {
      fail(line, "date", `${row.date} is a ${WEEKDAYS[weekday]}, not a business day`);
      continue;
    }
    const holiday = portfolio.holidays.get(row.date);
    if (holiday) {
      fail(line, "date", `${row.date} is a holiday in the ${portfolio.entityCode} calendar (${holiday})`);
      continue;
    }
    const key = `${row.portfolio}|${row.date}`;
    const first = firstLineOf.get(key);
    if (first !== undefined) {
      fail(line, "date", `${row.portfolio} on ${row.date} already appears on line ${first}`);
      continue;
    }
    firstLineOf.set(key, line);
    rows.push({ ...row, line });
  }
  errors.sort((a, b) => a.line - b.line);
  return { columns, rows: rows.filter((r) => !invalidLines.has(r.line)), errors, totalRows, invalidLines };
}

/** Writes rows back as CSV in the template's column order (used by the template and by tests). */
export function serialiseObservationCsv(rows: Partial<Record<CsvColumn, string | number | null>>[], columns: readonly CsvColumn[] = ALL_COLUMNS): string {
  const lines = [columns.join(",")];
  for (const r of rows) lines.push(columns.map((c) => (r[c] === null || r[c] === undefined ? "" : String(r[c]))).join(","));
  return `${lines.join("\n")}\n`;
}
