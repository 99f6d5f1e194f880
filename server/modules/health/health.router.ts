import { createGuardedRouter } from "../../http/routes";
import { checkHealth } from "./health.service";

export function healthRouter() {
  const r = createGuardedRouter();
  r.get("/api/health", async (_req, res) => {
    const health = await checkHealth();
    res.status(health.db === "up" ? 200 : 503).json(health);
  });
  return r.router;
}
