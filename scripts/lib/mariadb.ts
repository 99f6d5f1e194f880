import { spawn, execFileSync } from "node:child_process";
import { existsSync, mkdirSync, readFileSync, rmSync, statSync, writeFileSync, openSync } from "node:fs";
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

/**
 * Where the instance keeps its files. `run/` (socket, pid file, log) and `files/` (the only folder
 * LOAD DATA INFILE / SELECT … INTO OUTFILE may touch: secure_file_priv) belong to the account
 * mariadbd runs as; the rest of .data/ (secrets) stays the starting user's.
 */
function dirs(port: number) {
  const dataDir = path.join(dataRoot, "mariadb");
  const runDir = path.join(dataRoot, "mariadb-run");
  return {
    dataDir,
    runDir,
    filesDir: path.join(runDir, "files"),
    socket: path.join(runDir, `mysqld-${port}.sock`),
    pidFile: path.join(runDir, `mysqld-${port}.pid`),
    logFile: path.join(runDir, "mariadb.log"),
  };
}

/**
 * The account mariadbd runs as. Started by root, it is Debian's `mysql` account (made by the
 * mariadb-server package) and owns the data, run and files folders; started by anyone else, it is
 * that user. mariadbd refuses to run as root without being told to, and is never told to here.
 */
function serverAccount(): { user: string; uid: number; gid: number } | null {
  if (process.getuid?.() !== 0) return null;
  const line = readFileSync("/etc/passwd", "utf8")
    .split("\n")
    .find((l) => l.startsWith("mysql:"));
  if (!line) {
    throw new Error(
      "MariaDB would have to run as root: the 'mysql' account that Debian's mariadb-server package makes is missing.",
    );
  }
  const [, , uid, gid] = line.split(":");
  return { user: "mysql", uid: Number(uid), gid: Number(gid) };
}

/**
 * The mysql account must be able to walk to .data/: a checkout inside a folder only root may enter
 * (/root is 0700) leaves no choice but to run mariadbd as root, which is said in the log and in
 * .data/mariadb-run/account (tests/server/database-privileges.test.ts reads it).
 */
function reachableAccount<T extends { user: string }>(account: T | null, dir: string): T | null {
  const note = path.join(dataRoot, "mariadb-run", "account");
  mkdirSync(path.dirname(note), { recursive: true });
  if (!account) {
    writeFileSync(note, `${process.env.USER ?? "the starting user"}\n`);
    return null;
  }
  try {
    execFileSync("runuser", ["-u", account.user, "--", "test", "-x", dir], { stdio: "ignore" });
    writeFileSync(note, `${account.user}\n`);
    return account;
  } catch {
    const why = `the ${account.user} account cannot enter ${dir} (a folder on its path is closed to it)`;
    console.warn(`[db] running mariadbd as root: ${why}; move the checkout to run it as ${account.user}`);
    writeFileSync(note, `root\n${why}\n`);
    return null;
  }
}

/** Hands a folder tree to the server's account (once: skipped when it already owns the top). */
function handOver(dir: string, account: { uid: number; gid: number } | null): void {
  mkdirSync(dir, { recursive: true });
  if (!account) return;
  if (statSync(dir).uid === account.uid) return;
  execFileSync("chown", ["-R", `${account.uid}:${account.gid}`, dir]);
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

/**
 * An instance started by an older checkout (as root, pid file directly in .data/) is stopped so
 * that it starts again under its own account with the settings above.
 */
async function stopLegacyInstance(port: number): Promise<void> {
  const legacyPid = path.join(dataRoot, `mysqld-${port}.pid`);
  const pid = readPid(legacyPid);
  if (pid && isAlive(pid)) {
    console.log(`[db] stopping the instance an older set-up started as root (process ${pid})`);
    process.kill(pid, "SIGTERM");
    const deadline = Date.now() + 30_000;
    while (isAlive(pid) && Date.now() < deadline) await new Promise((r) => setTimeout(r, 200));
  }
  rmSync(legacyPid, { force: true });
  rmSync(path.join(dataRoot, `mysqld-${port}.sock`), { force: true });
}

/** Starts the private instance, or reuses the one already running from this data directory. */
export async function startPrivateDb(port: number): Promise<PrivateDb> {
  ensureSystemPackages([MARIADB]);
  const { dataDir, runDir, filesDir, socket, pidFile, logFile } = dirs(port);
  mkdirSync(dataRoot, { recursive: true });
  const account = reachableAccount(serverAccount(), dataRoot);
  await stopLegacyInstance(port);

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

  handOver(runDir, account);
  handOver(filesDir, account);
  handOver(dataDir, account);
  // mariadbd started by root needs --user; root only where the mysql account cannot reach .data/.
  const runAs = account ? [`--user=${account.user}`] : process.getuid?.() === 0 ? ["--user=root"] : [];
  if (!existsSync(path.join(dataDir, "mysql"))) {
    console.log(`[db] initialising a private data directory in ${dataDir}`);
    execFileSync(
      "mariadb-install-db",
      ["--no-defaults", `--datadir=${dataDir}`, "--auth-root-authentication-method=normal", "--skip-test-db", ...runAs],
      { stdio: ["ignore", "ignore", "inherit"] },
    );
  }

  const log = openSync(logFile, "a");
  // mariadbd writes its own error log here too (--log-error), as its own account.
  if (account) execFileSync("chown", [`${account.uid}:${account.gid}`, logFile]);
  const child = spawn(
    "/usr/sbin/mariadbd",
    [
      "--no-defaults",
      `--datadir=${dataDir}`,
      "--bind-address=127.0.0.1",
      `--port=${port}`,
      `--socket=${socket}`,
      `--pid-file=${pidFile}`,
      ...runAs,
      // Server-side file import and export only inside an empty folder of its own.
      `--secure-file-priv=${filesDir}`,
      "--skip-name-resolve",
      `--log-error=${logFile}`,
      "--innodb-buffer-pool-size=1G",
      // A larger redo log lets a 100,000-row commit run without stalling on checkpoints.
      "--innodb-log-file-size=512M",
      "--innodb-log-buffer-size=64M",
      "--max-connections=200",
      "--max-allowed-packet=128M",
      // For bench/ingest.bench.ts's comparison only; the application's connections do not allow it.
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
    // No FILE privilege: the application never reads or writes the server's files (uploads are
    // multi-row INSERTs). Taken back from set-ups made before it was dropped.
    const grants: Record<string, string>[] = await conn.query(`SHOW GRANTS FOR ?@'127.0.0.1'`, [creds.user]);
    if (grants.some((g) => /GRANT (.*\b)?FILE\b.* ON \*\.\*/.test(Object.values(g)[0])))
      await conn.query(`REVOKE FILE ON *.* FROM ?@'127.0.0.1'`, [creds.user]);
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
