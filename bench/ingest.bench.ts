/**
 * Ingest benchmark (`npm run bench:ingest`): a 100,000-row daily file uploaded, previewed and
 * committed through the real HTTP API of a server running in its own process, against MariaDB's
 * own LOAD DATA LOCAL INFILE of the same rows into the same table, in the same run. Prints
 * figures; asserts nothing. Last line: one JSON object.
 */
import { spawn, spawnSync } from "node:child_process";
import { readFileSync, writeFileSync, rmSync, mkdtempSync } from "node:fs";
import { tmpdir } from "node:os";
import net from "node:net";
import path from "node:path";
import bcrypt from "bcryptjs";
import mariadb from "mariadb";
import { appCredentials, ensureDatabase, startPrivateDb, stopPrivateDb } from "../scripts/lib/mariadb";
import { projectRoot } from "../scripts/lib/run";

const ROWS = 100_000;
const PORTFOLIOS = 10;
const RUNS = 3;
const DB_NAME = "quartermark_bench";

function freePort(): Promise<number> {
  return new Promise((resolve) => {
    const srv = net.createServer().listen(0, "127.0.0.1", () => {
      const { port } = srv.address() as net.AddressInfo;
      srv.close(() => resolve(port));
    });
  });
}

function weekdays(startYear: number, count: number): string[] {
  const out: string[] = [];
  const d = new Date(Date.UTC(startYear, 0, 1));
  while (out.length < count) {
    const wd = d.getUTCDay();
    if (wd !== 0 && wd !== 6) out.push(d.toISOString().slice(0, 10));
    d.setUTCDate(d.getUTCDate() + 1);
  }
  return out;
}

const median = (xs: number[]) => [...xs].sort((a, b) => a - b)[Math.floor(xs.length / 2)];

