/**
 * What the HTTP benchmarks share: a fresh database of their own on the private MariaDB, a little
 * reference data, and the production build of the server in its own process (so its memory and
 * latency are its own).
 */
import { spawn, spawnSync, type ChildProcess } from "node:child_process";
import { readFileSync } from "node:fs";
import net from "node:net";
import bcrypt from "bcryptjs";
import {
  appCredentials,
  ensureDatabase,
  startPrivateDb,
  stopPrivateDb,
  type DbCredentials,
  type PrivateDb,
} from "../../scripts/lib/mariadb";
import { projectRoot } from "../../scripts/lib/run";

export const BENCH_PASSWORD = "bench-password-123";

export interface BenchDatabase {
  db: PrivateDb;
  creds: DbCredentials;
  port: number;
  name: string;
  userId: number;
  portfolioIds: Map<string, number>;
  stop: () => Promise<void>;
}

/**
 * The database `name` on the private MariaDB, dropped, created and migrated. The server's config is
 * read here for the first time: set the environment it needs before.
 */
export async function migratedFreshDatabase(name: string) {
  process.env.DB_NAME = name;
  const creds = appCredentials();
  const { config } = await import("../../server/config");
  const db = await startPrivateDb(config.db.port);
  await ensureDatabase(db, name, creds, { fresh: true });
  const { migrateUp } = await import("../../server/db/migrator");
  await migrateUp();
  return { db, creds, config };
}

/** A freshly migrated database with one EU entity, these portfolios and one analyst. */
export async function prepareBenchDatabase(name: string, portfolioCodes: string[]): Promise<BenchDatabase> {
  const { db, creds, config } = await migratedFreshDatabase(name);
  const { sequelize } = await import("../../server/db/sequelize");
  const hash = await bcrypt.hash(BENCH_PASSWORD, 12);
  await sequelize.query(
    "INSERT INTO users (email, name, role, password_hash) VALUES ('bench@quartermark.test', 'Bench Analyst', 'analyst', :hash)",
    { replacements: { hash } },
  );
  await sequelize.query(
    "INSERT INTO entities (code, name, regime, pnl_basis, currency, supervisor_emails) VALUES ('BENCH', 'Bench entity', 'eu', 'max', 'EUR', '[]')",
  );
  for (const code of portfolioCodes) {
    await sequelize.query(
      "INSERT INTO portfolios (entity_id, code, name, level) SELECT id, :code, :code, 'top' FROM entities WHERE code = 'BENCH'",
      { replacements: { code } },
    );
  }
  const [[user]] = (await sequelize.query("SELECT id FROM users WHERE email = 'bench@quartermark.test'")) as [
    { id: number }[],
    unknown,
  ];
  const portfolioIds = new Map(
    ((await sequelize.query("SELECT id, code FROM portfolios"))[0] as { id: number; code: string }[]).map((p) => [
      p.code,
      p.id,
    ]),
  );
  await sequelize.close();
  return {
    db,
    creds,
    port: config.db.port,
    name,
    userId: user.id,
    portfolioIds,
    stop: async () => {
      if (db.startedHere) await stopPrivateDb(config.db.port);
    },
  };
}

function freePort(): Promise<number> {
  return new Promise((resolve) => {
    const srv = net.createServer().listen(0, "127.0.0.1", () => {
      const { port } = srv.address() as net.AddressInfo;
      srv.close(() => resolve(port));
    });
  });
}

export interface BenchServer {
  base: string;
  cookie: string;
  process: ChildProcess;
  rssMb: (field: "VmHWM" | "VmRSS") => number;
  stop: () => void;
}

export interface BuiltServerOptions {
  /** Worker processes (WORKERS); unset: the server's default for the machine. */
  workers?: number;
  /** Who signs in: the bench analyst by default. */
  signIn?: { email: string; password: string };
  /** Skip `npm run build:server` (already built by this run). */
  skipBuild?: boolean;
}

