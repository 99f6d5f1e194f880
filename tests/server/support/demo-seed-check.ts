/**
 * Run by tests/server/demo-seed.test.ts in a process of its own (the server's database is chosen
 * when its modules load): seeds the Larkspur demo into a fresh database of its own on the private
 * MariaDB, with a mail sink of its own, then prints one JSON line comparing every stored figure with
 * a fresh computation from the seeded data.
 */
import { mkdtempSync, rmSync } from "node:fs";
import os from "node:os";
import path from "node:path";
import { startMailSink } from "../../../scripts/lib/mail-sink";
import { appCredentials, ensureDatabase, startPrivateDb } from "../../../scripts/lib/mariadb";

const mailDir = mkdtempSync(path.join(os.tmpdir(), "quartermark-demo-mail-"));
const sink = await startMailSink(0, mailDir);
process.env.SMTP_PORT = String(sink.port);
process.env.MAIL_SINK_DIR = mailDir;
const { config } = await import("../../../server/config");
const db = await startPrivateDb(config.db.port);
await ensureDatabase(db, config.db.name, appCredentials(), { fresh: true });
const { migrateUp } = await import("../../../server/db/migrator");
await migrateUp();
const { seedDemo } = await import("../../../server/db/seeder");
const seeded = await seedDemo();

const { sequelize } = await import("../../../server/db/sequelize");
const { EntityModel } = await import("../../../server/models/entity");
const { storedAndFresh } = await import("./stored-and-fresh");

const parts = ["asOf", "backtest", "rolling", "overview", "start"] as const;
const differences: string[] = [];
let compared = 0;
for (const entity of await EntityModel.findAll({ order: [["code", "ASC"]] })) {
  for (const { portfolio, stored, fresh } of await storedAndFresh(entity.id)) {
    for (const part of parts) {
      compared++;
      if (JSON.stringify(stored?.[part]) !== JSON.stringify(fresh[part])) differences.push(`${portfolio.code} ${part}`);
    }
  }
}
await sequelize.query(`DROP DATABASE \`${config.db.name}\``);
await sequelize.close();
await sink.close();
rmSync(mailDir, { recursive: true, force: true });
console.log(JSON.stringify({ seeded: seeded.length, compared, differences }));
process.exit(0);
