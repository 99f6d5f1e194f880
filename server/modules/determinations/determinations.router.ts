import { createGuardedRouter } from "../../http/routes";
import { signedInActor } from "../../http/context";
import { parseInput } from "../../errors";
import { entityCodeParamSchema } from "../../../shared/schemas/common";
import { capitalQuerySchema } from "../../../shared/schemas/determination";
import { exportFormatParamSchema } from "../../../shared/schemas/table-export";
import { sendDownload } from "../../http/download";
import { tableDownload } from "../../kit/table-export";
import { capitalOnDate, listDeterminations } from "./determinations.service";
import { determinationsTable } from "./determinations.tables";

export function determinationsRouter() {
  const r = createGuardedRouter();
  r.get("/api/entities/:code/determinations", async (req, res) => {
    const { code } = parseInput(entityCodeParamSchema, req.params, "address");
    res.json(await listDeterminations(code, signedInActor(req).user));
  });
  r.get("/api/entities/:code/determinations.:format", async (req, res) => {
    const { code } = parseInput(entityCodeParamSchema, req.params, "address");
    const { format } = parseInput(exportFormatParamSchema, req.params, "address");
    const rows = await listDeterminations(code, signedInActor(req).user);
    sendDownload(res, await tableDownload(determinationsTable(code, rows), format));
  });
  r.get("/api/entities/:code/capital", async (req, res) => {
    const { code } = parseInput(entityCodeParamSchema, req.params, "address");
    res.json(await capitalOnDate(code, parseInput(capitalQuerySchema, req.query, "query")));
  });
  return r.router;
}
