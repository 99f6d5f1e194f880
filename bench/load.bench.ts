/**
 * Load benchmark (`npm run bench:load`): every read endpoint of the production server bundle, one
 * after another, at 50 concurrent connections on loopback, on the Larkspur demo data plus 20
 * entities made by the demo generator (three years each). Each endpoint's requests go round all
 * entities (or their top-of-house books). Two floors come first: `/` (the client's index.html from
 * disk: the same server, its middleware, no database, no session) and `/api/health` (one `SELECT 1`,
 * no figures); reading the file costs more than the database's ping here, so the ratios are to the
 * second. Refused requests are counted by status (`statuses`). Every run is bounded: at most REQUESTS
 * requests and SECONDS seconds per endpoint. It runs once with one server process (WORKERS=1) and
 * once with the server's default count, and prints, per endpoint, one JSON line with p50 / p95 /
 * p99 (from every response's own time), requests per second, errors, and the ratios to the floor.
 * Asserts nothing. The last line is one JSON object with everything.
 *
 * With one process it also reads the same book held over 1 and over 6 years (YRS-1, YRS-6), one
 * request at a time, the two alternating, and prints each endpoint's median time on both and their
 * ratio: what a read costs must not follow the years of history.
 *
 * LOAD_REQUESTS, LOAD_SECONDS and LOAD_WORKERS ("1,default") change the bounds and the runs;
 * LOAD_ONLY picks endpoints by a part of their name.
 */
import { existsSync } from "node:fs";
import path from "node:path";
import autocannon from "autocannon";
import { projectRoot, runBin } from "../scripts/lib/run";
import { prepareLoadDatabase } from "./lib/load-data";
import { startBuiltServer, type BenchServer } from "./lib/bench-server";

const CONNECTIONS = 50;
const REQUESTS = Number(process.env.LOAD_REQUESTS ?? 1000);
const SECONDS = Number(process.env.LOAD_SECONDS ?? 15);
const DEMO_PASSWORD = process.env.DEMO_PASSWORD ?? "quartermark-demo";

interface Endpoint {
  name: string;
  method?: "GET" | "POST";
  paths: string[];
  body?: string;
}

interface Figures {
  endpoint: string;
  /** How many answers of each status other than 2xx. */
  statuses: Record<string, number>;
  workers: string;
  requests: number;
  ok: number;
  /** Sent but not answered when the time bound stopped the run. */
  unfinished: number;
  non2xx: number;
  errors: number;
  p50Ms: number;
  p95Ms: number;
  p99Ms: number;
  maxMs: number;
  requestsPerSecond: number;
  stoppedByTime: boolean;
}

function percentile(sorted: number[], p: number): number {
  if (sorted.length === 0) return NaN;
  const i = Math.min(sorted.length - 1, Math.ceil((p / 100) * sorted.length) - 1);
  return Math.round(sorted[Math.max(0, i)] * 10) / 10;
}

/** Waits until the server answers the floor quickly again: requests cut off by the time bound are still being worked on. */
async function drain(server: BenchServer): Promise<void> {
  const until = Date.now() + 120_000;
  while (Date.now() < until) {
    const t0 = performance.now();
    await fetch(`${server.base}/api/health`).catch(() => undefined);
    if (performance.now() - t0 < 50) return;
    await new Promise((r) => setTimeout(r, 500));
  }
}

async function measure(server: BenchServer, endpoint: Endpoint, workers: string): Promise<Figures> {
  const times: number[] = [];
  let stoppedByTime = false;
  const started = performance.now();
  let finish!: (r: autocannon.Result) => void;
  let fail!: (e: unknown) => void;
  const done = new Promise<autocannon.Result>((resolve, reject) => {
    finish = resolve;
    fail = reject;
  });
  const instance = autocannon(
    {
      url: server.base,
      connections: CONNECTIONS,
      amount: REQUESTS,
      timeout: 30,
      headers: {
        cookie: server.cookie,
        origin: server.base,
        ...(endpoint.body ? { "content-type": "application/json" } : {}),
      },
      requests: endpoint.paths.map((path) => ({ method: endpoint.method ?? "GET", path, body: endpoint.body })),
    },
    (err, result) => (err ? fail(err) : finish(result)),
  );
  // Autocannon reports its end on its one-second tick: the rate is taken from the last response instead.
  let lastResponse = started;
  const statuses: Record<string, number> = {};
  instance.on("response", (_client: unknown, status: number, _bytes: number, responseTime: number) => {
    times.push(responseTime);
    if (status < 200 || status > 299) statuses[status] = (statuses[status] ?? 0) + 1;
    lastResponse = performance.now();
  });
  const timer = setTimeout(() => {
    stoppedByTime = true;
    instance.stop();
  }, SECONDS * 1000);
  const result = await done;
  clearTimeout(timer);
  const elapsed = (lastResponse - started) / 1000;
  times.sort((a, b) => a - b);
  return {
    endpoint: endpoint.name,
    workers,
    requests: times.length,
    ok: result["2xx"],
    unfinished: Math.max(0, result.requests.sent - times.length),
    non2xx: result.non2xx,
    statuses,
    errors: result.errors + result.timeouts,
    p50Ms: percentile(times, 50),
    p95Ms: percentile(times, 95),
    p99Ms: percentile(times, 99),
    maxMs: times.length ? Math.round(times[times.length - 1]) : NaN,
    requestsPerSecond: Math.round((times.length / elapsed) * 10) / 10,
    stoppedByTime,
  };
}

