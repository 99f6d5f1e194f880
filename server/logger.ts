import { config } from "./config";

/** A tiny logger: the level comes from config; tests run with LOG_LEVEL=error. */
export const logger = {
  info(message: string) {
    if (config.logLevel === "info") console.log(message);
  },
  error(message: string) {
    if (config.logLevel !== "silent") console.error(message);
  },
};