async function main() {
  process.env.DB_NAME = DB_NAME;
  const creds = appCredentials();
  const { config } = await import("../server/config");
  const db = await startPrivateDb(config.db.port);
  await ensureDatabase(db, DB_NAME, creds, { fresh: true });
  const { migrateUp } = await import("../server/db/migrator");
  const { sequelize } = await import("../server/db/sequelize");
  await migrateUp();

  // Reference data for the run: one entity, its portfolios, one analyst.
  const password = "bench-password-123";
  const hash = await bcrypt.hash(password, 12);
  await sequelize.query("INSERT INTO users (email, name, role, password_hash) VALUES ('bench@quartermark.test', 'Bench Analyst', 'analyst', :hash)", { replacements: { hash } });
  await sequelize.query("INSERT INTO entities (code, name, regime, pnl_basis, currency, supervisor_emails) VALUES ('BENCH', 'Bench entity', 'eu', 'max', 'EUR', '[]')");
  const codes = Array.from({ length: PORTFOLIOS * RUNS }, (_, i) => `BENCH-P${String(i).padStart(2, "0")}`);
  for (const code of codes) {
    await sequelize.query("INSERT INTO portfolios (entity_id, code, name, level) SELECT id, :code, :code, 'top' FROM entities WHERE code = 'BENCH'", { replacements: { code } });
  }
  const [[user]] = (await sequelize.query("SELECT id FROM users WHERE email = 'bench@quartermark.test'")) as [{ id: number }[], unknown];
  const portfolioIds = new Map(((await sequelize.query("SELECT id, code FROM portfolios"))[0] as { id: number; code: string }[]).map((p) => [p.code, p.id]));
  await sequelize.close();

  // The production build of the server in its own process, so its memory can be read on its own.
  const build = spawnSync("npm", ["run", "--silent", "build:server"], { cwd: projectRoot, stdio: "inherit" });
  if (build.status !== 0) throw new Error("npm run build:server failed");
  const port = await freePort();
  const server = spawn(process.execPath, ["--max-old-space-size=256", "dist/server/index.mjs"], {
    cwd: projectRoot,
    env: { ...process.env, PORT: String(port), DB_NAME, LOG_LEVEL: "error", NODE_ENV: "production" },
    stdio: ["ignore", "inherit", "inherit"],
  });
  const base = `http://127.0.0.1:${port}`;
  for (let i = 0; i < 200; i++) {
    try {
      if ((await fetch(`${base}/api/health`)).ok) break;
    } catch {
      /* not up yet */
    }
    await new Promise((r) => setTimeout(r, 100));
  }
  const login = await fetch(`${base}/api/auth/login`, { method: "POST", headers: { "Content-Type": "application/json" }, body: JSON.stringify({ email: "bench@quartermark.test", password }) });
  const cookie = (login.headers.get("set-cookie") ?? "").split(";")[0];
  if (!login.ok || !cookie) throw new Error(`bench sign-in failed: ${login.status}`);

  const serverPid = server.pid!;
  const rssMb = (field: "VmHWM" | "VmRSS") => {
    const line = readFileSync(`/proc/${serverPid}/status`, "utf8").split("\n").find((l) => l.startsWith(field));
    return Number(line?.replace(/\D+/g, "") ?? 0) / 1024;
  };
  const baselineRss = rssMb("VmRSS");

  const perDay = ROWS / PORTFOLIOS;
  const apiRates: number[] = [];
  const loadRates: number[] = [];
  const phases: string[] = [];
  const tmp = mkdtempSync(path.join(tmpdir(), "qm-bench-"));
  const admin = await mariadb.createConnection({ host: config.db.host, port: config.db.port, user: creds.user, password: creds.password, database: DB_NAME, permitLocalInfile: true });

  for (let run = 0; run < RUNS; run++) {
    const runCodes = codes.slice(run * PORTFOLIOS, (run + 1) * PORTFOLIOS);
    const dates = weekdays(1960 + run, perDay);
    const lines = ["portfolio,date,actual_pnl,hypothetical_pnl,var_99,var_975,svar_99"];
    for (const code of runCodes) {
      for (let i = 0; i < dates.length; i++) {
        const pnl = ((i * 7919) % 20000) - 10000 + 0.25;
        lines.push(`${code},${dates[i]},${pnl.toFixed(2)},${(pnl * 0.97).toFixed(2)},${(9000 + (i % 500)).toFixed(2)},${(7000 + (i % 400)).toFixed(2)},${(21000 + (i % 900)).toFixed(2)}`);
      }
    }
    const csv = lines.join("\n") + "\n";

    // 1. Through the API: multipart upload → preview → commit.
    const t0 = performance.now();
    const form = new FormData();
    form.append("file", new Blob([csv], { type: "text/csv" }), `bench-${run}.csv`);
    const preview = await fetch(`${base}/api/uploads`, { method: "POST", headers: { Cookie: cookie, Origin: base }, body: form });
    const previewBody = (await preview.json()) as { id: number; valid: number; invalid: number };
    const t1 = performance.now();
    if (preview.status !== 201 || previewBody.invalid !== 0) throw new Error(`preview failed: ${preview.status} ${JSON.stringify(previewBody).slice(0, 300)}`);
    const commit = await fetch(`${base}/api/uploads/${previewBody.id}/commit`, { method: "POST", headers: { Cookie: cookie, Origin: base } });
    const commitBody = (await commit.json()) as { inserted: number };
    const t2 = performance.now();
    if (commit.status !== 200 || commitBody.inserted !== ROWS) throw new Error(`commit failed: ${commit.status} ${JSON.stringify(commitBody).slice(0, 300)}`);
    apiRates.push(ROWS / ((t2 - t0) / 1000));
    phases.push(`run ${run + 1}: upload+preview ${(t1 - t0).toFixed(0)} ms, commit ${(t2 - t1).toFixed(0)} ms, ${(ROWS / ((t2 - t0) / 1000)).toFixed(0)} rows/s`);

    // 2. The floor: the same rows straight into the same table with LOAD DATA LOCAL INFILE.
    await admin.query("DELETE FROM observations WHERE upload_id = ?", [previewBody.id]);
    const file = path.join(tmp, `load-${run}.csv`);
    const tsv = csv
      .trim()
      .split("\n")
      .slice(1)
      .map((l) => {
        const [code, date, a, h, v, v975, sv] = l.split(",");
        return `${portfolioIds.get(code)},${date},1,1,${a},${h},${v},${v975},${sv},${previewBody.id},${user.id}`;
      })
      .join("\n");
    writeFileSync(file, tsv);
    const l0 = performance.now();
    await admin.beginTransaction();
    await admin.query(
      `LOAD DATA LOCAL INFILE '${file}' INTO TABLE observations FIELDS TERMINATED BY ',' LINES TERMINATED BY '\\n'
       (portfolio_id, business_date, version, is_current, actual_pnl, hypothetical_pnl, var_99, var_975, svar_99, upload_id, created_by)`,
    );
    await admin.commit();
    const l1 = performance.now();
    loadRates.push(ROWS / ((l1 - l0) / 1000));
    phases.push(`        LOAD DATA LOCAL INFILE ${(l1 - l0).toFixed(0)} ms, ${(ROWS / ((l1 - l0) / 1000)).toFixed(0)} rows/s`);
  }
  const peakRssMb = rssMb("VmHWM");
  await admin.end();
  server.kill("SIGTERM");
  rmSync(tmp, { recursive: true, force: true });
  if (db.startedHere) await stopPrivateDb(config.db.port);

  const rowsPerSecond = Math.round(median(apiRates));
  const loadDataRowsPerSecond = Math.round(median(loadRates));
  console.log(`ingest bench: ${ROWS.toLocaleString("en")} rows × ${RUNS} runs through POST /api/uploads + commit (built server, own process)`);
  for (const p of phases) console.log(`  ${p}`);
  console.log(`  median end to end: ${rowsPerSecond.toLocaleString("en")} rows/s (target ≥ 50,000)`);
  console.log(`  median LOAD DATA:  ${loadDataRowsPerSecond.toLocaleString("en")} rows/s; ratio ${(rowsPerSecond / loadDataRowsPerSecond).toFixed(2)} (target ≥ 0.5)`);
  console.log(`  server memory: ${baselineRss.toFixed(0)} MB at rest, peak ${peakRssMb.toFixed(0)} MB (target ≤ 300 MB)`);
  console.log(
    JSON.stringify({
      bench: "ingest",
      rows: ROWS,
      rowsPerSecond,
      loadDataRowsPerSecond,
      ratioToLoadData: Number((rowsPerSecond / loadDataRowsPerSecond).toFixed(3)),
      peakRssMb: Math.round(peakRssMb),
    }),
  );
}

main().catch((err) => {
  console.error(err);
  process.exit(1);
});
