import { createGuardedRouter } from "../../http/routes";
import { entityCodeOf, exportFormatOf, signedInActor } from "../../http/context";
import { parseInput } from "../../errors";
import { capitalQuerySchema } from "../../../shared/schemas/determination";
import { sendTable } from "../../http/download";
import { capitalOnDate, listDeterminations } from "./determinations.service";
import { determinationsTable } from "./determinations.tables";

export function determinationsRouter() {
  const r = createGuardedRouter();
  r.get("/api/entities/:code/determinations", async (req, res) => {
    res.json(await listDeterminations(entityCodeOf(req), signedInActor(req).user));
  });
  r.get("/api/entities/:code/determinations.:format", async (req, res) => {
    const code = entityCodeOf(req);
    const format = exportFormatOf(req);
    const rows = await listDeterminations(code, signedInActor(req).user);
    await sendTable(res, determinationsTable(code, rows), format);
  });
  r.get("/api/entities/:code/capital", async (req, res) => {
    res.json(await capitalOnDate(entityCodeOf(req), parseInput(capitalQuerySchema, req.query, "query")));
  });
  return r.router;
}
