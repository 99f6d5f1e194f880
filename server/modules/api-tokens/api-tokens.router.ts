import { createGuardedRouter } from "../../http/routes";
import { idOf, signedInActor } from "../../http/context";
import { parseInput } from "../../errors";
import { createApiTokenBodySchema } from "../../../shared/schemas/api-token";
import { createApiToken, listApiTokens, revokeApiToken } from "./api-tokens.service";

export function apiTokensRouter() {
  const r = createGuardedRouter();
  r.get("/api/tokens", async (req, res) => {
    res.json(await listApiTokens(signedInActor(req)));
  });
  r.post("/api/tokens", async (req, res) => {
    res
      .status(201)
      .json(
        await createApiToken(parseInput(createApiTokenBodySchema, req.body ?? {}, "new token"), signedInActor(req)),
      );
  });
  r.delete("/api/tokens/:id", async (req, res) => {
    await revokeApiToken(idOf(req), signedInActor(req));
    res.status(204).end();
  });
  return r.router;
}
