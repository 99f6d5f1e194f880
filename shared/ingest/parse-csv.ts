import Papa from "papaparse";
import {
  ALL_COLUMNS,
  AMOUNT_COLUMNS,
  POSITIVE_COLUMNS,
  REQUIRED_COLUMNS,
  observationCellsSchema,
  type AmountColumn,
  type CsvColumn,
  type ObservationRow,
  type RowError,
} from "../schemas/upload";
import { dayNumber, fromDayNumber } from "../backtest/calendar";

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
const AMOUNTS: ReadonlySet<string> = new Set(AMOUNT_COLUMNS);

/**
 * Rows of cells. Without a quote character anywhere, a CSV is plain lines of comma-separated
 * cells and a split is exact (and several times faster); otherwise papaparse handles quoting.
 */
export function splitCsv(text: string): { data: string[][]; errors: Papa.ParseError[] } {
  if (!text.includes('"')) return { data: text.split(/\r\n|\n|\r/).map((l) => l.split(",")), errors: [] };
  const parsed = Papa.parse<string[]>(text, { header: false, delimiter: ",", skipEmptyLines: false });
  return { data: parsed.data, errors: parsed.errors };
}

/** Every row has the same shape (all amount columns, null when absent): fast and predictable. */
function newRow(line: number, portfolio: string, date: string): ParsedRow {
  return {
    line,
    portfolio,
    date,
    actual_pnl: null,
    hypothetical_pnl: null,
    var_99: null,
    var_975: null,
    svar_99: null,
    var_10d: null,
    svar_10d: null,
    es_975: null,
    ses: null,
    rtpl: null,
  };
}

/** Why a cell failed its pattern, in words a person can act on. */
function describeCell(column: string, raw: string): string {
  const s = raw.trim();
  if (column === "portfolio") return s === "" ? "portfolio is empty" : `"${s.slice(0, 40)}" is not a portfolio code (letters, digits, - and _; at most 40)`;
  if (column === "date") return s === "" ? "date is empty" : `"${s.slice(0, 20)}" is not a date written YYYY-MM-DD`;
  if (/^-?[\d,]+(\.\d+)?$/.test(s) && s.includes(",")) return `"${s}" uses a thousands separator; write it without commas`;
  if (/^-?(nan|inf(inity)?)$/i.test(s)) return `"${s}" is not a number`;
  if (/e/i.test(s) && !Number.isNaN(Number(s))) return `"${s}" is written with an exponent; write the plain amount`;
  if (/^\s|\s$/.test(raw) && /^(-?\d{1,17}(\.\d{1,8})?)?$/.test(s)) return `"${raw}" has spaces around the amount`;
  return `"${s.slice(0, 30)}" is not a plain decimal amount (digits, optional minus, dot for decimals)`;
}
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
  const parsed = splitCsv(text);
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
  // Dates repeat across portfolios: each is checked against the calendar once.
  const dayOf = new Map<string, number>();
  const firstLineOf = new Map<string, Map<string, number>>();
  const amountAt = columns.map((c) => (AMOUNTS.has(c) ? (c as AmountColumn) : null));
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
    const checked = observationCellsSchema.safeParse(record);
    if (!checked.success) {
      const seenColumns = new Set<string>();
      for (const issue of checked.error.issues) {
        const column = String(issue.path[0] ?? "—");
        if (seenColumns.has(column)) continue;
        seenColumns.add(column);
        fail(line, column, AMOUNTS.has(column) || column === "portfolio" || column === "date" ? describeCell(column, record[column] ?? "") : issue.message);
      }
      continue;
    }
    const row = newRow(line, record.portfolio.trim().toUpperCase(), record.date.trim());
    let bad = false;
    for (let c = 0; c < columns.length; c++) {
      const column = amountAt[c];
      if (column === null) continue;
      const text = cells[c].trim();
      if (text === "") continue; // not reported: stays null
      const value = Math.round(Number(text) * 100) / 100; // stored to the cent, DECIMAL(20,2)
      if (POSITIVE_COLUMNS.has(column) && !(value > 0)) {
        fail(line, column, `${column} must be a positive amount (VaR is reported as a loss amount above zero)`);
        bad = true;
      } else if (column === "ses" && value < 0) {
        fail(line, column, "ses cannot be negative");
        bad = true;
      }
      row[column] = value;
    }
    // Every problem of the row is reported, not only the first.
    let day = dayOf.get(row.date);
    if (day === undefined) {
      try {
        day = dayNumber(row.date);
        dayOf.set(row.date, day);
      } catch {
        fail(line, "date", `${row.date} is not a real calendar date`);
        bad = true;
      }
    }
    const portfolio = ref.portfolios.get(row.portfolio);
    if (!portfolio) {
      fail(line, "portfolio", `Unknown portfolio "${row.portfolio}"; an admin adds portfolios under Admin › Entities`);
      bad = true;
    }
    if (day !== undefined) {
      const weekday = (((day + 4) % 7) + 7) % 7;
      const holiday = portfolio?.holidays.get(row.date);
      if (weekday === 0 || weekday === 6) {
        fail(line, "date", `${row.date} is a ${WEEKDAYS[weekday]}, not a business day`);
        bad = true;
      } else if (holiday) {
        fail(line, "date", `${row.date} is a holiday in the ${portfolio!.entityCode} calendar (${holiday})`);
        bad = true;
      }
    }
    if (bad) continue;
    let seen = firstLineOf.get(row.portfolio);
    if (!seen) firstLineOf.set(row.portfolio, (seen = new Map()));
    const first = seen.get(row.date);
    if (first !== undefined) {
      fail(line, "date", `${row.portfolio} on ${row.date} already appears on line ${first}`);
      continue;
    }
    seen.set(row.date, line);
    rows.push(row);
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

