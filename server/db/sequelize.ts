import { Sequelize, Transaction } from "sequelize";
import { config } from "../config";
import { useTransactionContext, watchPool } from "./transaction-context";

// Before the instance: every query inside a transaction runs in it (server/db/transaction-context.ts).
useTransactionContext(Sequelize);

/**
 * The one Sequelize instance. Connections are opened lazily, on the first query.
 *
 * Transactions read committed data: each statement sees what other transactions have committed
 * by then, as the reads that used to run on a connection of their own did, and ordering comes
 * from the explicit row locks (server/db/portfolio-locks.ts, FOR UPDATE / SHARE). Under
 * REPEATABLE READ a read inside a transaction would see the data as of its first read, which was
 * before it waited at a lock for a commit it must see.
 */
export const sequelize = new Sequelize(config.db.name, config.db.user, config.db.password, {
  host: config.db.host,
  port: config.db.port,
  dialect: "mariadb",
  logging: false,
  timezone: "+00:00",
  define: { underscored: true },
  isolationLevel: Transaction.ISOLATION_LEVELS.READ_COMMITTED,
  pool: { max: config.db.pool.max, min: 0, acquire: config.db.pool.acquireMs, idle: 10_000 },
  dialectOptions: { connectTimeout: 5000, bigIntAsNumber: true, decimalAsNumber: false },
});

watchPool(sequelize, config.db.pool);
