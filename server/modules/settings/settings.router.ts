import { createGuardedRouter } from "../../http/routes";
import { entityCodeOf, signedInActor } from "../../http/context";
import { parseInput } from "../../errors";
import {
  proposeSettingsSchema,
  settingsDecisionSchema,
  settingsIdParamSchema,
} from "../../../shared/schemas/determination";
import * as settings from "./settings.service";

export function settingsRouter() {
  const r = createGuardedRouter();
  r.get("/api/entities/:code/settings", async (req, res) => {
    res.json(await settings.listSettings(entityCodeOf(req)));
  });
  r.post("/api/entities/:code/settings", async (req, res) => {
    const code = entityCodeOf(req);
    const body = parseInput(proposeSettingsSchema, req.body ?? {});
    res.status(201).json(await settings.proposeSettings(code, body, signedInActor(req)));
  });
  r.post("/api/settings/:id/approve", async (req, res) => {
    const { id } = parseInput(settingsIdParamSchema, req.params, "address");
    res.json(
      await settings.approveSettings(id, parseInput(settingsDecisionSchema, req.body ?? {}), signedInActor(req)),
    );
  });
  r.post("/api/settings/:id/reject", async (req, res) => {
    const { id } = parseInput(settingsIdParamSchema, req.params, "address");
    res.json(await settings.rejectSettings(id, parseInput(settingsDecisionSchema, req.body ?? {}), signedInActor(req)));
  });
  return r.router;
}
