/**
 * Ingest benchmark (`npm run bench:ingest`): a 100,000-row daily file uploaded, previewed and
 * committed through the real HTTP API of the built server in its own process, against MariaDB's
 * own LOAD DATA LOCAL INFILE of the same rows into the same table, in the same run: one warm-up
 * round, then five counted rounds, each an API upload and a LOAD DATA taking turns going first.
 * The ratio is the median of the rounds' own ratios. Prints figures; asserts nothing. Last line:
 * one JSON object.
 */
import { mkdtempSync, rmSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import path from "node:path";
import mariadb from "mariadb";
import { benchCsv, benchWeekdays, prepareBenchDatabase, startBuiltServer, uploadAndCommit } from "./lib/bench-server";

const ROWS = 100_000;
const PORTFOLIOS = 10;
const RUNS = 5;
/** Rounds run first and not counted, on both sides alike: the JIT, the buffer pool and the pools warm up as on a server that has been running. */
const WARMUP = 1;

const median = (xs: number[]) => [...xs].sort((a, b) => a - b)[Math.floor(xs.length / 2)];

let firstUploadId = 0;

async function lastUploadId(admin: mariadb.Connection): Promise<number> {
  const [row] = (await admin.query("SELECT MAX(id) AS id FROM uploads")) as { id: number }[];
  return Number(row.id);
}

async function main() {
  // Each run has portfolios of its own for the API and for LOAD DATA, so that neither writes over
  // rows the other deleted, and the two take turns going first.
  const codes = Array.from(
    { length: PORTFOLIOS * (WARMUP + RUNS) * 2 },
    (_, i) => `BENCH-P${String(i).padStart(2, "0")}`,
  );
  const bench = await prepareBenchDatabase("quartermark_bench", codes);
  const server = await startBuiltServer(bench.name);
  const baselineRss = server.rssMb("VmRSS");
  const admin = await mariadb.createConnection({
    host: "127.0.0.1",
    port: bench.port,
    user: bench.creds.user,
    password: bench.creds.password,
    database: bench.name,
    permitLocalInfile: true,
  });
  const tmp = mkdtempSync(path.join(tmpdir(), "qm-bench-"));

  const apiRates: number[] = [];
  const loadRates: number[] = [];
  const phases: string[] = [];
  // Each round's API rate over its own LOAD DATA rate, measured next to each other: this machine's
  // speed drifts from minute to minute, and a round's two sides see the same machine.
  const roundRatios: number[] = [];
  for (let run = 0; run < WARMUP + RUNS; run++) {
    const counted = run >= WARMUP;
    const label = counted ? `run ${run - WARMUP + 1}` : "warm-up";
    const apiCodes = codes.slice(2 * run * PORTFOLIOS, (2 * run + 1) * PORTFOLIOS);
    const loadCodes = codes.slice((2 * run + 1) * PORTFOLIOS, (2 * run + 2) * PORTFOLIOS);
    const dates = benchWeekdays(1960 + run, ROWS / PORTFOLIOS);
    const csv = benchCsv(apiCodes, dates);

    // 1. Through the API: multipart upload → preview → commit.
    const viaApi = async () => {
      const r = await uploadAndCommit(server, csv, `bench-${run}.csv`);
      if (r.inserted !== ROWS) throw new Error(`expected ${ROWS} rows written, got ${r.inserted}`);
      const rate = ROWS / ((r.previewMs + r.commitMs) / 1000);
      if (counted) apiRates.push(rate);
      phases.push(
        `${label}: upload+preview ${r.previewMs.toFixed(0)} ms, commit ${r.commitMs.toFixed(0)} ms, ${rate.toFixed(0)} rows/s`,
      );
      return r.id;
    };
    // 2. The floor: the same rows (for the run's other portfolios) straight into the same table.
    const viaLoadData = async (uploadId: number) => {
      const file = path.join(tmp, `load-${run}.csv`);
      const rows = benchCsv(loadCodes, dates)
        .trim()
        .split("\n")
        .slice(1)
        .map((l) => {
          const [code, date, a, h, v, v975, sv] = l.split(",");
          return `${bench.portfolioIds.get(code)},${date},1,1,${a},${h},${v},${v975},${sv},${uploadId}`;
        });
      writeFileSync(file, rows.join("\n"));
      const l0 = performance.now();
      await admin.beginTransaction();
      await admin.query(
        `LOAD DATA LOCAL INFILE '${file}' INTO TABLE observations FIELDS TERMINATED BY ',' LINES TERMINATED BY '\\n'
         (portfolio_id, business_date, version, is_current, actual_pnl, hypothetical_pnl, var_99, var_975, svar_99, upload_id)`,
      );
      await admin.commit();
      const ms = performance.now() - l0;
      if (counted) loadRates.push(ROWS / (ms / 1000));
      phases.push(
        `${counted ? "" : "  (warm-up) "}        LOAD DATA LOCAL INFILE ${ms.toFixed(0)} ms, ${(ROWS / (ms / 1000)).toFixed(0)} rows/s`,
      );
    };
    if (run % 2 === 0) {
      await viaLoadData(await viaApi());
    } else {
      // LOAD DATA needs an upload row to point at: the first run's.
      await viaLoadData(firstUploadId);
      await viaApi();
    }
    if (run === 0) firstUploadId = await lastUploadId(admin);
    if (counted) roundRatios.push(apiRates[apiRates.length - 1] / loadRates[loadRates.length - 1]);
  }
  const peakRssMb = server.rssMb("VmHWM");
  await admin.end();
  server.stop();
  rmSync(tmp, { recursive: true, force: true });
  await bench.stop();

  const rowsPerSecond = Math.round(median(apiRates));
  const loadDataRowsPerSecond = Math.round(median(loadRates));
  const ratio = median(roundRatios);
  console.log(
    `ingest bench: ${ROWS.toLocaleString("en")} rows × ${RUNS} runs (after ${WARMUP} warm-up round, not counted) through POST /api/uploads + commit (built server, own process)`,
  );
  for (const p of phases) console.log(`  ${p}`);
  console.log(`  median end to end: ${rowsPerSecond.toLocaleString("en")} rows/s (target ≥ 50,000)`);
  console.log(`  median LOAD DATA:  ${loadDataRowsPerSecond.toLocaleString("en")} rows/s`);
  console.log(
    `  ratio to LOAD DATA, round by round: ${roundRatios.map((r) => r.toFixed(2)).join(" ")}; median ${ratio.toFixed(2)} (target ≥ 0.5; ratio of the two medians ${(rowsPerSecond / loadDataRowsPerSecond).toFixed(2)})`,
  );
  console.log(
    `  server memory: ${baselineRss.toFixed(0)} MB at rest, peak ${peakRssMb.toFixed(0)} MB (target ≤ 300 MB)`,
  );
  console.log(
    JSON.stringify({
      bench: "ingest",
      rows: ROWS,
      rowsPerSecond,
      loadDataRowsPerSecond,
      ratioToLoadData: Number(ratio.toFixed(3)),
      ratioOfMedians: Number((rowsPerSecond / loadDataRowsPerSecond).toFixed(3)),
      peakRssMb: Math.round(peakRssMb),
    }),
  );
}

main().catch((err) => {
  console.error(err);
  process.exit(1);
});