/** The per-book reads, for one entity and its top-of-house book. */
function historyPaths(entity: string, portfolio: string): { name: string; method?: "POST"; path: string }[] {
  const since = new Date(Date.now() - 90 * 86_400_000).toISOString().slice(0, 10);
  const yearAgo = new Date(Date.now() - 365 * 86_400_000).toISOString().slice(0, 10);
  const today = new Date().toISOString().slice(0, 10);
  return [
    { name: "backtest", path: `/api/portfolios/${portfolio}/backtest` },
    { name: "rolling, last year", path: `/api/portfolios/${portfolio}/rolling?from=${yearAgo}` },
    { name: "rolling, whole history", path: `/api/portfolios/${portfolio}/rolling` },
    { name: "observations, 90 days", path: `/api/portfolios/${portfolio}/observations?from=${since}` },
    { name: "capital on a date", path: `/api/entities/${entity}/capital?date=${today}` },
    { name: "determinations", path: `/api/entities/${entity}/determinations` },
    { name: "capital forecast", path: `/api/entities/${entity}/capital/forecast` },
    { name: "capital what-if", method: "POST", path: `/api/entities/${entity}/capital/what-if` },
  ];
}

const ROUNDS = Number(process.env.LOAD_HISTORY_ROUNDS ?? 60);

/** Each read on the short and the long history, one request at a time, alternating; medians and their ratio. */
async function historyCheck(server: BenchServer, histories: { years: number; entity: string; portfolio: string }[]) {
  const [short, long] = [...histories].sort((a, b) => a.years - b.years);
  if (!short || !long || short === long) return [];
  const out = [];
  const shortPaths = historyPaths(short.entity, short.portfolio);
  const longPaths = historyPaths(long.entity, long.portfolio);
  for (let e = 0; e < shortPaths.length; e++) {
    const times: [number[], number[]] = [[], []];
    const bytes: [number, number] = [0, 0];
    for (let round = 0; round < ROUNDS; round++) {
      for (const side of round % 2 ? [1, 0] : [0, 1]) {
        const target = (side ? longPaths : shortPaths)[e];
        const t0 = performance.now();
        const r = await fetch(`${server.base}${target.path}`, {
          method: target.method ?? "GET",
          headers: { cookie: server.cookie, origin: server.base, "content-type": "application/json" },
          body: target.method === "POST" ? JSON.stringify({ extraExceptions: 1 }) : undefined,
        });
        const body = await r.arrayBuffer();
        if (!r.ok) throw new Error(`${target.path} answered ${r.status}`);
        times[side].push(performance.now() - t0);
        bytes[side] = body.byteLength;
      }
    }
    const median = (xs: number[]) =>
      percentile(
        [...xs].sort((a, b) => a - b),
        50,
      );
    const line = {
      bench: "load-history",
      endpoint: shortPaths[e].name,
      shortYears: short.years,
      longYears: long.years,
      shortP50Ms: median(times[0]),
      longP50Ms: median(times[1]),
      longVsShort: Math.round((median(times[1]) / median(times[0])) * 100) / 100,
      shortBytes: bytes[0],
      longBytes: bytes[1],
    };
    console.log(JSON.stringify(line));
    out.push(line);
  }
  return out;
}

function endpointsFor(portfolios: string[], entities: string[], snapshotIds: number[]): Endpoint[] {
  const since = new Date(Date.now() - 90 * 86_400_000).toISOString().slice(0, 10);
  const today = new Date().toISOString().slice(0, 10);
  return [
    { name: "GET / (static floor)", paths: ["/"] },
    { name: "GET /api/health (database floor)", paths: ["/api/health"] },
    { name: "GET /api/auth/me", paths: ["/api/auth/me"] },
    { name: "GET /api/overview", paths: ["/api/overview"] },
    { name: "GET /api/entities", paths: ["/api/entities"] },
    { name: "GET /api/portfolios/:code/backtest", paths: portfolios.map((p) => `/api/portfolios/${p}/backtest`) },
    { name: "GET /api/portfolios/:code/rolling", paths: portfolios.map((p) => `/api/portfolios/${p}/rolling`) },
    {
      name: "GET /api/portfolios/:code/observations",
      paths: portfolios.map((p) => `/api/portfolios/${p}/observations?from=${since}`),
    },
    {
      name: "GET /api/entities/:code/capital/forecast",
      paths: entities.map((e) => `/api/entities/${e}/capital/forecast`),
    },
    {
      name: "GET /api/entities/:code/capital/history",
      paths: entities.map((e) => `/api/entities/${e}/capital/history`),
    },
    {
      name: "POST /api/entities/:code/capital/what-if",
      method: "POST",
      paths: entities.map((e) => `/api/entities/${e}/capital/what-if`),
      body: JSON.stringify({ extraExceptions: 1 }),
    },
    {
      name: "GET /api/entities/:code/capital?date",
      paths: entities.map((e) => `/api/entities/${e}/capital?date=${today}`),
    },
    { name: "GET /api/entities/:code/determinations", paths: entities.map((e) => `/api/entities/${e}/determinations`) },
    { name: "GET /api/entities/:code/settings", paths: entities.map((e) => `/api/entities/${e}/settings`) },
    { name: "GET /api/snapshots", paths: ["/api/snapshots"] },
    { name: "GET /api/snapshots/:id", paths: snapshotIds.map((id) => `/api/snapshots/${id}`) },
    { name: "GET /api/notices?entity", paths: entities.map((e) => `/api/notices?entity=${e}`) },
    { name: "GET /api/queue", paths: ["/api/queue"] },
    { name: "GET /api/people", paths: ["/api/people"] },
    { name: "GET /api/filings", paths: ["/api/filings"] },
    { name: "GET /api/findings", paths: ["/api/findings"] },
    { name: "GET /api/uploads", paths: ["/api/uploads"] },
  ];
}

