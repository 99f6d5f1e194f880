import { createGuardedRouter } from "../../http/routes";
import { signedInActor } from "../../http/context";
import { parseInput } from "../../errors";
import { notificationChoicesBodySchema } from "../../../shared/schemas/notification";
import { notificationChoices, setNotificationChoices } from "./notifications.service";

export function notificationsRouter() {
  const r = createGuardedRouter();
  r.get("/api/notifications/choices", async (req, res) => {
    res.json(await notificationChoices(signedInActor(req)));
  });
  r.put("/api/notifications/choices", async (req, res) => {
    res.json(await setNotificationChoices(parseInput(notificationChoicesBodySchema, req.body), signedInActor(req)));
  });
  return r.router;
}
