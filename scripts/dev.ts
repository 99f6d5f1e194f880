/**
 * `npm run dev`: the private MariaDB and mail sink as for `npm start`, then the API under
 * `tsx watch` (restarts on change) and the Vite dev server on :5173 with /api proxied to it.
 */
import { spawn, type ChildProcess } from "node:child_process";
import path from "node:path";
import { appCredentials, ensureDatabase, startPrivateDb, stopPrivateDb } from "./lib/mariadb";
import { startMailSink } from "./lib/mail-sink";
import { projectRoot } from "./lib/run";

async function main() {
  const creds = appCredentials();
  const { config } = await import("../server/config");
  const db = await startPrivateDb(config.db.port);
  await ensureDatabase(db, config.db.name, creds);
  // The mail sink first: the demo seed files past quarters with the supervisor by e-mail (none when MAIL_SINK_DIR is empty).
  const mail = config.mailSinkDir ? await startMailSink(config.smtpPort, config.mailSinkDir) : null;
  const { migrateUp } = await import("../server/db/migrator");
  const { seedDemo } = await import("../server/db/seeder");
  await migrateUp();
  await seedDemo();
  const { sequelize } = await import("../server/db/sequelize");
  await sequelize.close();

  const bin = (name: string) => path.join(projectRoot, "node_modules", ".bin", name);
  const children: ChildProcess[] = [
    // Set-password links in e-mails open the page people use in development: Vite's.
    spawn(bin("tsx"), ["watch", "--clear-screen=false", "server/index.ts"], {
      cwd: projectRoot,
      stdio: "inherit",
      env: { ...process.env, PUBLIC_URL: process.env.PUBLIC_URL ?? "http://127.0.0.1:5173" },
    }),
    spawn(bin("vite"), [], { cwd: projectRoot, stdio: "inherit" }),
  ];
  console.log(`\nAPI on http://127.0.0.1:${config.port} · client with hot reload on http://127.0.0.1:5173\n`);

  const shutdown = async () => {
    for (const c of children) c.kill("SIGTERM");
    await mail?.close();
    if (db.startedHere) await stopPrivateDb(config.db.port);
    process.exit(0);
  };
  process.once("SIGINT", shutdown);
  process.once("SIGTERM", shutdown);
}

main().catch((err) => {
  console.error(`[dev] ${err instanceof Error ? err.message : String(err)}`);
  process.exit(1);
});
