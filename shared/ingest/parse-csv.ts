import Papa from "papaparse";
import {
  AMOUNT_PATTERN,
  CELL_PATTERNS,
  ALL_COLUMNS,
  AMOUNT_COLUMNS,
  NOT_NEGATIVE_COLUMNS,
  POSITIVE_COLUMNS,
  REQUIRED_COLUMNS,
  observationCellsSchema,
  type AmountColumn,
  type CsvColumn,
  type ObservationRow,
  type RowError,
} from "../schemas/upload";
import { civilDayNumber, dayNumber } from "../backtest/calendar";

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
  /** The first KEPT_ERRORS problems found, in line order. */
  errors: RowError[];
  /** Every problem found, kept or not. */
  errorCount: number;
  /** Data lines in the file (blank lines not counted). */
  totalRows: number;
  /** Data lines with at least one problem. */
  invalidCount: number;
  /** The template's example lines (portfolio `example`), skipped. */
  exampleRows: number;
}

/**
 * The portfolio of the template's example lines. Lower case, so no real portfolio code (capitals,
 * digits, - and _) can ever be it: an untouched template never writes or restates a day.
 */
export const EXAMPLE_PORTFOLIO = "example";
const isExampleLine = (text: string, start: number) => text.startsWith(`${EXAMPLE_PORTFOLIO},`, start);

/**
 * How many problems a parse keeps (the rest are counted): a file of nothing but bad cells would
 * otherwise make an object per cell, and two such 15 MB files exhausted a 256 MB heap.
 */
export const KEPT_ERRORS = 1000;

/**
 * No line of a daily file comes near this (12 columns of at most ~30 characters); a longer line
 * refuses the file before any pattern looks at it.
 */
export const LONGEST_LINE = 64 * 1024;
/** No cell of a daily file is longer than this (a portfolio code of 40, with spaces around). */
const LONGEST_CELL = 256;

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

function overlongLine(line: number, length: number): CsvFileError {
  return new CsvFileError(
    `Line ${line} is ${length} characters long; no line of a daily data file comes near ${LONGEST_LINE}. Nothing was read.`,
    [{ line, column: "—", message: `${length} characters on one line` }],
  );
}

const KNOWN: ReadonlySet<string> = new Set(ALL_COLUMNS);
const AMOUNTS: ReadonlySet<string> = new Set(AMOUNT_COLUMNS);

/**
 * Rows of cells. Without a quote character anywhere, a CSV is plain lines of comma-separated
 * cells and a split is exact (and several times faster); otherwise papaparse handles quoting.
 */
export function splitCsv(text: string): { data: string[][]; errors: Papa.ParseError[] } {
  if (!text.includes('"'))
    return {
      data: (text.includes("\r") ? text.split(/\r\n|\n|\r/) : text.split("\n")).map((l) => l.split(",")),
      errors: [],
    };
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
    ima_drc: null,
    sbm: null,
    rrao: null,
    sa_drc: null,
    sa_ga: null,
    fees_commissions: null,
    reserves_adjustments: null,
    net_interest_income: null,
    intraday_pnl: null,
    new_trade_pnl: null,
  };
}

