import { portfolioCodeOf } from "../../http/context";
import { createGuardedRouter } from "../../http/routes";
import { parseInput } from "../../errors";
import { observationsQuerySchema } from "../../../shared/schemas/observation";
import { listObservations } from "./observations.service";

export function observationsRouter() {
  const r = createGuardedRouter();
  r.get("/api/portfolios/:code/observations", async (req, res) => {
    res.json(await listObservations(portfolioCodeOf(req), parseInput(observationsQuerySchema, req.query, "query")));
  });
  return r.router;
}
