/**
 * The load bench's own database: a fresh one on the private MariaDB with the Larkspur demo seeded
 * (its four entities, three years each, signed-off and filed quarters) and 20 more entities made
 * by the same demo generator (three years each, one top-of-house book), brought in through the
 * upload service as an analyst would. A local mail sink on a free port takes the demo filings.
 */
import { mkdtempSync } from "node:fs";
import os from "node:os";
import path from "node:path";
import { startMailSink } from "../../scripts/lib/mail-sink";
import { stopPrivateDb, type PrivateDb } from "../../scripts/lib/mariadb";
import { migratedFreshDatabase } from "./bench-server";

export interface LoadDatabase {
  name: string;
  db: PrivateDb;
  /** Portfolio codes of every entity's top-of-house book, and the entity codes. */
  portfolios: string[];
  entities: string[];
  /** The demo's snapshots (every quarter it signed off or left in draft). */
  snapshotIds: number[];
  /** Entities alike but for the years of history they hold (not in the lists above). */
  histories: { years: number; entity: string; portfolio: string }[];
  stop: () => Promise<void>;
}

const REGIMES = ["eu", "us", "basel"] as const;

export async function prepareLoadDatabase(
  name: string,
  generated = 20,
  historyYears: readonly number[] = [1, 6],
): Promise<LoadDatabase> {
  const mailDir = mkdtempSync(path.join(os.tmpdir(), "qm-load-mail-"));
  const sink = await startMailSink(0, mailDir);
  process.env.SMTP_PORT = String(sink.port);
  process.env.MAIL_SINK_DIR = mailDir;
  const { db, config } = await migratedFreshDatabase(name);
  const { seedDemo } = await import("../../server/db/seeder");
  const { sequelize } = await import("../../server/db/sequelize");
  await seedDemo();

  const { EntityModel } = await import("../../server/models/entity");
  const { PortfolioModel } = await import("../../server/models/portfolio");
  const { UserModel } = await import("../../server/models/user");
  const { toSessionUser } = await import("../../server/modules/auth/auth.service");
  const { previewUpload } = await import("../../server/modules/uploads/uploads.service");
  const { commitUpload } = await import("../../server/modules/uploads/upload-commit");
  const { serialiseObservationCsv } = await import("../../shared/ingest/parse-csv");
  const { generatePortfolioRows } = await import("../../seeders/demo/daily-data");
  const { demoDates } = await import("../../seeders/demo/scenario");

  const analyst = await UserModel.findOne({ where: { email: "analyst@larkspur.test" } });
  if (!analyst) throw new Error("the demo seed left no analyst");
  const actor = { user: toSessionUser(analyst), ip: "127.0.0.1", requestId: "load-bench" };
  const dates = demoDates(new Date().toISOString().slice(0, 10), new Set(), 3);
  async function addEntity(code: string, name: string, regime: (typeof REGIMES)[number], rows: string): Promise<void> {
    const entity = await EntityModel.create({
      code,
      name,
      regime,
      pnlBasis: "max",
      currency: "EUR",
      supervisorName: null,
      supervisorEmails: [],
    });
    await PortfolioModel.create({ entityId: entity.id, code: `${code}-TOTAL`, name: `${code} total`, level: "top" });
    const preview = await previewUpload({ originalName: `${code.toLowerCase()}.csv`, bytes: Buffer.from(rows) }, actor);
    if (preview.invalid > 0) throw new Error(`generated data for ${code} failed its checks`);
    await commitUpload(preview.id, actor);
  }

  for (let i = 1; i <= generated; i++) {
    const code = `GEN-${String(i).padStart(2, "0")}`;
    await addEntity(
      code,
      `Generated entity ${i}`,
      REGIMES[i % REGIMES.length],
      serialiseObservationCsv(
        generatePortfolioRows(
          // Some books go through a stress episode, so the counts spread over the zones.
          {
            code: `${code}-TOTAL`,
            seed: 9000 + i,
            dailyVol: 1_000_000 + 50_000 * i,
            stress: i % 3 === 0 ? { startsDaysBeforeEnd: 60 + i, days: 15, factor: 3.5 } : undefined,
          },
          dates,
        ),
      ),
    );
  }
  const tops = (await PortfolioModel.findAll({ where: { level: "top" }, order: [["code", "ASC"]] })).map((p) => p.code);
  const entities = (await EntityModel.findAll({ order: [["code", "ASC"]] })).map((e) => e.code);
  const snapshotIds = ((await sequelize.query("SELECT id FROM snapshots ORDER BY id"))[0] as { id: number }[]).map(
    (r) => Number(r.id),
  );

  // The same book over more or fewer years: the same seed, so the recent days are alike and only
  // the length of the history differs (what the read cost must not follow).
  const histories: LoadDatabase["histories"] = [];
  for (const years of historyYears) {
    const code = `YRS-${years}`;
    const span = demoDates(new Date().toISOString().slice(0, 10), new Set(), years);
    const rows = generatePortfolioRows({ code: `${code}-TOTAL`, seed: 7000, dailyVol: 1_000_000 }, span);
    await addEntity(code, `History of ${years} years`, "eu", serialiseObservationCsv(rows));
    histories.push({ years, entity: code, portfolio: `${code}-TOTAL` });
  }
  await sequelize.close();
  await sink.close();
  return {
    name,
    db,
    portfolios: tops,
    entities,
    histories,
    snapshotIds,
    stop: async () => {
      if (db.startedHere) await stopPrivateDb(config.db.port);
    },
  };
}
