/**
 * Load benchmark (`npm run bench:load`; docs/architecture.md#reliability): a bounded run on loopback against
 * the read endpoints (a fixed number of requests, then it stops) while a 50,000-row upload
 * commits. Prints the error count and latency figures; asserts nothing. Last line: one JSON object.
 */
import autocannon from "autocannon";
import { benchCsv, benchWeekdays, prepareBenchDatabase, startBuiltServer, uploadAndCommit } from "./lib/bench-server";

const REQUESTS = 3000;
const CONNECTIONS = 10;

async function main() {
  const readCodes = ["LOAD-A", "LOAD-B", "LOAD-C"];
  const writeCodes = Array.from({ length: 10 }, (_, i) => `LOAD-W${i}`);
  const bench = await prepareBenchDatabase("quartermark_load", [...readCodes, ...writeCodes]);
  const server = await startBuiltServer(bench.name);
  // Three years of data to read, brought in the ordinary way.
  await uploadAndCommit(server, benchCsv(readCodes, benchWeekdays(2024, 780)), "history.csv");

  const reads = [
    "/api/overview",
    ...readCodes.flatMap((c) => [
      `/api/portfolios/${c}/backtest`,
      `/api/portfolios/${c}/rolling`,
      `/api/portfolios/${c}/observations?from=2026-01-01`,
    ]),
  ];
  const load = autocannon({
    url: server.base,
    connections: CONNECTIONS,
    amount: REQUESTS,
    headers: { cookie: server.cookie },
    requests: reads.map((path) => ({ method: "GET" as const, path })),
  });
  const write = uploadAndCommit(server, benchCsv(writeCodes, benchWeekdays(1990, 5000)), "concurrent.csv");
  const [result, commit] = await Promise.all([load, write]);
  server.stop();
  await bench.stop();

  const errors = result.errors + result.timeouts;
  console.log(
    `load bench: ${result.requests.total} requests over ${reads.length} read endpoints, ${CONNECTIONS} connections, while ${commit.inserted.toLocaleString("en")} rows committed`,
  );
  console.log(`  responses: ${result["2xx"]} 2xx, ${result.non2xx} other, ${errors} errors or timeouts`);
  console.log(
    `  latency: p50 ${result.latency.p50} ms, p90 ${result.latency.p90} ms, p99 ${result.latency.p99} ms, max ${result.latency.max} ms; ${result.requests.average.toFixed(0)} requests/s`,
  );
  console.log(
    `  the concurrent upload: preview ${commit.previewMs.toFixed(0)} ms, commit ${commit.commitMs.toFixed(0)} ms`,
  );
  console.log(
    JSON.stringify({
      bench: "load",
      requests: result.requests.total,
      non2xx: result.non2xx,
      errors,
      p50Ms: result.latency.p50,
      p99Ms: result.latency.p99,
      requestsPerSecond: Math.round(result.requests.average),
      concurrentCommitMs: Math.round(commit.commitMs),
    }),
  );
}

main().catch((err) => {
  console.error(err);
  process.exit(1);
});
