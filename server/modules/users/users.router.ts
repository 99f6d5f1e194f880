import { createGuardedRouter } from "../../http/routes";
import { idOf, signedInActor } from "../../http/context";
import { parseInput } from "../../errors";
import {
  createUserBodySchema,
  passwordLinkBodySchema,
  proposeRoleBodySchema,
  updateUserBodySchema,
} from "../../../shared/schemas/user";
import { createUser, listPeople, listUsers, sendPasswordLink, unlockUser, updateUser } from "./users.service";
import {
  approveRoleRequest,
  listPendingRoleRequests,
  proposeRoleChange,
  rejectRoleRequest,
} from "./role-requests.service";

export function usersRouter() {
  const r = createGuardedRouter();
  r.get("/api/people", async (_req, res) => {
    res.json(await listPeople());
  });
  r.get("/api/users", async (_req, res) => {
    res.json(await listUsers());
  });
  r.post("/api/users", async (req, res) => {
    const result = await createUser(parseInput(createUserBodySchema, req.body), signedInActor(req));
    res.status(result.outcome === "invited" ? 201 : 202).json(result);
  });
  r.patch("/api/users/:id", async (req, res) => {
    res.json(await updateUser(idOf(req), parseInput(updateUserBodySchema, req.body), signedInActor(req)));
  });
  r.post("/api/users/:id/unlock", async (req, res) => {
    res.json(await unlockUser(idOf(req), signedInActor(req)));
  });
  r.post("/api/users/:id/password-link", async (req, res) => {
    res.json(await sendPasswordLink(idOf(req), parseInput(passwordLinkBodySchema, req.body), signedInActor(req)));
  });

  // Granting or removing the CRO or administrator role: one admin proposes, another decides.
  r.get("/api/role-requests", async (_req, res) => {
    res.json(await listPendingRoleRequests());
  });
  r.post("/api/role-requests", async (req, res) => {
    res.status(201).json(await proposeRoleChange(parseInput(proposeRoleBodySchema, req.body), signedInActor(req)));
  });
  r.post("/api/role-requests/:id/approve", async (req, res) => {
    res.json(await approveRoleRequest(idOf(req), signedInActor(req)));
  });
  r.post("/api/role-requests/:id/reject", async (req, res) => {
    res.json(await rejectRoleRequest(idOf(req), signedInActor(req)));
  });
  return r.router;
}
