import { idParamSchema } from "../../../shared/schemas/common";
import { createGuardedRouter } from "../../http/routes";
import { signedInActor } from "../../http/context";
import { parseInput } from "../../errors";
import { closeFindingBodySchema, findingsQuerySchema } from "../../../shared/schemas/finding";
import { exportFormatParamSchema } from "../../../shared/schemas/table-export";
import { tableDownload } from "../../kit/table-export";
import { sendDownload } from "../../http/download";
import { closeFinding, listFindings } from "./findings.service";
import { findingsTable } from "./findings.tables";

export function findingsRouter() {
  const r = createGuardedRouter();
  r.get("/api/findings", async (req, res) => {
    res.json(await listFindings(parseInput(findingsQuerySchema, req.query, "query")));
  });
  r.get("/api/findings.:format", async (req, res) => {
    const { format } = parseInput(exportFormatParamSchema, req.params, "address");
    const filter = parseInput(findingsQuerySchema, req.query, "query");
    sendDownload(res, await tableDownload(findingsTable(await listFindings(filter), filter), format));
  });
  r.put("/api/findings/:id", async (req, res) => {
    const { id } = parseInput(idParamSchema, req.params, "address");
    res.json(await closeFinding(id, parseInput(closeFindingBodySchema, req.body), signedInActor(req)));
  });
  return r.router;
}
