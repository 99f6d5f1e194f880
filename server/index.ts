/**
 * The production entry (`npm run start:built`, and the workers of `npm start`): the primary
 * supervises WORKERS processes (default: one per core) and restarts any that dies; each worker
 * serves the API and the client.
 */
import cluster from "node:cluster";
import { config } from "./config";
import { logger } from "./logger";
import { superviseWorkers } from "./cluster";
import { startWorker } from "./worker";

if (cluster.isPrimary) {
  superviseWorkers(config.workers).then(
    (supervisor) => {
      logger.info(`Quartermark listening on http://127.0.0.1:${config.port} (${config.workers} worker processes)`);
      for (const signal of ["SIGINT", "SIGTERM"] as const)
        process.once(signal, () => void supervisor.stop().then(() => process.exit(0)));
    },
    (err: Error) => {
      logger.error(`[start] ${err.message}`);
      process.exit(1);
    },
  );
} else {
  startWorker().catch((err: Error) => {
    logger.error(`[worker] ${err.message}`);
    process.exit(1);
  });
}