/** Why a cell failed its pattern, in words a person can act on. */
function describeCell(column: string, cell: string): string {
  // Never a pattern over more than a short cell's worth of text (a 15 MB cell overflowed the stack).
  if (cell.length > LONGEST_CELL) return `the ${column} cell is ${cell.length} characters long, not a value`;
  const raw = cell;
  const s = raw.trim();
  if (column === "portfolio")
    return s === ""
      ? "portfolio is empty"
      : `"${s.slice(0, 40)}" is not a portfolio code (letters, digits, - and _; at most 40)`;
  if (column === "date") return s === "" ? "date is empty" : `"${s.slice(0, 20)}" is not a date written YYYY-MM-DD`;
  if (/^-?[\d,]+(\.\d+)?$/.test(s) && s.includes(","))
    return `"${s}" uses a thousands separator; write it without commas`;
  if (/^-?(nan|inf(inity)?)$/i.test(s)) return `"${s}" is not a number`;
  if (/e/i.test(s) && !Number.isNaN(Number(s))) return `"${s}" is written with an exponent; write the plain amount`;
  if (/^\s|\s$/.test(raw) && AMOUNT_PATTERN.test(s)) return `"${raw}" has spaces around the amount`;
  if (/^-?\d{14,}(\.\d+)?$/.test(s)) return `"${s.slice(0, 30)}" has more than 13 digits before the decimal point`;
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
      errors.push({
        line: 1,
        column,
        message: `Unknown column "${header[i].trim().slice(0, 40)}". Allowed: ${ALL_COLUMNS.join(", ")}`,
      });
    } else if (seen.has(name)) {
      errors.push({ line: 1, column, message: `Column "${name}" appears twice` });
    }
    seen.add(name);
  });
  for (const required of REQUIRED_COLUMNS) {
    if (!seen.has(required))
      errors.push({ line: 1, column: required, message: `Required column "${required}" is missing` });
  }
  if (errors.length) throw new CsvFileError("The header row is not valid: nothing in the file was read.", errors);
  return columns as CsvColumn[];
}

type PortfolioRef = CsvReferenceData["portfolios"] extends ReadonlyMap<string, infer P> ? P : never;

const COMMA = 44;
/** What a cell of a plain line must be. */
const KIND_TEXT = 0; // portfolio or date
const KIND_SIGNED = 1;
const KIND_POSITIVE = 2;
const KIND_NOT_NEGATIVE = 3;

/**
 * Sets an amount by its index in AMOUNT_COLUMNS with a named store each: one shape of row, and
 * no store keyed by a column name that changes from cell to cell (which V8 makes slow).
 */
function setAmount(row: ParsedRow, index: number, value: number): void {
  switch (index) {
    case 0:
      row.actual_pnl = value;
      break;
    case 1:
      row.hypothetical_pnl = value;
      break;
    case 2:
      row.var_99 = value;
      break;
    case 3:
      row.var_975 = value;
      break;
    case 4:
      row.svar_99 = value;
      break;
    case 5:
      row.var_10d = value;
      break;
    case 6:
      row.svar_10d = value;
      break;
    case 7:
      row.es_975 = value;
      break;
    case 8:
      row.ses = value;
      break;
    case 9:
      row.rtpl = value;
      break;
    case 10:
      row.ima_drc = value;
      break;
    case 11:
      row.sbm = value;
      break;
    case 12:
      row.rrao = value;
      break;
    case 13:
      row.sa_drc = value;
      break;
    case 14:
      row.sa_ga = value;
      break;
    case 15:
      row.fees_commissions = value;
      break;
    case 16:
      row.reserves_adjustments = value;
      break;
    case 17:
      row.net_interest_income = value;
      break;
    case 18:
      row.intraday_pnl = value;
      break;
    case 19:
      row.new_trade_pnl = value;
      break;
    default:
      throw new Error(`no amount column ${index}`);
  }
}

// setAmount() must follow AMOUNT_COLUMNS: each index sets the column of that index (checked once, at load).
{
  const probe = newRow(0, "", "");
  AMOUNT_COLUMNS.forEach((column, i) => {
    setAmount(probe, i, i + 1);
    if (probe[column] !== i + 1) throw new Error(`setAmount(${i}) must set ${column}`);
  });
}

const MINUS = 45;
const DOT = 46;
const isDigit = (ch: number) => ch >= 48 && ch <= 57;
const isLetter = (ch: number) => (ch >= 65 && ch <= 90) || (ch >= 97 && ch <= 122);
const isCodeChar = (ch: number) => isDigit(ch) || isLetter(ch) || ch === 95 || ch === MINUS;

