import { createGuardedRouter } from "../../http/routes";
import { signedInActor } from "../../http/context";
import { parseInput } from "../../errors";
import { idParamSchema } from "../../../shared/schemas/common";
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
    const { id } = parseInput(idParamSchema, req.params, "address");
    await revokeApiToken(id, signedInActor(req));
    res.status(204).end();
  });
  return r.router;
}
