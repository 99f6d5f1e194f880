/**
 * Batch backtest from a CSV file (`npm run backtest -- --file data.csv --regime eu --as-of 2026-09-30`).
 * Prints, per portfolio, the window, exception counts, zone, plus factor, multiplier and the
 * statistical tests, as a table or (with --json) as JSON. Exit code 1 on bad input.
 */
import { readFileSync } from "node:fs";
import { resolve } from "node:path";
import { pathToFileURL } from "node:url";
import { CsvFileError, parseObservationCsv, splitCsv } from "../shared/ingest/parse-csv";
import { seriesByPortfolio } from "../shared/ingest/series";
import { EngineInputError } from "../shared/backtest/errors";
import { backtestAt, type BacktestResult } from "../shared/backtest/exceptions";
import { withPnlDefinition } from "../shared/backtest/pnl-definition";
import { getRegime } from "../shared/backtest/regimes";
import type { Observation } from "../shared/backtest/types";
import { ENGINE_VERSION } from "../shared/backtest/version";
import { isIsoDate } from "../shared/backtest/window";
import type { PnlBasis, RegimeId } from "../shared/schemas/common";

export interface CliIo {
  readFile(path: string): string;
  stdout(text: string): void;
  stderr(text: string): void;
}

const defaultIo: CliIo = {
  readFile: (path) => readFileSync(path, "utf8"),
  stdout: (text) => process.stdout.write(text),
  stderr: (text) => process.stderr.write(text),
};

export const USAGE = `Backtest every portfolio in a CSV file at one as-of date.

Usage:
  npm run backtest -- --file data.csv --regime eu --as-of 2026-09-30 [--basis max] [--json]

Options:
  --file PATH      CSV with a header row (any order): portfolio, date, actual_pnl,
                   hypothetical_pnl, var_99; optional var_975, svar_99, var_10d, svar_10d,
                   es_975, ses, rtpl, and the parts of actual_pnl that the rule set
                   may take out (fees_commissions, reserves_adjustments, net_interest_income,
                   intraday_pnl, new_trade_pnl). Dates YYYY-MM-DD, amounts with a dot decimal;
                   an empty amount is a missing value.
  --regime ID      basel | us | eu | frtb
  --as-of DATE     the window is the last 250 observations on or before this date
  --basis BASIS    actual | hypothetical | max (default: the rule set's own basis)
  --json           print JSON instead of a table
  --help           show this text
`;

const REGIME_IDS: readonly RegimeId[] = ["basel", "us", "eu", "frtb"];
const BASES: readonly PnlBasis[] = ["actual", "hypothetical", "max"];
const MAX_ERRORS_SHOWN = 20;

class CliInputError extends Error {}

interface CliOptions {
  file: string;
  regime: RegimeId;
  asOf: string;
  basis?: PnlBasis;
  json: boolean;
}

function parseArgs(argv: readonly string[]): CliOptions | "help" {
  const values: Record<string, string> = {};
  let json = false;
  for (let i = 0; i < argv.length; i++) {
    const arg = argv[i];
    if (arg === "--help" || arg === "-h") return "help";
    if (arg === "--json") {
      json = true;
      continue;
    }
    const m = /^--(file|regime|as-of|basis)(?:=(.*))?$/.exec(arg);
    if (!m) throw new CliInputError(`Unknown argument "${arg}". Run with --help to see the options.`);
    const value = m[2] ?? argv[++i];
    if (value === undefined || value === "" || (m[2] === undefined && value.startsWith("--"))) {
      throw new CliInputError(`--${m[1]} needs a value.`);
    }
    values[m[1]] = value;
  }
  if (!values.file) throw new CliInputError("--file is required. Run with --help to see the options.");
  if (!values.regime) throw new CliInputError(`--regime is required: one of ${REGIME_IDS.join(", ")}.`);
  if (!REGIME_IDS.includes(values.regime as RegimeId)) {
    throw new CliInputError(`Unknown rule set "${values.regime}": use one of ${REGIME_IDS.join(", ")}.`);
  }
  if (!values["as-of"]) throw new CliInputError("--as-of is required (YYYY-MM-DD).");
  if (!isIsoDate(values["as-of"]))
    throw new CliInputError(`--as-of "${values["as-of"]}" is not a real date written YYYY-MM-DD.`);
  if (values.basis !== undefined && !BASES.includes(values.basis as PnlBasis)) {
    throw new CliInputError(`Unknown P&L basis "${values.basis}": use one of ${BASES.join(", ")}.`);
  }
  return {
    file: values.file,
    regime: values.regime as RegimeId,
    asOf: values["as-of"],
    basis: values.basis as PnlBasis | undefined,
    json,
  };
}

/**
 * Reads the CSV into observations grouped by portfolio (in date order), or throws with every row
 * error. The same parser and rules as an upload (shared/ingest/parse-csv.ts); the file's own
 * portfolio codes are taken as known and no holiday calendar applies (weekends still do).
 */
