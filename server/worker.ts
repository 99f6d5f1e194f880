import type { Server } from "node:http";
import { createApp } from "./app";
import { config } from "./config";
import { startFilingDelivery } from "./modules/filings/delivery-loop";
import { startNoticeReminders } from "./modules/notices/notices.reminders";

/**
 * One server process: the API and the built client on PORT (shared with the other workers through
 * the cluster primary). Closes on SIGTERM / SIGINT once its open requests are answered.
 */
export function startWorker(): Promise<Server> {
  return new Promise((resolve, reject) => {
    const server = createApp({ serveClient: true }).listen(config.port, "127.0.0.1");
    server.once("listening", () => resolve(server));
    server.once("error", (err: NodeJS.ErrnoException) =>
      reject(err.code === "EADDRINUSE" ? new Error(`Port ${config.port} is in use; set PORT to a free port.`) : err),
    );
    if (config.runsFilingDelivery) {
      startFilingDelivery();
      // Claimed per notice in the database, so a second process running it would send nothing twice.
      startNoticeReminders();
    }
    for (const signal of ["SIGINT", "SIGTERM"] as const)
      process.once(signal, () => {
        server.close(() => process.exit(0));
        setTimeout(() => process.exit(0), 5_000).unref();
      });
  });
}