/** Amounts are stored to the cent, DECIMAL(20,2); a half cent rounds away from zero on both sides. */
const toCents = (value: number) => (value < 0 ? -Math.round(-value * 100) : Math.round(value * 100)) / 100;

/**
 * The checks every data line goes through, and the rows and problems they produce. A line is
 * checked either from its cells (`cells`, the general way, which words every problem) or, when
 * it is plain — no quotes, no spaces, a real date, signs right — straight from the file's text
 * without making a string per cell (`plainLine`, which hands anything else to `cells`).
 */
class LineChecks {
  readonly rows: ParsedRow[] = [];
  readonly errors: RowError[] = [];
  errorCount = 0;
  invalidCount = 0;
  private lastInvalidLine = -1;
  /** Data lines checked so far (for the hopeless-file stop). */
  private linesSeen = 0;
  private readonly width: number;
  private readonly amountAt: (AmountColumn | null)[];
  private readonly patternAt: RegExp[];
  private readonly portfolioAt: number;
  private readonly dateAt: number;
  /** Portfolio → day number → the first line with it (one row per portfolio and day). */
  private readonly firstLineOf = new Map<string, DaysSeen>();
  /** One string per date, shared by the rows of every portfolio. */
  private readonly dateText = new Map<number, string>();
  private readonly scratch: Float64Array;
  /** Per column, for plain lines: what its cells must be (KIND_*) and, for an amount, its index in AMOUNT_COLUMNS. */
  private readonly kindAt: Uint8Array;
  private readonly amountIndexAt: Int8Array;
  // Files come grouped by portfolio: the last portfolio cell's lookups are reused while it repeats.
  private lastCell: string | undefined;
  private code = "";
  private portfolio: PortfolioRef | undefined;
  private seen = new DaysSeen();

  constructor(
    readonly columns: CsvColumn[],
    private readonly ref: CsvReferenceData,
  ) {
    this.width = columns.length;
    this.amountAt = columns.map((c) => (AMOUNTS.has(c) ? (c as AmountColumn) : null));
    this.patternAt = columns.map((c) => CELL_PATTERNS[c]);
    this.portfolioAt = columns.indexOf("portfolio");
    this.dateAt = columns.indexOf("date");
    this.scratch = new Float64Array(columns.length);
    this.kindAt = Uint8Array.from(columns, (c) =>
      !AMOUNTS.has(c)
        ? KIND_TEXT
        : POSITIVE_COLUMNS.has(c as AmountColumn)
          ? KIND_POSITIVE
          : NOT_NEGATIVE_COLUMNS.has(c as AmountColumn)
            ? KIND_NOT_NEGATIVE
            : KIND_SIGNED,
    );
    this.amountIndexAt = Int8Array.from(columns, (c) => AMOUNT_COLUMNS.indexOf(c as AmountColumn));
  }

  fail(line: number, column: string, message: string): void {
    if (this.errors.length < KEPT_ERRORS) this.errors.push({ line, column, message });
    this.errorCount++;
    if (line !== this.lastInvalidLine) {
      this.lastInvalidLine = line;
      this.invalidCount++;
    }
  }

  /**
   * A file is hopeless once the kept problems are full and most lines so far were bad: reading
   * stops there and the file is refused as a whole, with the problems found so far.
   */
  private stopIfHopeless(line: number): void {
    if (this.errors.length < KEPT_ERRORS || this.rows.length >= this.invalidCount) return;
    throw new CsvFileError(
      `Reading stopped at line ${line}: ${this.invalidCount} of the first ${this.linesSeen} data lines have problems ` +
        `(${this.errorCount} in all), so this does not look like a daily data file. Nothing was read; ` +
        "the first problems are listed. Check that it is the right file, in the template's columns.",
      this.errors.slice(0, 200),
    );
  }

  /** A data line, checked in place when it is plain, else cell by cell. */
  line(text: string, start: number, end: number, line: number, plain: boolean): void {
    if (end - start > LONGEST_LINE) throw overlongLine(line, end - start);
    this.linesSeen++;
    if (!plain || !this.plainLine(text, start, end, line)) this.cells(text.slice(start, end).split(","), line);
    this.stopIfHopeless(line);
  }

