import { spawn, execFileSync } from "node:child_process";
import { existsSync, mkdirSync, readFileSync, rmSync, writeFileSync, openSync } from "node:fs";
import { randomBytes } from "node:crypto";
import net from "node:net";
import path from "node:path";
import mariadb from "mariadb";
import { ensureSystemPackages, MARIADB } from "./system-packages";

/**
 * The project's private MariaDB: its own data directory under .data/, bound to 127.0.0.1 on
 * DB_PORT, with its own socket and pid file. Nothing here touches a system-wide instance.
 */
export interface PrivateDb {
  dataDir: string;
  port: number;
  socket: string;
  pidFile: string;
  /** True when this process started mariadbd (and so should stop it). */
  startedHere: boolean;
}

export interface DbCredentials {
  user: string;
  password: string;
}

const projectRoot = path.resolve(import.meta.dirname, "..", "..");
export const dataRoot = path.join(projectRoot, ".data");

function dirs(port: number) {
  const dataDir = path.join(dataRoot, "mariadb");
  return {
    dataDir,
    socket: path.join(dataRoot, `mysqld-${port}.sock`),
    pidFile: path.join(dataRoot, `mysqld-${port}.pid`),
    logFile: path.join(dataRoot, "mariadb.log"),
  };
}

function isAlive(pid: number): boolean {
  try {
    process.kill(pid, 0);
    return true;
  } catch {
    return false;
  }
}

function readPid(pidFile: string): number | null {
  if (!existsSync(pidFile)) return null;
  const pid = Number(readFileSync(pidFile, "utf8").trim());
  return Number.isInteger(pid) && pid > 0 ? pid : null;
}

function portInUse(port: number): Promise<boolean> {
  return new Promise((resolve) => {
    const srv = net.createServer();
    srv.once("error", () => resolve(true));
    srv.once("listening", () => srv.close(() => resolve(false)));
    srv.listen(port, "127.0.0.1");
  });
}

async function rootConnection(socket: string) {
  return mariadb.createConnection({ socketPath: socket, user: "root", connectTimeout: 2000 });
}

async function waitUntilAnswering(socket: string, pid: number, logFile: string, timeoutMs = 60_000): Promise<void> {
  const deadline = Date.now() + timeoutMs;
  let lastError: unknown;
  while (Date.now() < deadline) {
    if (!isAlive(pid)) {
      const tail = existsSync(logFile) ? readFileSync(logFile, "utf8").split("\n").slice(-15).join("\n") : "";
      throw new Error(`mariadbd exited during start-up. Last lines of ${logFile}:\n${tail}`);
    }
    try {
      const conn = await rootConnection(socket);
      await conn.query("SELECT 1");
      await conn.end();
      return;
    } catch (err) {
      lastError = err;
      await new Promise((r) => setTimeout(r, 250));
    }
  }
  throw new Error(`mariadbd did not answer on ${socket} within ${timeoutMs / 1000} s: ${String(lastError)}`);
}