export function parseObservationsCsv(text: string): Map<string, Observation[]> {
  const body = text.replace(/^\uFEFF/, "");
  let parsed: ReturnType<typeof parseObservationCsv>;
  try {
    const cells = splitCsv(body).data;
    const portfolioAt = (cells[0] ?? []).map((h) => h.trim().toLowerCase()).indexOf("portfolio");
    const codes = new Set(
      cells
        .slice(1)
        .map((r) => (r[portfolioAt] ?? "").trim().toUpperCase())
        .filter(Boolean),
    );
    parsed = parseObservationCsv(body, {
      portfolios: new Map([...codes].map((c) => [c, { entityCode: "file", holidays: new Map() }])),
    });
  } catch (err) {
    if (err instanceof CsvFileError) {
      const details = err.errors.map((e) => `  line ${e.line}, column ${e.column}: ${e.message}`);
      throw new CliInputError([err.message, ...details].join("\n"));
    }
    throw err;
  }
  if (parsed.errorCount) {
    const shown = parsed.errors
      .slice(0, MAX_ERRORS_SHOWN)
      .map((e) => `  line ${e.line}, column ${e.column}: ${e.message}`);
    if (parsed.errorCount > shown.length) shown.push(`  … and ${parsed.errorCount - shown.length} more`);
    throw new CliInputError(
      `The file has ${parsed.errorCount} problem${parsed.errorCount > 1 ? "s" : ""}:\n${shown.join("\n")}`,
    );
  }
  return seriesByPortfolio(parsed.rows);
}

const fmt = (x: number, digits: number): string => x.toFixed(digits);
const pValue = (p: number): string => (p < 0.0001 ? "<0.0001" : p.toFixed(4));

function table(results: Array<{ portfolio: string; result: BacktestResult }>): string {
  const head = [
    "Portfolio",
    "Window",
    "Obs",
    "Actual",
    "Hypo",
    "Counted",
    "Excl",
    "Zone",
    "Plus",
    "Mult",
    "Kupiec p",
    "Indep p",
    "CondCov p",
  ];
  const body = results.map(({ portfolio, result: r }) => [
    portfolio,
    r.window.start ? `${r.window.start}..${r.window.end}` : "(none)",
    `${r.window.observations}${r.window.complete ? "" : "*"}`,
    String(r.exceptions.actual),
    String(r.exceptions.hypothetical),
    String(r.exceptions.counted),
    String(r.exceptions.excluded),
    r.zoneLabel,
    fmt(r.plusFactor, 2),
    fmt(r.multiplier, 2),
    pValue(r.tests.kupiec.pValue),
    pValue(r.tests.independence.pValue),
    pValue(r.tests.conditionalCoverage.pValue),
  ]);
  const widths = head.map((h, c) => Math.max(h.length, ...body.map((row) => row[c].length)));
  const left = new Set([0, 1, 7]);
  const line = (cells: string[]): string =>
    cells
      .map((v, c) => (left.has(c) ? v.padEnd(widths[c]) : v.padStart(widths[c])))
      .join("  ")
      .trimEnd();
  return [line(head), widths.map((w) => "-".repeat(w)).join("  "), ...body.map(line)].join("\n");
}

function notes(results: Array<{ portfolio: string; result: BacktestResult }>): string[] {
  const out: string[] = [];
  for (const { portfolio, result: r } of results) {
    out.push(
      `${portfolio} (tests on ${r.testedSeries} P&L): ${r.tests.kupiec.verdict} ${r.tests.independence.verdict}`,
    );
    if (!r.window.complete) out.push(`${portfolio}: only ${r.window.observations} observations — provisional.`);
    if (r.dataGaps.length)
      out.push(
        `${portfolio}: ${r.dataGaps.length} day(s) with a missing value (first ${r.dataGaps[0]}) — data gaps block sign-off.`,
      );
  }
  return out;
}

/** The whole command, with its input and output passed in so tests can run it. Returns the exit code. */
export function runBacktestCli(argv: readonly string[], io: CliIo = defaultIo): number {
  try {
    const opts = parseArgs(argv);
    if (opts === "help") {
      io.stdout(USAGE);
      return 0;
    }
    let text: string;
    try {
      text = io.readFile(opts.file);
    } catch (e) {
      throw new CliInputError(`Cannot read ${opts.file}: ${(e as Error).message}`);
    }
    const portfolios = parseObservationsCsv(text);
    const rules = getRegime(opts.regime);
    const results = [...portfolios.keys()].sort().map((portfolio) => {
      try {
        return {
          portfolio,
          result: backtestAt(withPnlDefinition(portfolios.get(portfolio)!, opts.regime), {
            regime: opts.regime,
            pnlBasis: opts.basis,
            asOf: opts.asOf,
          }),
        };
      } catch (e) {
        if (e instanceof EngineInputError) throw new CliInputError(`Portfolio ${portfolio}: ${e.message}`);
        throw e;
      }
    });
    if (opts.json) {
      const payload = {
        engineVersion: ENGINE_VERSION,
        regime: rules.id,
        asOf: opts.asOf,
        portfolios: results.map(({ portfolio, result }) => ({ portfolio, ...result })),
      };
      io.stdout(`${JSON.stringify(payload, null, 2)}\n`);
      return 0;
    }
    const basis = opts.basis ?? rules.defaultPnlBasis;
    io.stdout(
      [
        `${rules.label} backtest as of ${opts.asOf} (P&L basis ${basis}; ${rules.citation})`,
        "",
        table(results),
        "",
        ...notes(results),
        ...(results.some((x) => !x.result.window.complete) ? ["* fewer than 250 observations: provisional."] : []),
        "Decision support only: the supervisor, the applicable rules and the approved model documentation govern.",
        "",
      ].join("\n"),
    );
    return 0;
  } catch (e) {
    if (e instanceof CliInputError) {
      io.stderr(`backtest: ${e.message}\n`);
      return 1;
    }
    throw e;
  }
}

if (process.argv[1] && import.meta.url === pathToFileURL(resolve(process.argv[1])).href) {
  process.exitCode = runBacktestCli(process.argv.slice(2));
}
