import { z } from "zod";
import { existsSync, mkdirSync, readFileSync, writeFileSync } from "node:fs";
import { randomBytes } from "node:crypto";
import os from "node:os";
import path from "node:path";

/** The folder with the project's package.json, found upwards from here (server/ under tsx, dist/server/ when bundled). */
function findProjectRoot(from: string): string {
  for (let dir = from; ; dir = path.dirname(dir)) {
    if (existsSync(path.join(dir, "package.json")) && existsSync(path.join(dir, "migrations"))) return dir;
    if (path.dirname(dir) === dir) return path.resolve(from, "..");
  }
}

/** The only place that reads process.env: parsed once, then frozen. */
const projectRoot = findProjectRoot(import.meta.dirname);
const dataDir = path.join(projectRoot, ".data");

const envSchema = z.object({
  NODE_ENV: z.enum(["development", "production", "test"]).default("development"),
  PORT: z.coerce.number().int().min(0).max(65535).default(3000),
  DB_HOST: z.string().default("127.0.0.1"),
  DB_PORT: z.coerce.number().int().min(1).max(65535).default(3307),
  DB_NAME: z
    .string()
    .regex(/^[A-Za-z0-9_]+$/)
    .default("quartermark"),
  DB_USER: z.string().optional(),
  DB_PASSWORD: z.string().optional(),
  /** Pooled database connections per server process (each transaction holds exactly one). */
  DB_POOL_MAX: z.coerce.number().int().min(1).max(100).default(10),
  /** Pooled connections kept for requests outside a transaction (reads) while writers wait at locks. */
  DB_POOL_READ_RESERVE: z.coerce.number().int().min(0).max(50).default(2),
  /** How long a request waits for a pooled connection before it is told the server is busy (503). */
  DB_POOL_ACQUIRE_MS: z.coerce.number().int().min(100).max(120_000).default(10_000),
  /**
   * How many queries may wait for a connection at once; one more is told at once (503, Retry-After).
   * A screen's read asks for up to seven at once (the analyst's queue), so 50 people at once need
   * 350 places; at 200 the load bench saw a few 503s. A waiter is a promise: 1,000 cost little memory.
   */
  DB_POOL_QUEUE: z.coerce.number().int().min(1).max(10_000).default(1000),
  SMTP_PORT: z.coerce.number().int().min(1).max(65535).default(2525),
  /** Where the local SMTP sink keeps each message as an .eml file; empty: no local sink. */
  MAIL_SINK_DIR: z.string().optional(),
  MAIL_FROM: z
    .string()
    .regex(/^[^@\s]+@[^@\s]+$/, "an e-mail address")
    .default("quartermark@localhost"),
  JWT_SECRET: z.string().min(32, "JWT_SECRET must be at least 32 characters").optional(),
  /** The key that signs the snapshot chain and the audit log (HMAC-SHA256); kept outside the database. */
  CHAIN_KEY: z.string().min(32, "CHAIN_KEY must be at least 32 characters").optional(),
  /** Where the mailer notes each hand-over to the SMTP server (outside the database), read by reconciliation. */
  MAIL_JOURNAL: z.string().optional(),
  DEMO_PASSWORD: z.string().min(8).default("quartermark-demo"),
  COOKIE_SECURE: z.enum(["true", "false"]).optional(),
  LOG_LEVEL: z.enum(["silent", "error", "info"]).default("info"),
  /**
   * Host names this server answers to, comma-separated: "name" (any port) or "name:port".
   * Unset: 127.0.0.1, localhost and [::1] on PORT (and on Vite's 5173 in development; on any port in tests).
   */
  ALLOWED_HOSTS: z.string().optional(),
  /** Proxies allowed to say who the client is (X-Forwarded-For): addresses or subnets, comma-separated. Unset: none. */
  TRUST_PROXY: z.string().optional(),
  /**
   * Sign-in lockout: an account is refused after SIGN_IN_MAX_FAILURES failed attempts within SIGN_IN_WINDOW_MINUTES
   * (until the window ends or an admin unlocks it); one client address after SIGN_IN_MAX_FAILURES_PER_ADDRESS.
   */
  SIGN_IN_MAX_FAILURES: z.coerce.number().int().min(1).max(100).default(5),
  SIGN_IN_WINDOW_MINUTES: z.coerce.number().int().min(1).max(1440).default(15),
  SIGN_IN_MAX_FAILURES_PER_ADDRESS: z.coerce.number().int().min(1).max(10_000).default(30),
  /** The address people open Quartermark at: set-password links in e-mails start with it. */
  PUBLIC_URL: z.url({ protocol: /^https?$/, error: "PUBLIC_URL must be an http(s) address" }).optional(),
  /** How long an invitation or password-reset link works, in hours. */
  INVITATION_TTL_HOURS: z.coerce.number().int().min(1).max(720).default(72),
  /** Large uploads (over 1 MB) checked at once per server process; the next ones wait their turn. */
  UPLOAD_CONCURRENCY: z.coerce.number().int().min(1).max(16).default(1),
  /** Large uploads that may wait for their turn; one more is refused at once (503, Retry-After). */
  UPLOAD_QUEUE: z.coerce.number().int().min(0).max(100).default(4),
  /** How long a large upload waits for its turn before it is refused (503, Retry-After). */
  UPLOAD_QUEUE_WAIT_MS: z.coerce.number().int().min(0).max(600_000).default(60_000),
  /** How long a checked file waits to be committed; after that it must be uploaded again (checked against today). */
  UPLOAD_PREVIEW_TTL_HOURS: z.coerce.number().int().min(1).max(720).default(8),
  /** Server worker processes (node:cluster); WEB_CONCURRENCY is the name many hosts set. Unset: one per core. */
  WORKERS: z.coerce.number().int().min(1).max(64).optional(),
  WEB_CONCURRENCY: z.coerce.number().int().min(1).max(64).optional(),
  /** Threads that hash and check passwords (bcrypt, cost 12), off the event loop. */
  PASSWORD_THREADS: z.coerce.number().int().min(1).max(16).default(2),
  /** Set by the primary for the one worker that runs the filing delivery loop. */
  QM_DELIVERY_WORKER: z.enum(["0", "1"]).optional(),
});

