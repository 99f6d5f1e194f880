import { createGuardedRouter } from "../../http/routes";
import { exportFormatOf, idOf, signedInActor } from "../../http/context";
import { parseInput } from "../../errors";
import { closeFindingBodySchema, findingsQuerySchema } from "../../../shared/schemas/finding";
import { sendTable } from "../../http/download";
import { closeFinding, listFindings } from "./findings.service";
import { findingsTable } from "./findings.tables";

export function findingsRouter() {
  const r = createGuardedRouter();
  r.get("/api/findings", async (req, res) => {
    res.json(await listFindings(parseInput(findingsQuerySchema, req.query, "query")));
  });
  r.get("/api/findings.:format", async (req, res) => {
    const format = exportFormatOf(req);
    const filter = parseInput(findingsQuerySchema, req.query, "query");
    await sendTable(res, findingsTable(await listFindings(filter), filter), format);
  });
  r.put("/api/findings/:id", async (req, res) => {
    res.json(await closeFinding(idOf(req), parseInput(closeFindingBodySchema, req.body), signedInActor(req)));
  });
  return r.router;
}
