import { QueryTypes, type Transaction } from "sequelize";
import { sequelize } from "../../db/sequelize";
import { AMOUNT_COLUMNS, type AmountColumn } from "../../../shared/schemas/upload";
import type { Observation } from "../../../shared/backtest/types";

/** Column in the table for each CSV amount column (they are the same names). */
const AMOUNT_SQL = AMOUNT_COLUMNS.join(", ");

export interface StoredDay {
  id: number;
  portfolioId: number;
  date: string;
  version: number;
  values: Record<AmountColumn, number | null>;
}

/** A day to write: the parsed row (amounts by CSV column) with its portfolio id and version. */
export interface NewVersion {
  portfolioId: number;
  version: number;
  row: { date: string } & { [K in AmountColumn]?: number | null };
}

const ISO_DATE = /^\d{4}-\d{2}-\d{2}$/;
const num = (v: unknown): number | null => (v === null || v === undefined ? null : Number(v));

/** The current version of each day for these portfolios between two dates, optionally locked for update. */
export async function loadCurrentDays(
  portfolioIds: number[],
  from: string,
  to: string,
  transaction?: Transaction,
  lock = false,
): Promise<Map<string, StoredDay>> {
  const out = new Map<string, StoredDay>();
  if (portfolioIds.length === 0) return out;
  const rows = await sequelize.query<Record<string, unknown>>(
    `SELECT id, portfolio_id, DATE_FORMAT(business_date, '%Y-%m-%d') AS d, version, ${AMOUNT_SQL}
       FROM observations
      WHERE portfolio_id IN (:ids) AND current_day BETWEEN :from AND :to${lock ? " FOR UPDATE" : ""}`,
    { replacements: { ids: portfolioIds, from, to }, type: QueryTypes.SELECT, transaction },
  );
  for (const r of rows) {
    const values = {} as Record<AmountColumn, number | null>;
    for (const c of AMOUNT_COLUMNS) values[c] = num(r[c]);
    const day: StoredDay = { id: Number(r.id), portfolioId: Number(r.portfolio_id), date: String(r.d), version: Number(r.version), values };
    out.set(`${day.portfolioId}|${day.date}`, day);
  }
  return out;
}

/** Rows per INSERT: about 1 MB of SQL; measured faster than 2,000 and than 25,000 here (bench/ingest.bench.ts). */
const BATCH_ROWS = 10_000;

function sqlNumber(v: number | null | undefined): string {
  return v === null || v === undefined ? "NULL" : String(v);
}

/**
 * Writes new versions in multi-row INSERTs. Every value has been validated (integers, ISO dates,
 * finite amounts rounded to the cent), so they are written as literals for speed.
 */
export async function insertVersions(rows: NewVersion[], uploadId: number, userId: number, transaction: Transaction): Promise<void> {
  for (let start = 0; start < rows.length; start += BATCH_ROWS) {
    const parts: string[] = [];
    for (let i = start; i < Math.min(rows.length, start + BATCH_ROWS); i++) {
      const r = rows[i];
      const date = r.row.date;
      if (!ISO_DATE.test(date)) throw new Error(`refusing to write unchecked date ${date}`);
      let amounts = "";
      for (const c of AMOUNT_COLUMNS) amounts += `,${sqlNumber(r.row[c])}`;
      parts.push(`(${r.portfolioId | 0},'${date}',${r.version | 0},1${amounts},${uploadId | 0},${userId | 0})`);
    }
    const values = parts.join(",");
    await sequelize.query(
      `INSERT INTO observations (portfolio_id, business_date, version, is_current, ${AMOUNT_SQL}, upload_id, created_by) VALUES ${values}`,
      { transaction },
    );
  }
}

/** Clears the current flag on versions that a restatement replaces (before the new ones are written). */
export async function retireVersions(ids: number[], transaction: Transaction): Promise<void> {
  for (let start = 0; start < ids.length; start += 5000) {
    await sequelize.query("UPDATE observations SET is_current = 0 WHERE id IN (:ids)", {
      replacements: { ids: ids.slice(start, start + 5000) },
      transaction,
    });
  }
}

/** One portfolio's current series, sorted by date, in the engine's shape. */
export async function loadSeries(portfolioId: number, from?: string, to?: string): Promise<(Observation & { version: number })[]> {
  const rows = await sequelize.query<Record<string, unknown>>(
    `SELECT DATE_FORMAT(business_date, '%Y-%m-%d') AS d, version, ${AMOUNT_SQL}
       FROM observations
      WHERE portfolio_id = :pid AND current_day BETWEEN :from AND :to
      ORDER BY current_day`,
    { replacements: { pid: portfolioId, from: from ?? "1900-01-01", to: to ?? "9999-12-31" }, type: QueryTypes.SELECT },
  );
  return rows.map((r) => ({
    date: String(r.d),
    version: Number(r.version),
    actualPnl: num(r.actual_pnl),
    hypotheticalPnl: num(r.hypothetical_pnl),
    var99: num(r.var_99),
    var975: num(r.var_975),
    svar99: num(r.svar_99),
    var10d: num(r.var_10d),
    svar10d: num(r.svar_10d),
    es975: num(r.es_975),
    ses: num(r.ses),
    rtpl: num(r.rtpl),
  }));
}

export interface QualityDay {
  date: string;
  actualPnl: number | null;
  hypotheticalPnl: number | null;
  var99: number | null;
}

/**
 * The four columns the data-quality checks read, for one portfolio's current series (sorted);
 * with `outside`, only the days before or after that span (the caller knows the days inside it).
 */
export async function loadQualitySeries(portfolioId: number, outside?: { from: string; to: string }, transaction?: Transaction): Promise<QualityDay[]> {
  const span = outside ? " AND (current_day < :from OR current_day > :to)" : "";
  const rows = await sequelize.query<{ d: string; a: unknown; h: unknown; v: unknown }>(
    `SELECT DATE_FORMAT(current_day, '%Y-%m-%d') AS d, actual_pnl AS a, hypothetical_pnl AS h, var_99 AS v
       FROM observations WHERE portfolio_id = :pid AND current_day IS NOT NULL${span} ORDER BY current_day`,
    { replacements: { pid: portfolioId, from: outside?.from, to: outside?.to }, type: QueryTypes.SELECT, transaction },
  );
  return rows.map((r) => ({ date: r.d, actualPnl: num(r.a), hypotheticalPnl: num(r.h), var99: num(r.v) }));
}
