/**
 * Several server processes on the one port (node:cluster): the primary forks the workers, hands
 * them the listening socket, and starts a new worker whenever one dies (the crash is logged with
 * the exit code or signal). The workers keep no state that another could contradict: every
 * figure, session and sign-in count is in MariaDB; what is per process, and why that is safe, is in
 * the README ("Several processes, and past one machine").
 */
import cluster, { type Worker } from "node:cluster";
import { config } from "./config";
import { logger } from "./logger";

export interface Supervisor {
  /** Pids of the live workers. */
  pids(): number[];
  /** Stops every worker (SIGTERM, then waits for them to exit); none is restarted. */
  stop(): Promise<void>;
}

/** Crashes within this span count towards the back-off, so a worker that cannot start does not spin. */
const CRASH_SPAN_MS = 10_000;

/**
 * Forks `count` workers running `exec` (default: this same script) and resolves once all listen.
 * Slot 0 runs the filing delivery loop (one loop for the whole server, in whichever process holds
 * slot 0 now).
 */
export function superviseWorkers(count = config.workers, exec?: string): Promise<Supervisor> {
  if (exec) cluster.setupPrimary({ exec });
  let stopping = false;
  const slots = new Map<Worker, number>();
  const crashes: number[] = [];

  const fork = (slot: number): Worker => {
    const worker = cluster.fork({ QM_DELIVERY_WORKER: slot === 0 ? "1" : "0" });
    slots.set(worker, slot);
    return worker;
  };

  cluster.on("exit", (worker, code, signal) => {
    const slot = slots.get(worker);
    slots.delete(worker);
    if (stopping || slot === undefined) return;
    const now = Date.now();
    crashes.push(now);
    while (crashes.length && crashes[0] < now - CRASH_SPAN_MS) crashes.shift();
    const delay = crashes.length > 3 ? Math.min(5_000, 250 * 2 ** (crashes.length - 3)) : 0;
    logger.error(
      `[cluster] worker ${worker.process.pid} died (${signal ? `signal ${signal}` : `exit code ${code}`}); ` +
        `starting a new one${delay ? ` in ${delay} ms` : ""}`,
    );
    setTimeout(() => {
      if (stopping) return;
      const next = fork(slot);
      next.once("listening", () => logger.error(`[cluster] worker ${next.process.pid} replaces ${worker.process.pid}`));
    }, delay);
  });

  return new Promise((resolve, reject) => {
    let listening = 0;
    const onListening = () => {
      if (++listening < count) return;
      cluster.off("listening", onListening);
      logger.info(`[cluster] ${count} worker process(es): ${[...slots.keys()].map((w) => w.process.pid).join(", ")}`);
      resolve({
        pids: () => [...slots.keys()].map((w) => w.process.pid ?? 0),
        stop: async () => {
          stopping = true;
          const workers = [...slots.keys()];
          await Promise.all(
            workers.map(
              (w) =>
                new Promise<void>((done) => {
                  if (w.isDead()) return done();
                  w.once("exit", () => done());
                  w.process.kill("SIGTERM");
                }),
            ),
          );
        },
      });
    };
    cluster.on("listening", onListening);
    // A worker that dies before all listen (port taken, database down) stops the start.
    const early = (worker: Worker, code: number) => {
      if (listening >= count) return cluster.off("exit", early);
      stopping = true;
      for (const w of slots.keys()) if (w !== worker) w.process.kill("SIGTERM");
      reject(new Error(`a server worker exited with code ${code} before it listened (see its message above)`));
    };
    cluster.on("exit", early);
    for (let slot = 0; slot < count; slot++) fork(slot);
  });
}
