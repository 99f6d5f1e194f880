import { Umzug, SequelizeStorage } from "umzug";
import { createRequire } from "node:module";
import path from "node:path";
import { Sequelize } from "sequelize";
import { sequelize } from "./sequelize";
import { config } from "../config";

const require = createRequire(import.meta.url);

/**
 * Schema changes live only in migrations/*.cjs, written in sequelize-cli's shape
 * (`up(queryInterface, Sequelize)`), so both sequelize-cli and this runner can apply them. The glob
 * takes only the files directly in migrations/: their column kit (migrations/support/) is no migration.
 */
export function createMigrator() {
  return new Umzug({
    migrations: {
      glob: path.join(config.projectRoot, "migrations", "*.cjs").replace(/\\/g, "/"),
      resolve: ({ name, path: file, context }) => {
        const mod = require(file!);
        return {
          name,
          up: async () => mod.up(context, Sequelize),
          down: async () => mod.down(context, Sequelize),
        };
      },
    },
    context: sequelize.getQueryInterface(),
    storage: new SequelizeStorage({ sequelize, tableName: "SequelizeMeta" }),
    logger: undefined,
  });
}

export async function migrateUp(): Promise<string[]> {
  const done = await createMigrator().up();
  return done.map((m) => m.name);
}
