import { createGuardedRouter } from "../../http/routes";
import { signedInActor } from "../../http/context";
import { listQueue } from "./queue.service";

export function queueRouter() {
  const r = createGuardedRouter();
  r.get("/api/queue", async (req, res) => {
    res.json(await listQueue(signedInActor(req)));
  });
  return r.router;
}