/** `npm run build:server`, then the bundle under node with the production heap, signed in as the bench analyst. */
export async function startBuiltServer(dbName: string, options: BuiltServerOptions = {}): Promise<BenchServer> {
  if (!options.skipBuild) {
    const build = spawnSync("npm", ["run", "--silent", "build:server"], { cwd: projectRoot, stdio: "inherit" });
    if (build.status !== 0) throw new Error("npm run build:server failed");
  }
  const port = await freePort();
  const workers = options.workers === undefined ? {} : { WORKERS: String(options.workers) };
  // BENCH_NODE_ARGS adds flags for a closer look, e.g. "--cpu-prof --cpu-prof-dir=.data/tmp/prof".
  const extra = (process.env.BENCH_NODE_ARGS ?? "").split(" ").filter(Boolean);
  const child = spawn(process.execPath, ["--max-old-space-size=256", ...extra, "dist/server/index.mjs"], {
    cwd: projectRoot,
    env: {
      ...process.env,
      ...workers,
      PORT: String(port),
      DB_NAME: dbName,
      LOG_LEVEL: "error",
      NODE_ENV: "production",
    },
    stdio: ["ignore", "inherit", "inherit"],
  });
  const base = `http://127.0.0.1:${port}`;
  for (let i = 0; i < 900; i++) {
    try {
      if ((await fetch(`${base}/api/health`)).ok) break;
    } catch {
      /* not up yet */
    }
    await new Promise((r) => setTimeout(r, 100));
  }
  const login = await fetch(`${base}/api/auth/login`, {
    method: "POST",
    headers: { "Content-Type": "application/json" },
    body: JSON.stringify(options.signIn ?? { email: "bench@quartermark.test", password: BENCH_PASSWORD }),
  });
  const cookie = (login.headers.get("set-cookie") ?? "").split(";")[0];
  if (!login.ok || !cookie) throw new Error(`bench sign-in failed: ${login.status}`);
  return {
    base,
    cookie,
    process: child,
    rssMb: (field) => {
      const line = readFileSync(`/proc/${child.pid}/status`, "utf8")
        .split("\n")
        .find((l) => l.startsWith(field));
      return Number(line?.replace(/\D+/g, "") ?? 0) / 1024;
    },
    stop: () => child.kill("SIGTERM"),
  };
}

/** Weekdays from 1 January of a year, as YYYY-MM-DD. */
export function benchWeekdays(startYear: number, count: number): string[] {
  const out: string[] = [];
  const d = new Date(Date.UTC(startYear, 0, 1));
  while (out.length < count) {
    const wd = d.getUTCDay();
    if (wd !== 0 && wd !== 6) out.push(d.toISOString().slice(0, 10));
    d.setUTCDate(d.getUTCDate() + 1);
  }
  return out;
}

/** A daily file for these portfolios over these dates (deterministic amounts). */
export function benchCsv(codes: string[], dates: string[]): string {
  const lines = ["portfolio,date,actual_pnl,hypothetical_pnl,var_99,var_975,svar_99"];
  for (const code of codes) {
    for (let i = 0; i < dates.length; i++) {
      const pnl = ((i * 7919) % 20000) - 10000 + 0.25;
      lines.push(
        `${code},${dates[i]},${pnl.toFixed(2)},${(pnl * 0.97).toFixed(2)},${(9000 + (i % 500)).toFixed(2)},${(7000 + (i % 400)).toFixed(2)},${(21000 + (i % 900)).toFixed(2)}`,
      );
    }
  }
  return lines.join("\n") + "\n";
}

/** Uploads and commits a file through the API; returns the upload id and the two phases' times. */
export async function uploadAndCommit(
  server: BenchServer,
  csv: string,
  fileName: string,
): Promise<{ id: number; previewMs: number; commitMs: number; inserted: number }> {
  // The file is in memory before the clock starts, as a browser holds the File an analyst chose.
  const file = new Blob([csv], { type: "text/csv" });
  const t0 = performance.now();
  const form = new FormData();
  form.append("file", file, fileName);
  const preview = await fetch(`${server.base}/api/uploads`, {
    method: "POST",
    headers: { Cookie: server.cookie, Origin: server.base },
    body: form,
  });
  const previewBody = (await preview.json()) as { id: number; invalid: number };
  const t1 = performance.now();
  if (preview.status !== 201 || previewBody.invalid !== 0)
    throw new Error(`preview failed: ${preview.status} ${JSON.stringify(previewBody).slice(0, 300)}`);
  const commit = await fetch(`${server.base}/api/uploads/${previewBody.id}/commit`, {
    method: "POST",
    headers: { Cookie: server.cookie, Origin: server.base },
  });
  const commitBody = (await commit.json()) as { inserted: number };
  const t2 = performance.now();
  if (commit.status !== 200)
    throw new Error(`commit failed: ${commit.status} ${JSON.stringify(commitBody).slice(0, 300)}`);
  return { id: previewBody.id, previewMs: t1 - t0, commitMs: t2 - t1, inserted: commitBody.inserted };
}