function readDbCredentials(): { user: string; password: string } | null {
  const file = path.join(dataDir, "db-credentials.json");
  if (!existsSync(file)) return null;
  return JSON.parse(readFileSync(file, "utf8"));
}

/** A secret from the environment, else generated once into .data/<file> (mode 0600) and reused. */
function secret(fromEnv: string | undefined, fileName: string): string {
  if (fromEnv) return fromEnv;
  const file = path.join(dataDir, fileName);
  if (existsSync(file)) return readFileSync(file, "utf8").trim();
  const generated = randomBytes(48).toString("base64url");
  mkdirSync(dataDir, { recursive: true });
  try {
    // "wx": of two processes starting at once, one writes and both read the same secret.
    writeFileSync(file, generated, { mode: 0o600, flag: "wx" });
  } catch (err) {
    if ((err as NodeJS.ErrnoException).code !== "EEXIST") throw err;
  }
  return readFileSync(file, "utf8").trim();
}

/** The Host header values (or bare host names, any port) the server answers to. */
function allowedHosts(
  fromEnv: string | undefined,
  nodeEnv: string,
  port: number,
  publicUrl: string | undefined,
): string[] {
  if (fromEnv !== undefined)
    return fromEnv
      .split(",")
      .map((h) => h.trim().toLowerCase())
      .filter(Boolean);
  const names = ["127.0.0.1", "localhost", "[::1]"];
  // Supertest and the browser journeys listen on a free port of their own.
  if (nodeEnv === "test") return names;
  const ports = nodeEnv === "development" ? [port, 5173] : [port];
  const loopback = names.flatMap((name) => ports.map((p) => `${name}:${p}`));
  // The address people open (PUBLIC_URL) is served too, as its Host header names it.
  return publicUrl ? [...loopback, new URL(publicUrl).host.toLowerCase()] : loopback;
}