  /** A data line already cut into cells (the quoted way). */
  cellLine(cells: string[], line: number): void {
    for (const cell of cells) if (cell.length > LONGEST_LINE) throw overlongLine(line, cell.length);
    this.linesSeen++;
    this.cells(cells, line);
    this.stopIfHopeless(line);
  }

  /** A line as cells: the schema's patterns, then the values and the reference data. */
  cells(cells: string[], line: number): void {
    const { columns } = this;
    if (cells.length !== this.width) {
      this.fail(line, "—", `Expected ${this.width} fields as in the header, found ${cells.length}`);
      return;
    }
    // No pattern ever runs over an overlong cell: it is reported by its length.
    let longCells = false;
    for (let c = 0; c < this.width; c++) {
      if (cells[c].length > LONGEST_CELL) {
        this.fail(line, columns[c], describeCell(columns[c], cells[c]));
        longCells = true;
      }
    }
    if (longCells) return;
    // The schema's own patterns first; only a row that fails one goes through zod for its issues.
    let cellsOk = true;
    for (let c = 0; c < this.width; c++) {
      if (!this.patternAt[c].test(cells[c])) {
        cellsOk = false;
        break;
      }
    }
    if (!cellsOk) {
      const record: Record<string, string> = {};
      for (let c = 0; c < this.width; c++) record[columns[c]] = cells[c];
      const checked = observationCellsSchema.safeParse(record);
      const seenColumns = new Set<string>();
      for (const issue of checked.error?.issues ?? []) {
        const column = String(issue.path[0] ?? "—");
        if (seenColumns.has(column)) continue;
        seenColumns.add(column);
        this.fail(
          line,
          column,
          AMOUNTS.has(column) || column === "portfolio" || column === "date"
            ? describeCell(column, record[column] ?? "")
            : issue.message,
        );
      }
      return;
    }
    this.usePortfolio(cells[this.portfolioAt]);
    const row = newRow(line, this.code, cells[this.dateAt].trim());
    let bad = false;
    for (let c = 0; c < this.width; c++) {
      const column = this.amountAt[c];
      if (column === null) continue;
      const text = cells[c]; // the amount pattern allows no spaces
      if (text.length === 0) continue; // not reported: stays null
      const value = toCents(Number(text));
      if (POSITIVE_COLUMNS.has(column) && !(value > 0)) {
        this.fail(line, column, `${column} must be a positive amount (VaR is reported as a loss amount above zero)`);
        bad = true;
      } else if (NOT_NEGATIVE_COLUMNS.has(column) && value < 0) {
        this.fail(line, column, `${column} cannot be negative`);
        bad = true;
      }
      row[column] = value;
    }
    let day: number | undefined;
    try {
      day = dayNumber(row.date);
    } catch {
      this.fail(line, "date", `${row.date} is not a real calendar date`);
      bad = true;
    }
    this.finish(row, day, bad);
  }