const ROW_BYTES = 4 + 4 + 4 + 8 * AMOUNT_COLUMNS.length; // line, portfolio index, day number, amounts (NaN = not reported)

/**
 * The valid rows of a preview in a compact binary form — a small JSON header naming the
 * portfolios, then fixed-size records — for the commit to read back without parsing the file again.
 */
export function encodeCheckedRows(rows: readonly ParsedRow[]): Uint8Array {
  const portfolios: string[] = [];
  const indexOf = new Map<string, number>();
  for (const r of rows) if (!indexOf.has(r.portfolio)) indexOf.set(r.portfolio, portfolios.push(r.portfolio) - 1);
  const header = new TextEncoder().encode(JSON.stringify({ portfolios }));
  const out = new Uint8Array(4 + header.length + rows.length * ROW_BYTES);
  const view = new DataView(out.buffer);
  view.setUint32(0, header.length, true);
  out.set(header, 4);
  let at = 4 + header.length;
  const dayOf = new Map<string, number>();
  for (const r of rows) {
    let day = dayOf.get(r.date);
    if (day === undefined) dayOf.set(r.date, (day = dayNumber(r.date)));
    view.setUint32(at, r.line, true);
    view.setUint32(at + 4, indexOf.get(r.portfolio)!, true);
    view.setInt32(at + 8, day, true);
    for (let c = 0; c < AMOUNT_COLUMNS.length; c++) view.setFloat64(at + 12 + 8 * c, r[AMOUNT_COLUMNS[c]] ?? Number.NaN, true);
    at += ROW_BYTES;
  }
  return out;
}

/**
 * Reads checked rows back. The cells were validated at preview; what can have changed since is
 * the reference data, so each row's portfolio and holiday calendar are checked again.
 */
export function decodeCheckedRows(bytes: Uint8Array, ref: CsvReferenceData): { rows: ParsedRow[]; errors: RowError[] } {
  const view = new DataView(bytes.buffer, bytes.byteOffset, bytes.byteLength);
  const headerLength = view.getUint32(0, true);
  const { portfolios } = JSON.parse(new TextDecoder().decode(bytes.subarray(4, 4 + headerLength))) as { portfolios: string[] };
  const rows: ParsedRow[] = [];
  const errors: RowError[] = [];
  const dateOf = new Map<number, string>();
  for (let at = 4 + headerLength; at + ROW_BYTES <= bytes.byteLength; at += ROW_BYTES) {
    const day = view.getInt32(at + 8, true);
    let date = dateOf.get(day);
    if (date === undefined) dateOf.set(day, (date = fromDayNumber(day)));
    const row = newRow(view.getUint32(at, true), portfolios[view.getUint32(at + 4, true)], date);
    for (let c = 0; c < AMOUNT_COLUMNS.length; c++) {
      const v = view.getFloat64(at + 12 + 8 * c, true);
      if (!Number.isNaN(v)) row[AMOUNT_COLUMNS[c]] = v;
    }
    const portfolio = ref.portfolios.get(row.portfolio);
    if (!portfolio) errors.push({ line: row.line, column: "portfolio", message: `Portfolio "${row.portfolio}" no longer exists` });
    else if (portfolio.holidays.has(row.date)) errors.push({ line: row.line, column: "date", message: `${row.date} has since become a holiday in the ${portfolio.entityCode} calendar` });
    else rows.push(row);
  }
  return { rows, errors };
}