function loadConfig() {
  const parsed = envSchema.safeParse(process.env);
  if (!parsed.success) {
    const lines = parsed.error.issues.map((i) => `  ${i.path.join(".")}: ${i.message}`).join("\n");
    throw new Error(`Invalid environment:\n${lines}`);
  }
  const env = parsed.data;
  const creds = readDbCredentials();
  return Object.freeze({
    nodeEnv: env.NODE_ENV,
    isProduction: env.NODE_ENV === "production",
    port: env.PORT,
    projectRoot,
    dataDir,
    clientDir: path.join(projectRoot, "dist", "client"),
    db: Object.freeze({
      host: env.DB_HOST,
      port: env.DB_PORT,
      name: env.DB_NAME,
      user: env.DB_USER ?? creds?.user ?? "quartermark",
      password: env.DB_PASSWORD ?? creds?.password ?? "",
      pool: Object.freeze({
        max: env.DB_POOL_MAX,
        readReserve: Math.min(env.DB_POOL_READ_RESERVE, env.DB_POOL_MAX - 1),
        acquireMs: env.DB_POOL_ACQUIRE_MS,
        queue: env.DB_POOL_QUEUE,
      }),
    }),
    smtpPort: env.SMTP_PORT,
    // Unset: .data/mail/ (npm start, npm run dev); set to the empty string: there is no local sink.
    mailSinkDir:
      env.MAIL_SINK_DIR === undefined
        ? path.join(dataDir, "mail")
        : env.MAIL_SINK_DIR
          ? path.resolve(env.MAIL_SINK_DIR)
          : null,
    mailFrom: env.MAIL_FROM,
    jwtSecret: secret(env.JWT_SECRET, "jwt-secret"),
    // Signs the snapshot chain and the audit log: someone who can write to the database cannot
    // recompute a signature without it (server/modules/chain/signing.ts).
    chainKey: secret(env.CHAIN_KEY, "chain-key"),
    mailJournal: env.MAIL_JOURNAL ? path.resolve(env.MAIL_JOURNAL) : path.join(dataDir, "mail-journal.jsonl"),
    demoPassword: env.DEMO_PASSWORD,
    cookieSecure: env.COOKIE_SECURE ? env.COOKIE_SECURE === "true" : env.NODE_ENV === "production",
    logLevel: env.LOG_LEVEL,
    allowedHosts: Object.freeze(allowedHosts(env.ALLOWED_HOSTS, env.NODE_ENV, env.PORT, env.PUBLIC_URL)),
    trustProxy: Object.freeze(
      (env.TRUST_PROXY ?? "")
        .split(",")
        .map((s) => s.trim())
        .filter(Boolean),
    ),
    publicUrl: (env.PUBLIC_URL ?? `http://127.0.0.1:${env.PORT}`).replace(/\/+$/, ""),
    invitationTtlHours: env.INVITATION_TTL_HOURS,
    signIn: Object.freeze({
      windowMs: env.SIGN_IN_WINDOW_MINUTES * 60_000,
      perAccount: env.SIGN_IN_MAX_FAILURES,
      perAddress: env.SIGN_IN_MAX_FAILURES_PER_ADDRESS,
    }),
    uploads: Object.freeze({
      concurrency: env.UPLOAD_CONCURRENCY,
      queue: env.UPLOAD_QUEUE,
      queueWaitMs: env.UPLOAD_QUEUE_WAIT_MS,
      previewTtlHours: env.UPLOAD_PREVIEW_TTL_HOURS,
    }),
    passwordThreads: env.PASSWORD_THREADS,
    workers: env.WORKERS ?? env.WEB_CONCURRENCY ?? os.availableParallelism(),
    /** Whether this process runs the filing delivery loop: the one worker the primary names, or a lone process. */
    runsFilingDelivery: env.QM_DELIVERY_WORKER !== "0",
  });
}

export const config = loadConfig();
export type Config = typeof config;
