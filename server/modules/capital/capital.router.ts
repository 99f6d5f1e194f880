import { createGuardedRouter } from "../../http/routes";
import { signedInActor } from "../../http/context";
import { parseInput } from "../../errors";
import { entityCodeParamSchema } from "../../../shared/schemas/common";
import { forecastQuerySchema, whatIfBodySchema } from "../../../shared/schemas/capital";
import { capitalHistory, getForecast, getWhatIf } from "./capital.service";

export function capitalRouter() {
  const r = createGuardedRouter();
  r.get("/api/entities/:code/capital/history", async (req, res) => {
    const { code } = parseInput(entityCodeParamSchema, req.params, "address");
    res.json(await capitalHistory(code, signedInActor(req)));
  });
  r.get("/api/entities/:code/capital/forecast", async (req, res) => {
    const { code } = parseInput(entityCodeParamSchema, req.params, "address");
    res.json(await getForecast(code, parseInput(forecastQuerySchema, req.query, "query"), signedInActor(req).user));
  });
  r.post("/api/entities/:code/capital/what-if", async (req, res) => {
    const { code } = parseInput(entityCodeParamSchema, req.params, "address");
    res.json(await getWhatIf(code, parseInput(whatIfBodySchema, req.body ?? {}), signedInActor(req).user));
  });
  return r.router;
}
