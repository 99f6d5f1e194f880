import { createGuardedRouter } from "../../http/routes";
import { entityCodeOf, exportFormatOf, signedInActor } from "../../http/context";
import { parseInput } from "../../errors";
import { forecastQuerySchema, whatIfBodySchema } from "../../../shared/schemas/capital";
import { sendTable } from "../../http/download";
import { entityByCode } from "../../kit/lookups";
import { capitalHistory, getForecast, getWhatIf } from "./capital.service";
import { capitalHistoryTable } from "./capital.tables";

export function capitalRouter() {
  const r = createGuardedRouter();
  r.get("/api/entities/:code/capital/history", async (req, res) => {
    res.json(await capitalHistory(entityCodeOf(req), signedInActor(req)));
  });
  r.get("/api/entities/:code/capital/history.:format", async (req, res) => {
    const code = entityCodeOf(req);
    const format = exportFormatOf(req);
    const rows = await capitalHistory(code, signedInActor(req));
    await sendTable(res, capitalHistoryTable(await entityByCode(code), rows), format);
  });
  r.get("/api/entities/:code/capital/forecast", async (req, res) => {
    const code = entityCodeOf(req);
    res.json(await getForecast(code, parseInput(forecastQuerySchema, req.query, "query"), signedInActor(req).user));
  });
  r.post("/api/entities/:code/capital/what-if", async (req, res) => {
    res.json(await getWhatIf(entityCodeOf(req), parseInput(whatIfBodySchema, req.body ?? {}), signedInActor(req).user));
  });
  return r.router;
}