  /**
   * The same checks on a plain line, read in place from `text` between `start` and `end`.
   * Returns false, having recorded nothing, when the line is anything but plain and valid.
   */
  plainLine(text: string, start: number, end: number, line: number): boolean {
    const { scratch } = this;
    let at = start;
    let day: number | undefined;
    let date = "";
    for (let c = 0; c < this.width; c++) {
      let stop = at;
      while (stop < end && text.charCodeAt(stop) !== COMMA) stop++;
      if (c < this.width - 1 ? stop >= end : stop !== end) return false; // another number of fields
      const kind = this.kindAt[c];
      if (kind !== KIND_TEXT) {
        const value = plainAmount(text, at, stop);
        if (value === undefined) return false;
        if (
          (kind === KIND_POSITIVE && !(value > 0) && !Number.isNaN(value)) ||
          (kind === KIND_NOT_NEGATIVE && value < 0)
        )
          return false;
        scratch[c] = value;
      } else if (c === this.portfolioAt) {
        const length = stop - at;
        const lead = text.charCodeAt(at);
        if (length < 1 || length > 40 || !(isDigit(lead) || isLetter(lead))) return false;
        for (let i = at + 1; i < stop; i++) if (!isCodeChar(text.charCodeAt(i))) return false;
        if (this.lastCell === undefined || this.lastCell.length !== length || !text.startsWith(this.lastCell, at))
          this.usePortfolio(text.slice(at, stop));
      } else {
        day = plainDay(text, at, stop);
        if (day === undefined) return false;
        const known = this.dateText.get(day);
        if (known === undefined) this.dateText.set(day, (date = text.slice(at, stop)));
        else date = known;
      }
      at = stop + 1;
    }
    const row = newRow(line, this.code, date);
    for (let c = 0; c < this.width; c++) {
      const value = scratch[c];
      if (this.kindAt[c] !== KIND_TEXT && !Number.isNaN(value)) setAmount(row, this.amountIndexAt[c], value);
    }
    // A reference-data problem is recorded by finish() with the same words either way.
    this.finish(row, day, false);
    return true;
  }

  private usePortfolio(cell: string): void {
    this.lastCell = cell;
    this.code = cell.trim().toUpperCase();
    this.portfolio = this.ref.portfolios.get(this.code);
    let seen = this.firstLineOf.get(this.code);
    if (!seen) this.firstLineOf.set(this.code, (seen = new DaysSeen()));
    this.seen = seen;
  }

  /** The checks after the cells: known portfolio, business day, once per portfolio and day. Every problem of the row is reported. */
  private finish(row: ParsedRow, day: number | undefined, bad: boolean): void {
    const { line } = row;
    const portfolio = this.portfolio;
    if (!portfolio) {
      this.fail(line, "portfolio", `Unknown portfolio "${this.code}"; an admin adds portfolios under Admin › Entities`);
      bad = true;
    }
    if (day !== undefined) {
      const weekday = (((day + 4) % 7) + 7) % 7;
      const holiday = portfolio && portfolio.holidays.size ? portfolio.holidays.get(row.date) : undefined;
      if (weekday === 0 || weekday === 6) {
        this.fail(line, "date", `${row.date} is a ${WEEKDAYS[weekday]}, not a business day`);
        bad = true;
      } else if (holiday) {
        this.fail(line, "date", `${row.date} is a holiday in the ${portfolio!.entityCode} calendar (${holiday})`);
        bad = true;
      }
    }
    if (bad) return;
    const first = this.seen.firstLine(day!);
    if (first !== undefined) {
      this.fail(line, "date", `${this.code} on ${row.date} already appears on line ${first}`);
      return;
    }
    this.seen.add(day!, line);
    this.rows.push(row);
  }
}

/**
 * The days one portfolio's rows have named so far, each with its first line. Files list a
 * portfolio's days in order, so while they come in order a day after the last cannot repeat one
 * and is only appended; the first day out of order turns the list into a map.
 */
class DaysSeen {
  private readonly days: number[] = [];
  private readonly lines: number[] = [];
  private map: Map<number, number> | undefined;

  firstLine(day: number): number | undefined {
    if (this.map) return this.map.get(day);
    const { days } = this;
    if (days.length === 0 || day > days[days.length - 1]) return undefined;
    let lo = 0;
    let hi = days.length - 1;
    while (lo <= hi) {
      const mid = (lo + hi) >> 1;
      if (days[mid] === day) return this.lines[mid];
      if (days[mid] < day) lo = mid + 1;
      else hi = mid - 1;
    }
    return undefined;
  }

  add(day: number, line: number): void {
    if (this.map) {
      this.map.set(day, line);
      return;
    }
    const { days } = this;
    if (days.length === 0 || day > days[days.length - 1]) {
      days.push(day);
      this.lines.push(line);
      return;
    }
    this.map = new Map(days.map((d, i) => [d, this.lines[i]]));
    this.map.set(day, line);
  }
}

