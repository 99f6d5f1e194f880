import { createGuardedRouter } from "../../http/routes";
import { signedInActor } from "../../http/context";
import { parseInput } from "../../errors";
import { entityCodeParamSchema } from "../../../shared/schemas/common";
import { forecastQuerySchema, whatIfBodySchema } from "../../../shared/schemas/capital";
import { exportFormatParamSchema } from "../../../shared/schemas/table-export";
import { sendDownload } from "../../http/download";
import { tableDownload } from "../../kit/table-export";
import { entityByCode } from "../../kit/lookups";
import { capitalHistory, getForecast, getWhatIf } from "./capital.service";
import { capitalHistoryTable } from "./capital.tables";

export function capitalRouter() {
  const r = createGuardedRouter();
  r.get("/api/entities/:code/capital/history", async (req, res) => {
    const { code } = parseInput(entityCodeParamSchema, req.params, "address");
    res.json(await capitalHistory(code, signedInActor(req)));
  });
  r.get("/api/entities/:code/capital/history.:format", async (req, res) => {
    const { code } = parseInput(entityCodeParamSchema, req.params, "address");
    const { format } = parseInput(exportFormatParamSchema, req.params, "address");
    const rows = await capitalHistory(code, signedInActor(req));
    sendDownload(res, await tableDownload(capitalHistoryTable(await entityByCode(code), rows), format));
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
