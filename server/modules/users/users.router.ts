import { createGuardedRouter } from "../../http/routes";
import { signedInActor } from "../../http/context";
import { parseInput } from "../../errors";
import { createUserBodySchema, resetPasswordBodySchema, updateUserBodySchema } from "../../../shared/schemas/user";
import { idParamSchema } from "../../../shared/schemas/common";
import { createUser, listUsers, resetPassword, updateUser } from "./users.service";

export function usersRouter() {
  const r = createGuardedRouter();
  r.get("/api/users", async (_req, res) => {
    res.json(await listUsers());
  });
  r.post("/api/users", async (req, res) => {
    res.status(201).json(await createUser(parseInput(createUserBodySchema, req.body), signedInActor(req)));
  });
  r.patch("/api/users/:id", async (req, res) => {
    const { id } = parseInput(idParamSchema, req.params, "address");
    res.json(await updateUser(id, parseInput(updateUserBodySchema, req.body), signedInActor(req)));
  });
  r.post("/api/users/:id/password", async (req, res) => {
    const { id } = parseInput(idParamSchema, req.params, "address");
    await resetPassword(id, parseInput(resetPasswordBodySchema, req.body), signedInActor(req));
    res.status(204).end();
  });
  return r.router;
}