/**
 * A plain amount cell read in place: NaN when empty (not reported), undefined when it does not
 * match AMOUNT_PATTERN. With 2 decimals or fewer it is worked out in whole cents, which is
 * exactly toCents(Number(cell)) (tests/shared/ingest check the two agree).
 */
function plainAmount(text: string, start: number, end: number): number | undefined {
  if (start === end) return Number.NaN;
  let at = start;
  const negative = text.charCodeAt(at) === MINUS;
  if (negative) at++;
  let whole = 0;
  let wholeDigits = 0;
  while (at < end && isDigit(text.charCodeAt(at))) {
    whole = whole * 10 + (text.charCodeAt(at) - 48);
    wholeDigits++;
    at++;
  }
  if (wholeDigits < 1 || wholeDigits > 13) return undefined;
  let cents = 0;
  let decimals = 0;
  if (at < end) {
    if (text.charCodeAt(at) !== DOT) return undefined;
    at++;
    while (at < end && isDigit(text.charCodeAt(at))) {
      if (decimals < 2) cents = cents * 10 + (text.charCodeAt(at) - 48);
      decimals++;
      at++;
    }
    if (at !== end || decimals < 1 || decimals > 8) return undefined;
  }
  if (decimals > 2) return toCents(Number(text.slice(start, end)));
  const total = whole * 100 + (decimals === 1 ? cents * 10 : cents);
  return (negative ? -total : total) / 100;
}

/** A plain YYYY-MM-DD cell read in place: its day number, or undefined (not plain, or no such date). */
function plainDay(text: string, start: number, end: number): number | undefined {
  if (end - start !== 10 || text.charCodeAt(start + 4) !== MINUS || text.charCodeAt(start + 7) !== MINUS)
    return undefined;
  let y = 0;
  let m = 0;
  let d = 0;
  for (let i = 0; i < 10; i++) {
    if (i === 4 || i === 7) continue;
    const ch = text.charCodeAt(start + i);
    if (!isDigit(ch)) return undefined;
    if (i < 4) y = y * 10 + (ch - 48);
    else if (i < 7) m = m * 10 + (ch - 48);
    else d = d * 10 + (ch - 48);
  }
  return civilDayNumber(y, m, d);
}

const isBlank = (line: string) => line.trim() === "";

/** `plainLines: false` sends every line the general way; tests use it to check that both ways agree. */
export interface ParseOptions {
  plainLines?: boolean;
}

/**
 * Parses and checks a daily data file: header, every cell against the row schema, then the
 * reference data (known portfolio, the entity's business days, one row per portfolio and day).
 * A file without quotes is read line by line in place; a file with quotes goes through papaparse.
 */
export function parseObservationCsv(text: string, ref: CsvReferenceData, options: ParseOptions = {}): ParsedCsv {
  if (text.trim() === "") throw new CsvFileError("The file is empty.");
  if (!text.includes('"')) {
    const lines = new PlainLines(ref, options, { throwOnHeader: true });
    lines.feed(text.includes("\r") ? text.replace(/\r\n?/g, "\n") : text, true);
    return lines.result();
  }
  let totalRows = 0;
  const parsed = splitCsv(text);
  const data = parsed.data;
  const checks = new LineChecks(checkHeader(data[0] ?? []), ref);
  // Structural problems papaparse saw (an unclosed quote swallows the rest of the file).
  for (const e of parsed.errors) {
    if (e.code === "UndetectableDelimiter") continue;
    const line = (e.row ?? 0) + 1;
    if (e.code === "MissingQuotes")
      checks.fail(line, "—", "A quoted field is never closed: the rest of the file cannot be read reliably");
    else if (e.code !== "TooFewFields" && e.code !== "TooManyFields") checks.fail(line, "—", e.message);
  }
  const structural = new Set(checks.errors.map((e) => e.line));
  let exampleRows = 0;
  for (let i = 1; i < data.length; i++) {
    const cells = data[i];
    if (cells.length === 1 && isBlank(cells[0])) continue;
    if (cells[0] === EXAMPLE_PORTFOLIO) {
      exampleRows++;
      continue;
    }
    totalRows++;
    if (!structural.has(i + 1)) checks.cellLine(cells, i + 1);
  }
  return resultOf(checks, totalRows, exampleRows);
}

