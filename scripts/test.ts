/**
 * `npm test`: lint and type-check, build the client, start the private MariaDB with its own
 * freshly migrated test database, run every Vitest project (engine, API, components, browser),
 * and close with one plain line of counts.
 */
import { existsSync, readFileSync, rmSync } from "node:fs";
import path from "node:path";
import { startMailSink } from "./lib/mail-sink";
import { appCredentials, ensureDatabase, startPrivateDb, stopPrivateDb } from "./lib/mariadb";
import { CHROMIUM, ensureSystemPackages, MARIADB, POPPLER } from "./lib/system-packages";
import { projectRoot, runBin } from "./lib/run";

const FONTS = {
  name: "fonts-dejavu-core",
  provides: ["/usr/share/fonts/truetype/dejavu/DejaVuSans.ttf"],
  why: "text in browser screenshots",
};

async function main(): Promise<number> {
  ensureSystemPackages([MARIADB, CHROMIUM, POPPLER, FONTS]);
  const extraArgs = process.argv.slice(2);
  const quick = extraArgs.includes("--no-checks");
  const vitestArgs = extraArgs.filter((a) => a !== "--no-checks");

  let failedChecks = 0;
  if (!quick) {
    // Lint and type-check each keep one core busy: side by side they take the time of the longer one.
    console.log("\n[test] lint and type-check");
    const [lint, types] = await Promise.all([
      runBin("eslint", [".", "--max-warnings=0"]),
      runBin("tsc", ["--noEmit", "-p", "tsconfig.json"]),
    ]);
    if (lint !== 0) console.log("[test] lint failed: see above");
    if (types !== 0) console.log("[test] type-check failed: see above");
    failedChecks += (lint !== 0 ? 1 : 0) + (types !== 0 ? 1 : 0);
    console.log("\n[test] client build");
    if ((await runBin("vite", ["build", "--logLevel", "warn"])) !== 0) failedChecks++;
  }

  // The test database is separate from the demo one and migrated from empty on every run.
  process.env.DB_NAME = process.env.DB_NAME_TEST ?? "quartermark_test";
  const creds = appCredentials();
  const { config } = await import("../server/config");
  const db = await startPrivateDb(config.db.port);
  let exitCode: number;
  try {
    await ensureDatabase(db, config.db.name, creds, { fresh: true });
    const { migrateUp } = await import("../server/db/migrator");
    const { sequelize } = await import("../server/db/sequelize");
    await migrateUp();
    await sequelize.close();

    const resultsFile = path.join(projectRoot, ".data", "test-results.json");
    rmSync(resultsFile, { force: true });
    // A mail sink of the run's own, on a free port: the tests read what the product sent from its folder.
    const mailDir = path.join(projectRoot, ".data", "mail-test");
    rmSync(mailDir, { recursive: true, force: true });
    const sink = await startMailSink(0, mailDir);
    console.log("\n[test] vitest");
    const vitestExit = await runBin(
      "vitest",
      ["run", "--reporter=default", "--reporter=json", `--outputFile.json=${resultsFile}`, ...vitestArgs],
      {
        ...process.env,
        NODE_ENV: "test",
        LOG_LEVEL: "error",
        DB_NAME: config.db.name,
        SMTP_PORT: String(sink.port),
        MAIL_SINK_DIR: mailDir,
      },
    ).finally(() => sink.close());

    let passed = 0;
    let failed = 0;
    let skipped = 0;
    if (existsSync(resultsFile)) {
      const r = JSON.parse(readFileSync(resultsFile, "utf8"));
      passed = r.numPassedTests ?? 0;
      // A file that fails to load has no failed test of its own: count it once.
      failed = (r.numFailedTests ?? 0) || (r.numFailedTestSuites ?? 0);
      skipped = (r.numPendingTests ?? 0) + (r.numTodoTests ?? 0);
    } else {
      failed = 1;
    }
    if (failedChecks)
      console.log(`\n[test] ${failedChecks} check(s) failed before the tests (lint, type-check or build): see above.`);
    console.log(`\ntests: ${passed} passed, ${failed + failedChecks} failed, ${skipped} skipped`);
    exitCode = vitestExit !== 0 || failed > 0 || failedChecks > 0 || passed === 0 ? 1 : 0;
  } finally {
    if (db.startedHere) await stopPrivateDb(config.db.port);
  }
  return exitCode;
}

main().then(
  (code) => process.exit(code),
  (err) => {
    console.error(`\n[test] ${err instanceof Error ? err.stack : String(err)}`);
    process.exit(1);
  },
);
