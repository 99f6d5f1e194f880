import { Umzug, SequelizeStorage } from "umzug";
import path from "node:path";
import { pathToFileURL } from "node:url";
import { sequelize } from "./sequelize";
import { config } from "../config";

/** Demo data lives in seeders/*.ts; each runs once (recorded in SequelizeData), never in production. */
export function createSeeder() {
  return new Umzug({
    migrations: {
      glob: path.join(config.projectRoot, "seeders", "*.ts").replace(/\\/g, "/"),
      resolve: ({ name, path: file }) => ({
        name,
        up: async () => (await import(pathToFileURL(file!).href)).up(),
        down: async () => (await import(pathToFileURL(file!).href)).down?.(),
      }),
    },
    // Its own model name too: two storages under one model name would read each other's table.
    storage: new SequelizeStorage({ sequelize, modelName: "SequelizeData", tableName: "SequelizeData" }),
    logger: undefined,
  });
}

export async function seedDemo(): Promise<string[]> {
  if (config.isProduction) return [];
  const done = await createSeeder().up();
  return done.map((s) => s.name);
}
