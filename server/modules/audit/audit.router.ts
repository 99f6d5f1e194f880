import { createGuardedRouter } from "../../http/routes";
import { parseInput } from "../../errors";
import { auditQuerySchema } from "../../../shared/schemas/audit";
import { listAuditEvents, verifyAuditLog } from "./audit.service";

export function auditRouter() {
  const r = createGuardedRouter();
  r.get("/api/audit-events/verify", async (_req, res) => {
    res.json(await verifyAuditLog());
  });
  r.get("/api/audit-events", async (req, res) => {
    res.json(await listAuditEvents(parseInput(auditQuerySchema, req.query, "query")));
  });
  return r.router;
}
