import { mkdtempSync, readFileSync, rmSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { runBacktestCli, type CliIo } from "../../scripts/backtest-cli";
import { businessDates } from "./build-observations";

let dir: string;
beforeAll(() => {
  dir = mkdtempSync(join(tmpdir(), "qm-backtest-cli-"));
});
afterAll(() => rmSync(dir, { recursive: true, force: true }));

function run(argv: string[]): { code: number; out: string; err: string } {
  let out = "";
  let err = "";
  const io: CliIo = { readFile: (p) => readFileSync(p, "utf8"), stdout: (t) => (out += t), stderr: (t) => (err += t) };
  return { code: runBacktestCli(argv, io), out, err };
}

function writeCsv(name: string, text: string): string {
  const path = join(dir, name);
  writeFileSync(path, text);
  return path;
}

/** Two portfolios over 250 business days: RATES with 5 exceptions (yellow), FX with 1 (green). Columns in a shuffled order. */
function sampleCsv(): string {
  const dates = businessDates(250, "2025-10-01");
  const lines = ["var_99,date,portfolio,hypothetical_pnl,actual_pnl,svar_99"];
  for (const [portfolio, at] of [
    ["RATES", [10, 60, 120, 180, 240]],
    ["FX", [100]],
  ] as const) {
    dates.forEach((d, i) => {
      const pnl = (at as readonly number[]).includes(i) ? "-1500.50" : "250";
      lines.push(`1000,${d},${portfolio},${pnl},${pnl},1800`);
    });
  }
  return `${lines.join("\r\n")}\r\n`;
}

describe("backtest command", () => {
  it("when run on a two-portfolio file, then it prints a table with each portfolio's counts, zone, plus factor and multiplier (CRR Art. 366 Table 1, from memory)", () => {
    const file = writeCsv("sample.csv", sampleCsv());
    const asOf = businessDates(250, "2025-10-01")[249];
    const { code, out, err } = run(["--file", file, "--regime", "eu", "--as-of", asOf]);
    expect(err).toBe("");
    expect(code).toBe(0);
    expect(out).toMatch(/EU CRR backtest as of/);
    const rates = out.split("\n").find((l) => l.startsWith("RATES"))!;
    expect(rates.split(/\s+/)).toEqual(expect.arrayContaining(["250", "5", "yellow", "0.40", "3.40"]));
    const fx = out.split("\n").find((l) => l.startsWith("FX"))!;
    expect(fx.split(/\s+/)).toEqual(expect.arrayContaining(["1", "green", "0.00", "3.00"]));
  });

  it("when --json is given, then the output parses and carries the backtest figures per portfolio", () => {
    const file = writeCsv("sample-json.csv", sampleCsv());
    const asOf = businessDates(250, "2025-10-01")[249];
    const { code, out } = run([`--file=${file}`, "--regime", "frtb", "--as-of", asOf, "--json", "--basis", "actual"]);
    expect(code).toBe(0);
    const json = JSON.parse(out);
    expect(json.regime).toBe("frtb");
    const rates = json.portfolios.find((p: { portfolio: string }) => p.portfolio === "RATES");
    expect(rates).toMatchObject({
      pnlBasis: "actual",
      zone: "yellow",
      zoneLabel: "amber",
      exceptions: { counted: 5 },
      window: { observations: 250, complete: true },
    });
    expect(rates.multiplier).toBeCloseTo(1.7, 12); // MAR99 steps, from memory: 1.5 + 0.20
  });

  it.each([
    {
      when: "the header has an unknown column",
      then: "naming the column",
      name: "unknown.csv",
      csv: "portfolio,date,actual_pnl,hypothetical_pnl,var_99,desk\nA,2026-01-02,1,1,1,x\n",
      asOf: "2026-01-02",
      message: /Unknown column "desk"/,
    },
    {
      when: "a required column is missing",
      then: "listing it",
      name: "missing.csv",
      csv: "portfolio,date,actual_pnl,var_99\nA,2026-01-02,1,1\n",
      asOf: "2026-01-02",
      message: /line 1, column hypothetical_pnl: Required column "hypothetical_pnl" is missing/,
    },
    {
      when: "a portfolio has the same date twice",
      then: "naming the portfolio and the date",
      name: "dup.csv",
      csv: "portfolio,date,actual_pnl,hypothetical_pnl,var_99\nA,2026-01-02,1,1,1\nA,2026-01-02,2,2,1\n",
      asOf: "2026-01-30",
      message: /line 3, column date: A on 2026-01-02 already appears on line 2/,
    },
  ])("when $when, then it exits 1 $then", ({ name, csv, asOf, message }) => {
    const { code, err } = run(["--file", writeCsv(name, csv), "--regime", "eu", "--as-of", asOf]);
    expect(code).toBe(1);
    expect(err).toMatch(message);
  });

  it("when rows hold a bad amount, a bad date or a negative VaR, then it exits 1 with the line and column of each", () => {
    const file = writeCsv(
      "bad.csv",
      [
        "portfolio,date,actual_pnl,hypothetical_pnl,var_99",
        "A,2026-01-02,1 234.5,1,1",
        "A,2026-02-30,1,1,1",
        "A,2026-01-05,1,1,-3",
      ].join("\n"),
    );
    const { code, err } = run(["--file", file, "--regime", "us", "--as-of", "2026-01-30"]);
    expect(code).toBe(1);
    expect(err).toMatch(/3 problems/);
    // The same words as an upload's preview (shared/ingest/parse-csv.ts).
    expect(err).toMatch(/line 2, column actual_pnl: "1 234.5" is not a plain decimal amount/);
    expect(err).toMatch(/line 3, column date: 2026-02-30 is not a real calendar date/);
    expect(err).toMatch(/line 4, column var_99: var_99 must be a positive amount/);
  });

  it("when the arguments are wrong, then it explains; --help prints the usage and exits 0", () => {
    expect(run(["--regime", "eu", "--as-of", "2026-01-02"])).toMatchObject({
      code: 1,
      err: expect.stringMatching(/--file is required/),
    });
    expect(run(["--file", "x.csv", "--regime", "uk", "--as-of", "2026-01-02"])).toMatchObject({
      code: 1,
      err: expect.stringMatching(/Unknown rule set "uk"/),
    });
    expect(run(["--file", "x.csv", "--regime", "eu", "--as-of", "30.09.2026"])).toMatchObject({
      code: 1,
      err: expect.stringMatching(/not a real date/),
    });
    expect(run(["--file", join(dir, "nope.csv"), "--regime", "eu", "--as-of", "2026-01-02"])).toMatchObject({
      code: 1,
      err: expect.stringMatching(/Cannot read/),
    });
    expect(run(["--frobnicate"])).toMatchObject({ code: 1, err: expect.stringMatching(/Unknown argument/) });
    const help = run(["--help"]);
    expect(help.code).toBe(0);
    expect(help.out).toMatch(/--regime ID/);
  });
});
