import mariadb from "mariadb";
import { config } from "../../../server/config";

/** A database session of its own, outside the application's pool: to hold locks or kill connections from outside. */
export function outsideSession() {
  return mariadb.createConnection({
    host: config.db.host,
    port: config.db.port,
    user: config.db.user,
    password: config.db.password,
    database: config.db.name,
  });
}
