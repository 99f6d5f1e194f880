import { createApp } from "./app";
import { config } from "./config";
import { logger } from "./logger";
import { startFilingDelivery } from "./modules/filings/delivery-loop";

const server = createApp({ serveClient: true }).listen(config.port, "127.0.0.1", () => {
  logger.info(`Quartermark API listening on http://127.0.0.1:${config.port}`);
});

startFilingDelivery();

for (const signal of ["SIGINT", "SIGTERM"] as const) process.on(signal, () => server.close(() => process.exit(0)));
