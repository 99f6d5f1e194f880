/**
 * The real server entry (server/index.ts: the cluster primary and its workers) in a process of its
 * own on a free loopback port, on the test database; its output is kept for the test to read.
 */
import { spawn, type ChildProcess } from "node:child_process";
import path from "node:path";
import { freePort } from "./free-port";

const root = path.resolve(import.meta.dirname, "..", "..", "..");

export interface ServerProcess {
  base: string;
  child: ChildProcess;
  output: () => string;
  /** Resolves when the output matches, or rejects after `ms`. */
  waitFor: (pattern: RegExp, ms?: number) => Promise<RegExpMatchArray>;
  stop: () => Promise<void>;
}

export async function startServerProcess(workers: number): Promise<ServerProcess> {
  const port = await freePort();
  const child = spawn(process.execPath, ["--import", "tsx", path.join(root, "server", "index.ts")], {
    cwd: root,
    env: { ...process.env, PORT: String(port), WORKERS: String(workers), LOG_LEVEL: "info", MAIL_SINK_DIR: "" },
    stdio: ["ignore", "pipe", "pipe"],
  });
  let out = "";
  const listeners = new Set<() => void>();
  const onData = (chunk: Buffer) => {
    out += chunk.toString();
    for (const l of listeners) l();
  };
  child.stdout!.on("data", onData);
  child.stderr!.on("data", onData);
  const waitFor = (pattern: RegExp, ms = 90_000) =>
    new Promise<RegExpMatchArray>((resolve, reject) => {
      const check = () => {
        const m = out.match(pattern);
        if (m) {
          listeners.delete(check);
          clearTimeout(timer);
          resolve(m);
        }
      };
      const timer = setTimeout(() => {
        listeners.delete(check);
        reject(new Error(`no ${pattern} in the server's output within ${ms} ms:\n${out}`));
      }, ms);
      listeners.add(check);
      check();
    });
  await waitFor(/listening on http/);
  return {
    base: `http://127.0.0.1:${port}`,
    child,
    output: () => out,
    waitFor,
    stop: () =>
      new Promise<void>((resolve) => {
        if (child.exitCode !== null) return resolve();
        child.once("exit", () => resolve());
        child.kill("SIGTERM");
      }),
  };
}
