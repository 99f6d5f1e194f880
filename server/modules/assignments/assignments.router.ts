import { createGuardedRouter } from "../../http/routes";
import { signedInActor } from "../../http/context";
import { parseInput } from "../../errors";
import { assignmentParamSchema, createAssignmentBodySchema } from "../../../shared/schemas/assignment";
import { assignRegulator, listAssignments, unassignRegulator } from "./assignments.service";

export function assignmentsRouter() {
  const r = createGuardedRouter();
  r.get("/api/regulator-assignments", async (_req, res) => {
    res.json(await listAssignments());
  });
  r.post("/api/regulator-assignments", async (req, res) => {
    const { userId, entityCode } = parseInput(createAssignmentBodySchema, req.body);
    res.status(201).json(await assignRegulator(userId, entityCode, signedInActor(req)));
  });
  r.delete("/api/regulator-assignments/:userId/:entityCode", async (req, res) => {
    const { userId, entityCode } = parseInput(assignmentParamSchema, req.params, "address");
    await unassignRegulator(userId, entityCode, signedInActor(req));
    res.status(204).end();
  });
  return r.router;
}
