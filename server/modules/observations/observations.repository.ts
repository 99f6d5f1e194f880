import { QueryTypes, type Transaction } from "sequelize";
import { sequelize } from "../../db/sequelize";
import { connectionOf } from "../../db/raw-connection";
import { AMOUNT_COLUMNS, type AmountColumn } from "../../../shared/schemas/upload";
import type { Observation } from "../../../shared/backtest/types";
import type { RegimeId } from "../../../shared/schemas/common";
import { withPnlDefinition } from "../../../shared/backtest/pnl-definition";
import type { NewVersion, QualityDay, StoredDay, VersionKey } from "../../../shared/ingest/row-plan";

/** Column in the table for each CSV amount column (they are the same names). */
const AMOUNT_SQL = AMOUNT_COLUMNS.join(", ");

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
    `SELECT portfolio_id, DATE_FORMAT(business_date, '%Y-%m-%d') AS d, version, ${AMOUNT_SQL}
       FROM observations
      WHERE portfolio_id IN (:ids) AND current_day BETWEEN :from AND :to${lock ? " FOR UPDATE" : ""}`,
    { replacements: { ids: portfolioIds, from, to }, type: QueryTypes.SELECT, transaction },
  );
  for (const r of rows) {
    const values = {} as Record<AmountColumn, number | null>;
    for (const c of AMOUNT_COLUMNS) values[c] = num(r[c]);
    const day: StoredDay = {
      portfolioId: Number(r.portfolio_id),
      date: String(r.d),
      version: Number(r.version),
      values,
    };
    out.set(`${day.portfolioId}|${day.date}`, day);
  }
  return out;
}

/** Rows per INSERT: about half a megabyte of SQL (bench/ingest.bench.ts measured 2,000 to 10,000 alike). */
export const INSERT_BATCH_ROWS = 5_000;

/**
 * Sends the statements down the transaction's connection one after another without waiting for
 * each answer (the driver pipelines them), so the next batch is built while MariaDB writes this
 * one. Resolves once all have run; the first failure is thrown, and the caller's transaction
 * rolls every one of them back.
 */
export class PipelinedWrites {
  private readonly pending: Promise<unknown>[] = [];
  constructor(private readonly transaction: Transaction) {}

  send(sql: string, values?: unknown[]): void {
    const sent = connectionOf(this.transaction).query(sql, values);
    sent.catch(() => undefined); // reported by done(), not as an unhandled rejection
    this.pending.push(sent);
  }

  /** Lets the event loop write what was sent to the socket, so MariaDB can start on it while this thread goes on. */
  flush(): Promise<void> {
    return new Promise((resolve) => setImmediate(resolve));
  }

  async done(): Promise<void> {
    const settled = await Promise.allSettled(this.pending.splice(0));
    const failed = settled.find((s): s is PromiseRejectedResult => s.status === "rejected");
    if (failed) throw failed.reason;
  }
}

/**
 * Queues new versions as multi-row INSERTs on `writes`, letting each batch go out before building
 * the next. A version says only what differs from row to row: new days (version 1, current: the
 * column defaults) name neither column, restatements name their version; only the amount columns
 * that some row of a batch reports are named (the others default to NULL). Who wrote them and
 * when is their upload's. Every value has been validated (integers, ISO dates, finite amounts
 * rounded to the cent), so they are written as literals.
 *
 * The parents of every row are rows the caller's transaction holds locked: the upload (for
 * update) and the portfolios in `heldPortfolios` (for update). A row naming any other portfolio
 * is refused here, before anything is sent. With the parents present and held, the foreign-key
 * lookups MariaDB would make for each row can only succeed, so these INSERTs alone run with
 * `SET STATEMENT foreign_key_checks = 0 FOR …` (the bulk-load practice of the MariaDB and MySQL
 * manuals, scoped to the one statement; about a tenth of a 100,000-row commit). The constraints
 * stay declared and checked for every other write.
 */
export async function queueInsertVersions(
  writes: PipelinedWrites,
  rows: readonly NewVersion[],
  uploadId: number,
  heldPortfolios: ReadonlySet<number>,
): Promise<void> {
  const firsts = rows.filter((r) => r.version === 1);
  const restated = firsts.length === rows.length ? [] : rows.filter((r) => r.version !== 1);
  for (const [group, withVersion] of [
    [firsts, false],
    [restated, true],
  ] as const) {
    for (let start = 0; start < group.length; start += INSERT_BATCH_ROWS) {
      writes.send(
        insertBatch(
          group,
          start,
          Math.min(group.length, start + INSERT_BATCH_ROWS),
          withVersion,
          uploadId,
          heldPortfolios,
        ),
      );
      await writes.flush();
    }
  }
}

function insertBatch(
  rows: readonly NewVersion[],
  start: number,
  end: number,
  withVersion: boolean,
  uploadId: number,
  heldPortfolios: ReadonlySet<number>,
): string {
  const present = AMOUNT_COLUMNS.filter((c) => {
    for (let i = start; i < end; i++) if (rows[i].row[c] !== null && rows[i].row[c] !== undefined) return true;
    return false;
  });
  const tail = `,${uploadId | 0})`;
  let values = "";
  let lastHeld: number | undefined;
  for (let i = start; i < end; i++) {
    const r = rows[i];
    if (r.portfolioId !== lastHeld) {
      if (!heldPortfolios.has(r.portfolioId))
        throw new Error(`refusing to write for portfolio #${r.portfolioId}, which this commit does not hold locked`);
      lastHeld = r.portfolioId;
    }
    const date = r.row.date;
    if (!ISO_DATE.test(date)) throw new Error(`refusing to write unchecked date ${date}`);
    let amounts = "";
    for (const c of present) {
      const v = r.row[c];
      if (v === null || v === undefined) amounts += ",NULL";
      else if (Number.isFinite(v)) amounts += `,${v}`;
      else throw new Error(`refusing to write a non-finite ${c} for ${date}`);
    }
    values += `${i === start ? "" : ","}(${r.portfolioId | 0},'${date}'${withVersion ? `,${r.version | 0}` : ""}${amounts}${tail}`;
  }
  const columns = `${withVersion ? ", version" : ""}${present.length ? `, ${present.join(", ")}` : ""}`;
  return `SET STATEMENT foreign_key_checks = 0 FOR INSERT INTO observations (portfolio_id, business_date${columns}, upload_id) VALUES ${values}`;
}

