/** `npm run db:start | db:stop | db:migrate` — the private MariaDB by hand. */
import { appCredentials, ensureDatabase, startPrivateDb, stopPrivateDb } from "./lib/mariadb";

async function main(command: string | undefined) {
  const creds = appCredentials();
  const { config } = await import("../server/config");
  if (command === "start" || command === "migrate") {
    const db = await startPrivateDb(config.db.port);
    await ensureDatabase(db, config.db.name, creds);
    console.log(`MariaDB answers on 127.0.0.1:${config.db.port} (data in ${db.dataDir})`);
    if (command === "migrate") {
      const { migrateUp } = await import("../server/db/migrator");
      const done = await migrateUp();
      console.log(`migrations: ${done.length ? done.join(", ") : "up to date"}`);
      const { sequelize } = await import("../server/db/sequelize");
      await sequelize.close();
    }
  } else if (command === "stop") {
    console.log((await stopPrivateDb(config.db.port)) ? "MariaDB stopped." : "MariaDB was not running.");
  } else {
    throw new Error("usage: db-cli start | stop | migrate");
  }
}

main(process.argv[2]).catch((err) => {
  console.error(err instanceof Error ? err.message : String(err));
  process.exit(1);
});
