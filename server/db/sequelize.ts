import { Sequelize } from "sequelize";
import { config } from "../config";

/** The one Sequelize instance. Connections are opened lazily, on the first query. */
export const sequelize = new Sequelize(config.db.name, config.db.user, config.db.password, {
  host: config.db.host,
  port: config.db.port,
  dialect: "mariadb",
  logging: false,
  timezone: "+00:00",
  define: { underscored: true },
  pool: { max: 10, min: 0, acquire: 10_000, idle: 10_000 },
  dialectOptions: { connectTimeout: 5000, permitLocalInfile: true, bigIntAsNumber: true, decimalAsNumber: false },
});