function resultOf(checks: LineChecks, totalRows: number, exampleRows: number): ParsedCsv {
  if (totalRows === 0 && exampleRows > 0)
    throw new CsvFileError(
      `The file holds only the template's example lines (portfolio "${EXAMPLE_PORTFOLIO}"): ` +
        "put your own days in their place. Nothing was stored.",
    );
  if (totalRows === 0) throw new CsvFileError("The file has a header row but no data rows.");
  const { rows, errors, errorCount, invalidCount } = checks;
  errors.sort((a, b) => a.line - b.line);
  return { columns: checks.columns, rows, errors, errorCount, totalRows, invalidCount, exampleRows };
}

/**
 * A file without quotes, read a line at a time from text that may come in pieces: the header
 * from the first line, then each data line in place (or cell by cell when it is not plain).
 * A piece may end inside a line; the rest of that line waits for the next piece. A line ends at
 * "\n", with a "\r" before it dropped. What this cannot read the same way as the whole text
 * (a quote, a lone "\r", a header that is not valid) is noted in `unreadable`, and the caller
 * reads the whole file instead; given `throwOnHeader`, a header that is not valid throws.
 */
class PlainLines {
  unreadable = false;
  private checks: LineChecks | undefined;
  private carry = "";
  private line = 0;
  private totalRows = 0;
  private exampleRows = 0;

  constructor(
    private readonly ref: CsvReferenceData,
    private readonly options: ParseOptions,
    private readonly how: { throwOnHeader: boolean },
  ) {}

  feed(piece: string, last: boolean): void {
    if (this.unreadable) return;
    const text = this.carry ? this.carry + piece : piece;
    if (piece.includes('"')) {
      this.unreadable = true;
      return;
    }
    const withCr = piece.includes("\r") || this.carry.includes("\r");
    let start = 0;
    for (;;) {
      let end = text.indexOf("\n", start);
      if (end < 0) {
        if (!last) break;
        end = text.length;
      }
      this.take(text, start, end, withCr);
      if (this.unreadable) return;
      start = end + 1;
      if (start > text.length) break;
    }
    this.carry = last ? "" : text.slice(start);
    // A line this long is no daily-data line: rather than join ever longer pieces, read the file whole.
    if (this.carry.length > LONGEST_LINE) this.unreadable = true;
  }

  private take(text: string, start: number, end: number, withCr: boolean): void {
    if (withCr) {
      if (end > start && text.charCodeAt(end - 1) === 13) end--;
      const cr = text.indexOf("\r", start);
      if (cr >= 0 && cr < end) {
        this.unreadable = true; // a lone "\r" ends a line in the whole text
        return;
      }
    }
    this.line++;
    if (!this.checks) {
      const header = text.slice(start, end).split(",");
      if (this.how.throwOnHeader) this.checks = new LineChecks(checkHeader(header), this.ref);
      else {
        try {
          this.checks = new LineChecks(checkHeader(header), this.ref);
        } catch {
          this.unreadable = true;
        }
      }
      return;
    }
    const first = text.charCodeAt(start);
    if (start === end || ((first === 32 || first === 9) && isBlank(text.slice(start, end)))) return; // blank line
    if (isExampleLine(text, start)) {
      this.exampleRows++;
      return;
    }
    this.totalRows++;
    this.checks.line(text, start, end, this.line, this.options.plainLines !== false);
  }

