import { logger } from "../logger";

/**
 * Runs `round` every `everyMs` in this process, a round never overlapping the one before: it says
 * what it did (`report` turns its answer into a log line, or null for nothing worth saying) and a
 * failure is logged as `failed`, never thrown. Returns the stop.
 */
export function everyRound<T>(
  everyMs: number,
  round: () => Promise<T>,
  report: (result: T) => string | null,
  failed: string,
): () => void {
  let running = false;
  const timer = setInterval(() => {
    if (running) return;
    running = true;
    round()
      .then((result) => {
        const line = report(result);
        if (line) logger.info(line);
      })
      .catch((err) => logger.error(`${failed}: ${(err as Error).message}`))
      .finally(() => {
        running = false;
      });
  }, everyMs);
  timer.unref();
  return () => clearInterval(timer);
}
