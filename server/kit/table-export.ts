/**
 * Every table a user reads can be taken out to a spreadsheet, where a reporting office checks and
 * reconciles: CSV (papaparse) and XLSX (exceljs) from one description of the columns. Values keep
 * their kind: amounts and counts are numbers, dates are dates, so a spreadsheet can add them up.
 *
 * Text that a spreadsheet could run as a formula (starting with =, +, -, @, a tab or a carriage
 * return: OWASP "CSV injection") is neutralised in both formats with a leading apostrophe; numbers
 * are never touched, so a loss stays a negative number.
 */
import ExcelJS from "exceljs";
import Papa from "papaparse";
import type { ExportFormat } from "../../shared/schemas/table-export";
import type { Download } from "../http/download";

export type ColumnKind = "text" | "integer" | "number" | "money" | "date" | "datetime" | "yes-no";
type Cell = string | number | boolean | null | undefined;

export interface Column<Row> {
  header: string;
  kind: ColumnKind;
  value: Value<Row>;
  /** Decimals of a plain number (multipliers: 2; p-values: 4). Money always has 2. */
  decimals?: number;
}

export interface Table<Row> {
  /** The sheet's name and the start of the file name, e.g. "Exceptions LKS-EU-TRADING 2026-09-30". */
  title: string;
  columns: readonly Column<Row>[];
  rows: readonly Row[];
  /** ISO 4217 code shown in the money format; omitted when rows are in different currencies. */
  currency?: string | null;
}

type Value<Row> = (row: Row) => Cell;

function columnOf(kind: ColumnKind, decimals?: number) {
  return <Row>(header: string, value: Value<Row>): Column<Row> =>
    decimals === undefined ? { header, kind, value } : { header, kind, decimals, value };
}

/**
 * A column of each kind, from its header and how a row gives its value:
 * `col.money("Capital requirement", (h) => h.capital)`. `col.factor` is a number with 2 decimals
 * (multipliers, plus factors).
 */
export const col = {
  text: columnOf("text"),
  integer: columnOf("integer"),
  number: columnOf("number"),
  factor: columnOf("number", 2),
  money: columnOf("money"),
  date: columnOf("date"),
  datetime: columnOf("datetime"),
  yesNo: columnOf("yes-no"),
  /** Several texts in one cell, separated by "; ". */
  list: <Row>(header: string, value: (row: Row) => readonly string[]): Column<Row> => ({
    header,
    kind: "text",
    value: (row) => value(row).join("; "),
  }),
};

const FORMULA_START = /^[=+\-@\t\r]/;

/** A text a spreadsheet will show as written and never evaluate. */
export function inertText(text: string): string {
  return FORMULA_START.test(text) ? `'${text}` : text;
}

function fileStem(title: string): string {
  return title.replace(/[^A-Za-z0-9._-]+/g, "-").replace(/^-+|-+$/g, "");
}

/** The value as it goes into a CSV field: numbers as numbers, dates as ISO text, yes/no as words. */
function csvValue(kind: ColumnKind, value: Cell): Cell {
  if (value === null || value === undefined) return "";
  if (kind === "yes-no") return value ? "yes" : "no";
  if (kind === "money" && typeof value === "number") return Number(value.toFixed(2));
  return value;
}

function toCsv<Row>(table: Table<Row>): string {
  const data = table.rows.map((row) => table.columns.map((c) => csvValue(c.kind, c.value(row))));
  // The BOM makes spreadsheet programs read the file as UTF-8 (names with accents stay whole).
  return `\ufeff${Papa.unparse(
    { fields: table.columns.map((c) => c.header), data },
    { escapeFormulae: true, newline: "\r\n" },
  )}\r\n`;
}

function numberFormat<Row>(column: Column<Row>, currency: string | null | undefined): string | undefined {
  switch (column.kind) {
    case "money":
      return currency ? `#,##0.00 "${currency}";-#,##0.00 "${currency}"` : "#,##0.00";
    case "integer":
      return "0";
    case "number":
      return column.decimals === undefined ? "General" : `0.${"0".repeat(column.decimals)}`;
    case "date":
      return "yyyy-mm-dd";
    case "datetime":
      return "yyyy-mm-dd hh:mm";
    default:
      return undefined;
  }
}

/** A date or date-time from the API's ISO text as the spreadsheet's date (UTC, as the API gives it). */
function dateCell(value: string): Date {
  return new Date(/^\d{4}-\d{2}-\d{2}$/.test(value) ? `${value}T00:00:00Z` : value);
}

function xlsxValue(kind: ColumnKind, value: Cell): ExcelJS.CellValue {
  if (value === null || value === undefined || value === "") return null;
  if (kind === "yes-no") return value ? "yes" : "no";
  if ((kind === "date" || kind === "datetime") && typeof value === "string") return dateCell(value);
  if (typeof value === "string") return inertText(value);
  // Amounts are cents, as in the CSV: no binary remainder (1044562.9699999997) in the cell.
  if (kind === "money" && typeof value === "number") return Number(value.toFixed(2));
  return value;
}

/** Excel's sheet names: at most 31 characters, none of []:*?/\ */
function sheetName(title: string): string {
  const plain = title.replace(/[[\]:*?/\\]/g, " ");
  if (plain.length <= 31) return plain;
  // Cut at a word, so a date is left out whole rather than shown cut ("2026-12").
  const cut = plain.slice(0, 32).lastIndexOf(" ");
  return plain.slice(0, cut > 0 ? cut : 31);
}

async function toXlsx<Row>(table: Table<Row>): Promise<Buffer> {
  const workbook = new ExcelJS.Workbook();
  workbook.creator = "Quartermark";
  workbook.created = new Date();
  const sheet = workbook.addWorksheet(sheetName(table.title), {
    views: [{ state: "frozen", ySplit: 1, xSplit: 0 }],
  });
  sheet.columns = table.columns.map((c) => ({
    header: c.header,
    width: Math.min(60, Math.max(12, c.header.length + 2, c.kind === "text" ? 24 : 0)),
    style: { numFmt: numberFormat(c, table.currency) },
  }));
  for (const row of table.rows) sheet.addRow(table.columns.map((c) => xlsxValue(c.kind, c.value(row))));
  const header = sheet.getRow(1);
  header.font = { bold: true };
  header.eachCell((cell) => {
    cell.numFmt = "@"; // the header is text, whatever the column holds
  });
  if (table.columns.length > 0)
    sheet.autoFilter = { from: { row: 1, column: 1 }, to: { row: 1, column: table.columns.length } };
  return Buffer.from(await workbook.xlsx.writeBuffer());
}

/** The table as a download in the format asked for. */
export async function tableDownload<Row>(table: Table<Row>, format: ExportFormat): Promise<Download> {
  const stem = fileStem(table.title) || "table";
  if (format === "csv") return { fileName: `${stem}.csv`, contentType: "text/csv; charset=utf-8", bytes: toCsv(table) };
  return {
    fileName: `${stem}.xlsx`,
    contentType: "application/vnd.openxmlformats-officedocument.spreadsheetml.sheet",
    bytes: await toXlsx(table),
  };
}
