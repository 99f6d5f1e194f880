import { idParamSchema } from "../../../shared/schemas/common";
import { createGuardedRouter } from "../../http/routes";
import { signedInActor } from "../../http/context";
import { parseInput } from "../../errors";
import { closeFindingBodySchema, findingsQuerySchema } from "../../../shared/schemas/finding";
import { closeFinding, listFindings } from "./findings.service";

export function findingsRouter() {
  const r = createGuardedRouter();
  r.get("/api/findings", async (req, res) => {
    res.json(await listFindings(parseInput(findingsQuerySchema, req.query, "query")));
  });
  r.put("/api/findings/:id", async (req, res) => {
    const { id } = parseInput(idParamSchema, req.params, "address");
    res.json(await closeFinding(id, parseInput(closeFindingBodySchema, req.body), signedInActor(req)));
  });
  return r.router;
}
