import { exportFormatOf } from "../../http/context";
import { createGuardedRouter } from "../../http/routes";
import { parseInput } from "../../errors";
import { auditFilterSchema, auditQuerySchema } from "../../../shared/schemas/audit";
import { sendTable } from "../../http/download";
import { auditTable } from "./audit.tables";
import { auditEventsForExport, listAuditEvents, verifyAuditLog } from "./audit.service";

export function auditRouter() {
  const r = createGuardedRouter();
  r.get("/api/audit-events/verify", async (_req, res) => {
    res.json(await verifyAuditLog());
  });
  r.get("/api/audit-events", async (req, res) => {
    res.json(await listAuditEvents(parseInput(auditQuerySchema, req.query, "query")));
  });
  r.get("/api/audit-events.:format", async (req, res) => {
    const format = exportFormatOf(req);
    const filter = parseInput(auditFilterSchema, req.query, "query");
    await sendTable(res, auditTable(await auditEventsForExport(filter), filter), format);
  });
  return r.router;
}