/** The static floor is the built client's index.html: build it when this checkout has none. */
async function ensureClientBuilt(): Promise<void> {
  if (existsSync(path.join(projectRoot, "dist/client/index.html"))) return;
  if ((await runBin("vite", ["build", "--logLevel", "warn"])) !== 0) throw new Error("vite build failed");
}

async function main() {
  await ensureClientBuilt();
  const data = await prepareLoadDatabase("quartermark_load", 20);
  // LOAD_ONLY=queue measures only the endpoints whose name holds that text (with the floors).
  const only = process.env.LOAD_ONLY;
  const endpoints = endpointsFor(data.portfolios, data.entities, data.snapshotIds).filter(
    (e) => !only || e.name.includes("floor") || e.name.includes(only),
  );
  const runs = (process.env.LOAD_WORKERS ?? "1,default").split(",").map((s) => s.trim());
  const all: Figures[] = [];
  let history: Awaited<ReturnType<typeof historyCheck>> = [];
  let built = false;
  for (const run of runs) {
    const server = await startBuiltServer(data.name, {
      workers: run === "default" ? undefined : Number(run),
      signIn: { email: "analyst@larkspur.test", password: DEMO_PASSWORD },
      skipBuild: built,
    });
    built = true;
    try {
      // One request to each first: the measured runs see a warm server, as users do.
      for (const e of endpoints) {
        const r = await fetch(`${server.base}${e.paths[0]}`, {
          method: e.method ?? "GET",
          headers: { cookie: server.cookie, origin: server.base, "content-type": "application/json" },
          body: e.body,
        });
        if (!r.ok) throw new Error(`${e.name} answered ${r.status} before the run: ${(await r.text()).slice(0, 200)}`);
      }
      console.log(
        `\nload bench, workers=${run}: ${data.entities.length} entities, ${CONNECTIONS} connections, ` +
          `at most ${REQUESTS} requests or ${SECONDS} s per endpoint`,
      );
      let floor: Figures | undefined;
      for (const e of endpoints) {
        await drain(server);
        const f = await measure(server, e, run);
        if (e.name.includes("(database floor)")) floor = f;
        all.push(f);
        console.log(
          JSON.stringify({
            bench: "load-endpoint",
            ...f,
            ...(floor && {
              p95VsFloor: Math.round((f.p95Ms / floor.p95Ms) * 10) / 10,
              rpsVsFloor: Math.round((f.requestsPerSecond / floor.requestsPerSecond) * 1000) / 1000,
            }),
          }),
        );
      }
      if (run === "1" && !only) {
        console.log(
          `\nthe same book over ${data.histories.map((h) => h.years).join(" and ")} years, one request at a time`,
        );
        history = await historyCheck(server, data.histories);
      }
    } finally {
      server.stop();
      await new Promise((r) => setTimeout(r, 1000));
    }
  }
  await data.stop();

  console.log(
    "\nendpoint                                   workers   p50 ms   p95 ms   p99 ms    req/s  errors  unanswered",
  );
  for (const f of all) {
    console.log(
      `${f.endpoint.padEnd(42)} ${f.workers.padStart(7)} ${String(f.p50Ms).padStart(8)} ${String(f.p95Ms).padStart(8)} ` +
        `${String(f.p99Ms).padStart(8)} ${String(f.requestsPerSecond).padStart(8)} ${String(f.errors + f.non2xx).padStart(7)} ${String(f.unfinished).padStart(11)}`,
    );
  }
  const reads = all.filter((f) => !f.endpoint.includes("(floor)"));
  console.log(
    JSON.stringify({
      bench: "load",
      connections: CONNECTIONS,
      entities: data.entities.length,
      worstP95Ms: Math.max(...reads.map((f) => f.p95Ms)),
      errors: all.reduce((s, f) => s + f.errors + f.non2xx, 0),
      endpoints: all,
      history,
    }),
  );
}

main().catch((err) => {
  console.error(err);
  process.exit(1);
});
