/**
 * `npm start`: private MariaDB up → migrations → demo seed (once) → client build → mail sink →
 * WORKERS server processes (server/cluster.ts) serving API and client on http://127.0.0.1:PORT.
 */
import path from "node:path";
import { appCredentials, ensureDatabase, startPrivateDb, stopPrivateDb } from "./lib/mariadb";
import { startMailSink } from "./lib/mail-sink";
import { runBin } from "./lib/run";

async function main() {
  const creds = appCredentials();
  const { config } = await import("../server/config");
  console.log(`[db] starting the private MariaDB on 127.0.0.1:${config.db.port}…`);
  const db = await startPrivateDb(config.db.port);
  await ensureDatabase(db, config.db.name, creds);

  // The mail sink first: the demo seed files past quarters with the supervisor by e-mail.
  // MAIL_SINK_DIR set empty: no local sink; mail goes to whatever SMTP server listens on SMTP_PORT.
  const mail = config.mailSinkDir ? await startMailSink(config.smtpPort, config.mailSinkDir) : null;

  const { migrateUp } = await import("../server/db/migrator");
  const { seedDemo } = await import("../server/db/seeder");
  const migrated = await migrateUp();
  console.log(`[db] migrations: ${migrated.length ? migrated.join(", ") : "up to date"}`);
  const seeded = await seedDemo();
  if (seeded.length) console.log(`[db] demo data seeded: ${seeded.join(", ")}`);

  console.log("[client] building…");
  if ((await runBin("vite", ["build", "--logLevel", "warn"])) !== 0) throw new Error("The client build failed.");

  // The server runs as WORKERS processes (default: one per core) on the one port; a worker that dies is replaced.
  const { superviseWorkers } = await import("../server/cluster");
  const supervisor = await superviseWorkers(config.workers, path.join(config.projectRoot, "server", "index.ts"));

  const { DEMO_USERS } = await import("../seeders/20261201-0001-larkspur-foundation");
  console.log(
    `\nQuartermark is running on http://127.0.0.1:${config.port} (${config.workers} server processes; WORKERS sets the count)`,
  );
  console.log(
    mail && config.mailSinkDir
      ? `Mail sink on 127.0.0.1:${mail.port} (messages kept in ${path.relative(process.cwd(), config.mailSinkDir) || "."}/${config.isProduction ? "" : ", shown under Admin › Outbox"})`
      : `No local mail sink (MAIL_SINK_DIR is empty): mail goes to the SMTP server on 127.0.0.1:${config.smtpPort}`,
  );
  if (!config.isProduction) {
    console.log(
      `\nDemo sign-ins (password: ${config.demoPassword === "quartermark-demo" ? "quartermark-demo" : "$DEMO_PASSWORD"}):`,
    );
    for (const u of DEMO_USERS) console.log(`  ${u.role.padEnd(10)} ${u.email}`);
  }
  console.log("\nPress Ctrl+C to stop.");

  const shutdown = async () => {
    await supervisor.stop();
    await mail?.close();
    const { sequelize } = await import("../server/db/sequelize");
    await sequelize.close();
    if (db.startedHere) await stopPrivateDb(config.db.port);
    process.exit(0);
  };
  process.once("SIGINT", shutdown);
  process.once("SIGTERM", shutdown);
}

main().catch((err) => {
  console.error(`\n[start] ${err instanceof Error ? err.message : String(err)}`);
  process.exit(1);
});
