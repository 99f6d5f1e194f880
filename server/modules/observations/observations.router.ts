import { createGuardedRouter } from "../../http/routes";
import { parseInput } from "../../errors";
import { observationsQuerySchema } from "../../../shared/schemas/observation";
import { portfolioCodeParamSchema } from "../../../shared/schemas/common";
import { listObservations } from "./observations.service";

export function observationsRouter() {
  const r = createGuardedRouter();
  r.get("/api/portfolios/:code/observations", async (req, res) => {
    const { code } = parseInput(portfolioCodeParamSchema, req.params, "address");
    res.json(await listObservations(code, parseInput(observationsQuerySchema, req.query, "query")));
  });
  return r.router;
}