/** Starts the private instance, or reuses the one already running from this data directory. */
export async function startPrivateDb(port: number): Promise<PrivateDb> {
  ensureSystemPackages([MARIADB]);
  const { dataDir, socket, pidFile, logFile } = dirs(port);
  mkdirSync(dataRoot, { recursive: true });

  const existing = readPid(pidFile);
  if (existing && isAlive(existing)) {
    await waitUntilAnswering(socket, existing, logFile, 15_000);
    return { dataDir, port, socket, pidFile, startedHere: false };
  }
  if (existing) {
    console.log(`[db] removing stale pid file ${pidFile} (process ${existing} is gone)`);
    rmSync(pidFile, { force: true });
  }
  rmSync(socket, { force: true });

  if (await portInUse(port)) {
    throw new Error(
      `Port ${port} on 127.0.0.1 is already in use by another program, so the private MariaDB cannot start.\n` +
        `Stop that program, or choose another port: DB_PORT=3308 npm start`,
    );
  }

  if (!existsSync(path.join(dataDir, "mysql"))) {
    console.log(`[db] initialising a private data directory in ${dataDir}`);
    mkdirSync(dataDir, { recursive: true });
    execFileSync(
      "mariadb-install-db",
      [
        "--no-defaults",
        `--datadir=${dataDir}`,
        "--auth-root-authentication-method=normal",
        "--skip-test-db",
        "--user=root",
      ],
      { stdio: ["ignore", "ignore", "inherit"] },
    );
  }

  const log = openSync(logFile, "a");
  const child = spawn(
    "/usr/sbin/mariadbd",
    [
      "--no-defaults",
      `--datadir=${dataDir}`,
      "--bind-address=127.0.0.1",
      `--port=${port}`,
      `--socket=${socket}`,
      `--pid-file=${pidFile}`,
      "--user=root",
      "--skip-name-resolve",
      `--log-error=${logFile}`,
      "--innodb-buffer-pool-size=1G",
      // A larger redo log lets a 100,000-row commit run without stalling on checkpoints.
      "--innodb-log-file-size=512M",
      "--innodb-log-buffer-size=64M",
      "--max-connections=200",
      "--max-allowed-packet=128M",
      "--local-infile=1",
      "--character-set-server=utf8mb4",
      "--collation-server=utf8mb4_unicode_ci",
    ],
    { detached: true, stdio: ["ignore", log, log] },
  );
  child.unref();
  if (!child.pid) throw new Error("Could not start mariadbd");
  await waitUntilAnswering(socket, child.pid, logFile);
  return { dataDir, port, socket, pidFile, startedHere: true };
}

/** The application user's generated password, kept under .data/ so a second run reuses it. */
export function appCredentials(): DbCredentials {
  const file = path.join(dataRoot, "db-credentials.json");
  if (existsSync(file)) return JSON.parse(readFileSync(file, "utf8")) as DbCredentials;
  const creds = { user: "quartermark", password: randomBytes(18).toString("base64url") };
  mkdirSync(dataRoot, { recursive: true });
  writeFileSync(file, JSON.stringify(creds, null, 2), { mode: 0o600 });
  return creds;
}

function quoteIdent(name: string): string {
  if (!/^[A-Za-z0-9_]+$/.test(name)) throw new Error(`Unsafe database name: ${name}`);
  return `\`${name}\``;
}

/** Creates the database (optionally from empty) and grants the application user on it. */
export async function ensureDatabase(
  db: PrivateDb,
  name: string,
  creds: DbCredentials,
  opts: { fresh?: boolean } = {},
) {
  const conn = await rootConnection(db.socket);
  try {
    if (opts.fresh) await conn.query(`DROP DATABASE IF EXISTS ${quoteIdent(name)}`);
    await conn.query(
      `CREATE DATABASE IF NOT EXISTS ${quoteIdent(name)} CHARACTER SET utf8mb4 COLLATE utf8mb4_unicode_ci`,
    );
    await conn.query(`CREATE USER IF NOT EXISTS ?@'127.0.0.1' IDENTIFIED BY ?`, [creds.user, creds.password]);
    await conn.query(`ALTER USER ?@'127.0.0.1' IDENTIFIED BY ?`, [creds.user, creds.password]);
    await conn.query(`GRANT ALL PRIVILEGES ON ${quoteIdent(name)}.* TO ?@'127.0.0.1'`, [creds.user]);
    await conn.query(`GRANT FILE ON *.* TO ?@'127.0.0.1'`, [creds.user]);
    await conn.query("FLUSH PRIVILEGES");
  } finally {
    await conn.end();
  }
}

/** Stops the instance by the pid in its pid file and waits until it is gone. */
export async function stopPrivateDb(port: number): Promise<boolean> {
  const { pidFile } = dirs(port);
  const pid = readPid(pidFile);
  if (!pid || !isAlive(pid)) return false;
  process.kill(pid, "SIGTERM");
  const deadline = Date.now() + 30_000;
  while (isAlive(pid) && Date.now() < deadline) await new Promise((r) => setTimeout(r, 200));
  if (isAlive(pid)) process.kill(pid, "SIGKILL");
  return true;
}