  result(): ParsedCsv {
    if (!this.checks) throw new CsvFileError("The file has a header row but no data rows.");
    return resultOf(this.checks, this.totalRows, this.exampleRows);
  }

  /** Whether `result()` is the whole file's: read to the end, a header, at least one data row. */
  get complete(): boolean {
    return !this.unreadable && this.checks !== undefined && this.totalRows > 0;
  }
}

/**
 * The same parse, fed the file's bytes as they arrive (the upload checks a file while it is
 * still being received). Plain files are read a piece at a time; anything else — not UTF-8,
 * binary, quotes, a lone "\r", a header or a file that is refused as a whole — is parsed from
 * the whole file at the end, so both ways give the same rows, problems and refusals
 * (tests/shared/ingest check they do, over generated files cut at random places).
 */
export class CsvByteStream {
  private readonly decoder = new TextDecoder("utf-8", { fatal: true });
  private readonly lines: PlainLines;
  private started = false;
  private refused: CsvFileError | undefined;

  constructor(
    private readonly ref: CsvReferenceData,
    private readonly options: ParseOptions = {},
  ) {
    this.lines = new PlainLines(ref, options, { throwOnHeader: false });
  }

  push(chunk: Uint8Array): void {
    if (this.lines.unreadable) return;
    if (chunk.includes(0)) {
      this.lines.unreadable = true;
      return;
    }
    let piece: string;
    try {
      piece = this.decoder.decode(chunk, { stream: true });
    } catch {
      this.lines.unreadable = true;
      return;
    }
    if (!this.started && piece.length > 0) {
      this.started = true;
      if (piece.charCodeAt(0) === 0xfeff) piece = piece.slice(1); // as decodeCsvBytes
    }
    try {
      this.lines.feed(piece, false);
    } catch (err) {
      // A hopeless file or an overlong line: nothing more is read; the parse at the end says why.
      if (!(err instanceof CsvFileError)) throw err;
      this.refused = err;
      this.lines.unreadable = true;
    }
  }

  /** The parse of the whole file, given as `bytes` (what was pushed, in one piece). */
  end(bytes: Uint8Array): ParsedCsv {
    if (this.refused) throw this.refused;
    if (!this.lines.unreadable) {
      try {
        this.lines.feed(this.decoder.decode(), true);
      } catch {
        this.lines.unreadable = true;
      }
    }
    return this.lines.complete
      ? this.lines.result()
      : parseObservationCsv(decodeCsvBytes(bytes), this.ref, this.options);
  }
}

/** Writes rows back as CSV in the template's column order (used by the template and by tests). */
export function serialiseObservationCsv(
  rows: Partial<Record<CsvColumn, string | number | null>>[],
  columns: readonly CsvColumn[] = ALL_COLUMNS,
): string {
  const lines = [columns.join(",")];
  for (const r of rows)
    lines.push(columns.map((c) => (r[c] === null || r[c] === undefined ? "" : String(r[c]))).join(","));
  return `${lines.join("\n")}\n`;
}

/**
 * Rows checked at preview, checked again against today's reference data: what can have changed
 * since is a portfolio removed or a day that became a holiday. The cells themselves were checked
 * at preview and are not re-read.
 */
export function recheckReferenceData(rows: readonly ParsedRow[], ref: CsvReferenceData): RowError[] {
  const errors: RowError[] = [];
  let lastCode: string | undefined;
  let portfolio: PortfolioRef | undefined;
  for (const row of rows) {
    if (row.portfolio !== lastCode) {
      lastCode = row.portfolio;
      portfolio = ref.portfolios.get(row.portfolio);
    }
    if (!portfolio)
      errors.push({ line: row.line, column: "portfolio", message: `Portfolio "${row.portfolio}" no longer exists` });
    else if (portfolio.holidays.size && portfolio.holidays.has(row.date)) {
      errors.push({
        line: row.line,
        column: "date",
        message: `${row.date} has since become a holiday in the ${portfolio.entityCode} calendar`,
      });
    }
  }
  return errors;
}
