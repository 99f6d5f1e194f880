// For sequelize-cli only (e.g. `npx sequelize-cli db:migrate:status`); the product reads server/config.ts.
// sequelize-cli loads this CommonJS file itself and cannot import the TypeScript config, so the
// defaults are repeated here: keep them in line with server/config.ts.
const fs = require("fs");
const path = require("path");
const credsFile = path.resolve(__dirname, "..", "..", ".data", "db-credentials.json");
const creds = fs.existsSync(credsFile) ? JSON.parse(fs.readFileSync(credsFile, "utf8")) : {};
const base = {
  dialect: "mariadb",
  host: process.env.DB_HOST || "127.0.0.1",
  port: Number(process.env.DB_PORT || 3307),
  database: process.env.DB_NAME || "quartermark",
  username: process.env.DB_USER || creds.user || "quartermark",
  password: process.env.DB_PASSWORD || creds.password || "",
};
module.exports = {
  development: base,
  test: { ...base, database: process.env.DB_NAME || "quartermark_test" },
  production: base,
};
