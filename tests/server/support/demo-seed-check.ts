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

const { QueryTypes } = await import("sequelize");
const { sequelize } = await import("../../../server/db/sequelize");
const { computePortfolioFigures } = await import("../../../server/modules/figures/stored-figures");
const { EntityModel } = await import("../../../server/models/entity");
const { PortfolioModel } = await import("../../../server/models/portfolio");

const parts = ["backtest", "rolling", "overview", "start"] as const;
const differences: string[] = [];
let compared = 0;
for (const entity of await EntityModel.findAll({ order: [["code", "ASC"]] })) {
  const portfolios = await PortfolioModel.findAll({ where: { entityId: entity.id }, order: [["code", "ASC"]] });
  for (const p of portfolios) {
    const fresh = JSON.parse(JSON.stringify(await computePortfolioFigures(p, entity, portfolios)));
    const [row] = await sequelize.query<Record<string, string | null>>(
      `SELECT backtest_json AS backtest, rolling_json AS rolling, overview_json AS overview, start_json AS start
         FROM portfolio_figures WHERE portfolio_id = ?`,
      { replacements: [p.id], type: QueryTypes.SELECT },
    );
    for (const part of parts) {
      compared++;
      const stored = row?.[part] ? JSON.parse(row[part]!) : null;
      if (JSON.stringify(stored) !== JSON.stringify(fresh[part] ?? null)) differences.push(`${p.code} ${part}`);
    }
  }
}
await sequelize.query(`DROP DATABASE \`${config.db.name}\``);
await sequelize.close();
await sink.close();
rmSync(mailDir, { recursive: true, force: true });
console.log(JSON.stringify({ seeded: seeded.length, compared, differences }));
process.exit(0);
