import { z } from "zod";
import { createGuardedRouter } from "../../http/routes";
import { signedInActor } from "../../http/context";
import { parseInput } from "../../errors";
import { closeFindingBodySchema, findingsQuerySchema } from "../../../shared/schemas/upload";
import { closeFinding, listFindings } from "./findings.service";

const idParam = z.object({ id: z.coerce.number().int().positive() });

export function findingsRouter() {
  const r = createGuardedRouter();
  r.get("/api/findings", async (req, res) => {
    res.json(await listFindings(parseInput(findingsQuerySchema, req.query, "query")));
  });
  r.put("/api/findings/:id", async (req, res) => {
    const { id } = parseInput(idParam, req.params, "address");
    res.json(await closeFinding(id, parseInput(closeFindingBodySchema, req.body), signedInActor(req)));
  });
  return r.router;
}
