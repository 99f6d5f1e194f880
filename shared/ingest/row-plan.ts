import { AMOUNT_COLUMNS, type AmountColumn } from "../schemas/upload";
import type { ParsedRow } from "./parse-csv";

// What a checked file does to the stored days, worked out without a database: which days are new,
// which restate a stored day (a new version) and which are unchanged; the span and portfolios it
// writes; and each portfolio's days inside that span once it is written (for the quality checks).

/** A day as stored: its current version and amounts. */
export interface StoredDay {
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

/** A stored version, by its key. */
export interface VersionKey {
  portfolioId: number;
  date: string;
  version: number;
}

/** The four columns the data-quality checks read, of one day. */
export interface QualityDay {
  date: string;
  actualPnl: number | null;
  hypotheticalPnl: number | null;
  var99: number | null;
  /** Risk-theoretical P&L: a day with HPL but none is a finding where the portfolio reports RTPL at all. */
  rtpl?: number | null;
}

const sameValues = (stored: Record<AmountColumn, number | null>, row: ParsedRow) =>
  AMOUNT_COLUMNS.every((c) => (stored[c] ?? null) === (row[c] ?? null));

/**
 * Sorts valid rows into new days, restatements (a changed day) and unchanged days; with
 * `writes`, also lists what to write (the preview only counts).
 */
export function classify(
  rows: readonly ParsedRow[],
  ids: Map<string, number>,
  stored: Map<string, StoredDay>,
  writes = true,
) {
  const inserts: NewVersion[] = [];
  const retire: VersionKey[] = [];
  let fresh = 0;
  let restated = 0;
  let unchanged = 0;
  let lastCode = "";
  let portfolioId = 0;
  for (const row of rows) {
    if (row.portfolio !== lastCode) {
      lastCode = row.portfolio;
      portfolioId = ids.get(row.portfolio)!;
    }
    const current = stored.size ? stored.get(`${portfolioId}|${row.date}`) : undefined;
    if (!current) {
      fresh++;
      if (writes) inserts.push({ portfolioId, version: 1, row });
    } else if (sameValues(current.values, row)) {
      unchanged++;
    } else {
      restated++;
      if (writes) {
        retire.push({ portfolioId, date: row.date, version: current.version });
        inserts.push({ portfolioId, version: current.version + 1, row });
      }
    }
  }
  return { inserts, retire, fresh, restated, unchanged };
}

/** One restated day: the cells that change, stored value → file value (null: empty). */
export interface RestatedDay {
  portfolioId: number;
  portfolio: string;
  date: string;
  changes: { column: AmountColumn; from: number | null; to: number | null }[];
}

/**
 * The days a file restates (a stored day whose amounts differ), in file order: every day's key, and the changed cells
 * of the first `detailed` of them (a preview shows those; a large restatement lists only so many).
 */
export function restatedDays(
  rows: readonly ParsedRow[],
  ids: Map<string, number>,
  stored: Map<string, StoredDay>,
  detailed = Number.POSITIVE_INFINITY,
): { keys: { portfolioId: number; date: string }[]; detail: RestatedDay[] } {
  const keys: { portfolioId: number; date: string }[] = [];
  const detail: RestatedDay[] = [];
  if (stored.size === 0) return { keys, detail };
  for (const row of rows) {
    const portfolioId = ids.get(row.portfolio)!;
    const current = stored.get(`${portfolioId}|${row.date}`);
    if (!current || sameValues(current.values, row)) continue;
    keys.push({ portfolioId, date: row.date });
    if (detail.length < detailed) {
      const changes = AMOUNT_COLUMNS.filter((c) => (current.values[c] ?? null) !== (row[c] ?? null)).map((c) => ({
        column: c,
        from: current.values[c] ?? null,
        to: row[c] ?? null,
      }));
      detail.push({ portfolioId, portfolio: row.portfolio, date: row.date, changes });
    }
  }
  return { keys, detail };
}

/** Each portfolio's current days inside the committed span once the commit is written: the file's days, and the stored days it leaves as they are. */
export function currentDaysInSpan(
  rows: readonly ParsedRow[],
  ids: Map<string, number>,
  stored: Map<string, StoredDay>,
): Map<number, QualityDay[]> {
  const byPortfolio = new Map<number, QualityDay[]>();
  const daysOf = (pid: number) => {
    let days = byPortfolio.get(pid);
    if (!days) byPortfolio.set(pid, (days = []));
    return days;
  };
  const written = new Set<string>();
  let lastCode = "";
  let days: QualityDay[] = [];
  let portfolioId = 0;
  for (const r of rows) {
    if (r.portfolio !== lastCode) {
      lastCode = r.portfolio;
      portfolioId = ids.get(r.portfolio)!;
      days = daysOf(portfolioId);
    }
    days.push({
      date: r.date,
      actualPnl: r.actual_pnl ?? null,
      hypotheticalPnl: r.hypothetical_pnl ?? null,
      var99: r.var_99 ?? null,
      rtpl: r.rtpl ?? null,
    });
    if (stored.size) written.add(`${portfolioId}|${r.date}`);
  }
  for (const [key, day] of stored) {
    if (!written.has(key))
      daysOf(day.portfolioId).push({
        date: day.date,
        actualPnl: day.values.actual_pnl,
        hypotheticalPnl: day.values.hypothetical_pnl,
        var99: day.values.var_99,
        rtpl: day.values.rtpl,
      });
  }
  return byPortfolio;
}

export function dateRange(rows: readonly ParsedRow[]): { from: string; to: string } | null {
  if (rows.length === 0) return null;
  let from = rows[0].date;
  let to = rows[0].date;
  for (const r of rows) {
    if (r.date < from) from = r.date;
    if (r.date > to) to = r.date;
  }
  return { from, to };
}

/** The span of days and the portfolios (ids, sorted) the rows write, in one pass. */
export function spanOf(
  rows: readonly ParsedRow[],
  ids: ReadonlyMap<string, number>,
): { range: { from: string; to: string } | null; portfolioIds: number[] } {
  const portfolioIds = new Set<number>();
  let lastCode: string | undefined;
  for (const r of rows) {
    if (r.portfolio === lastCode) continue;
    lastCode = r.portfolio;
    portfolioIds.add(ids.get(r.portfolio)!);
  }
  return { range: dateRange(rows), portfolioIds: [...portfolioIds].sort((a, b) => a - b) };
}