/** Queues clearing the current flag on versions that a restatement replaces (before the new ones are written). */
export function queueRetireVersions(writes: PipelinedWrites, keys: readonly VersionKey[]): void {
  for (let start = 0; start < keys.length; start += 2000) {
    const tuples = keys.slice(start, start + 2000).map((k) => {
      if (!ISO_DATE.test(k.date)) throw new Error(`refusing to write unchecked date ${k.date}`);
      return `(${k.portfolioId | 0},'${k.date}',${k.version | 0})`;
    });
    writes.send(
      `UPDATE observations SET is_current = 0 WHERE (portfolio_id, business_date, version) IN (${tuples.join(",")})`,
    );
  }
}

/**
 * One portfolio's current series, sorted by date, in the engine's shape, its actual P&L derived by
 * the rule set given (or as supplied, for a reader of the stored days). Inside a transaction the
 * read is a locking one, so it sees the newest committed days and the transaction's own.
 */
export async function loadSeries(
  portfolioId: number,
  pnlDefinition: RegimeId | "as supplied",
  from?: string,
  to?: string,
  transaction?: Transaction,
): Promise<(Observation & { version: number })[]> {
  const rows = await sequelize.query<Record<string, unknown>>(
    `SELECT DATE_FORMAT(business_date, '%Y-%m-%d') AS d, version, ${AMOUNT_SQL}
       FROM observations
      WHERE portfolio_id = :pid AND current_day BETWEEN :from AND :to
      ORDER BY current_day${transaction ? " LOCK IN SHARE MODE" : ""}`,
    {
      replacements: { pid: portfolioId, from: from ?? "1900-01-01", to: to ?? "9999-12-31" },
      type: QueryTypes.SELECT,
      transaction,
    },
  );
  const series = rows.map(observationOf);
  return pnlDefinition === "as supplied" ? series : withPnlDefinition(series, pnlDefinition);
}

/**
 * The last `count` current days of a portfolio dated on or before `to`, sorted by date, actual P&L
 * as loadSeries derives it: one range read of the (portfolio_id, current_day) index backwards,
 * whatever the length of the history.
 */
export async function loadSeriesTail(
  portfolioId: number,
  pnlDefinition: RegimeId | "as supplied",
  to: string,
  count: number,
): Promise<(Observation & { version: number })[]> {
  const rows = await sequelize.query<Record<string, unknown>>(
    `SELECT DATE_FORMAT(business_date, '%Y-%m-%d') AS d, version, ${AMOUNT_SQL}
       FROM observations
      WHERE portfolio_id = :pid AND current_day <= :to
      ORDER BY current_day DESC LIMIT :count`,
    { replacements: { pid: portfolioId, to, count }, type: QueryTypes.SELECT },
  );
  const series = rows.reverse().map(observationOf);
  // Each rule set backtests on its own definition of actual P&L (docs/rules.md#pnl-definition).
  return pnlDefinition === "as supplied" ? series : withPnlDefinition(series, pnlDefinition);
}

function observationOf(r: Record<string, unknown>): Observation & { version: number } {
  return {
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
    imaDrc: num(r.ima_drc),
    sbm: num(r.sbm),
    rrao: num(r.rrao),
    saDrc: num(r.sa_drc),
    saGa: num(r.sa_ga),
    feesCommissions: num(r.fees_commissions),
    reservesAdjustments: num(r.reserves_adjustments),
    netInterestIncome: num(r.net_interest_income),
    intradayPnl: num(r.intraday_pnl),
    newTradePnl: num(r.new_trade_pnl),
  };
}

/**
 * The columns the data-quality checks read, for each portfolio's current series (sorted);
 * with `outside`, only the days before or after that span (the caller knows the days inside it).
 */
export async function loadQualitySeries(
  portfolioIds: readonly number[],
  outside?: { from: string; to: string },
  transaction?: Transaction,
): Promise<Map<number, QualityDay[]>> {
  const out = new Map<number, QualityDay[]>(portfolioIds.map((id) => [id, []]));
  if (portfolioIds.length === 0) return out;
  const span = outside ? " AND (current_day < :from OR current_day > :to)" : "";
  const rows = await sequelize.query<{ p: number; d: string; a: unknown; h: unknown; v: unknown; r: unknown }>(
    `SELECT portfolio_id AS p, DATE_FORMAT(current_day, '%Y-%m-%d') AS d, actual_pnl AS a, hypothetical_pnl AS h, var_99 AS v, rtpl AS r
       FROM observations WHERE portfolio_id IN (:ids) AND current_day IS NOT NULL${span} ORDER BY portfolio_id, current_day`,
    { replacements: { ids: portfolioIds, from: outside?.from, to: outside?.to }, type: QueryTypes.SELECT, transaction },
  );
  for (const r of rows)
    out
      .get(Number(r.p))
      ?.push({ date: r.d, actualPnl: num(r.a), hypotheticalPnl: num(r.h), var99: num(r.v), rtpl: num(r.r) });
  return out;
}
