import { rateLimit } from "express-rate-limit";
import { createGuardedRouter } from "../../http/routes";
import { actorOf } from "../../http/context";
import { parseInput, TooManyRequestsError } from "../../errors";
import { acceptInvitationBodySchema, invitationLookupBodySchema } from "../../../shared/schemas/auth";
import { acceptInvitation, listPendingInvitations, lookupInvitation } from "./invitations.service";
import { setSessionCookie } from "../auth/session.middleware";
import { DatabaseCountStore } from "../auth/sign-in-counts";

export interface InvitationLimits {
  windowMs: number;
  /** Refused look-ups and attempts per address in the window (a good link's use does not count). */
  perAddress: number;
  /** Keys the counts in the database (shared by every server process); tests give their own. */
  namespace?: string;
}

export const DEFAULT_INVITATION_LIMITS: InvitationLimits = { windowMs: 15 * 60 * 1000, perAddress: 20 };

export function invitationsRouter(limits: InvitationLimits = DEFAULT_INVITATION_LIMITS) {
  const r = createGuardedRouter();
  // Public routes: a 256-bit token cannot be guessed, and guessing is still slowed down per address.
  const perAddress = rateLimit({
    store: new DatabaseCountStore(`${limits.namespace ?? "invitation"}:address`),
    windowMs: limits.windowMs,
    limit: limits.perAddress,
    skipSuccessfulRequests: true,
    // Only refused links count (unknown, used, expired: 404/410), not a form sent again with a weak password.
    requestWasSuccessful: (_req, res) => res.statusCode < 400 || res.statusCode === 422,
    standardHeaders: "draft-8",
    legacyHeaders: false,
    handler: (_req, _res, next) =>
      next(new TooManyRequestsError("Too many attempts with set-password links. Wait 15 minutes and try again.")),
  });

  r.get("/api/invitations", async (_req, res) => {
    res.json(await listPendingInvitations());
  });

  r.post("/api/invitations/lookup", perAddress, async (req, res) => {
    const { token } = parseInput(invitationLookupBodySchema, req.body, "link");
    res.json(await lookupInvitation(token));
  });

  r.post("/api/invitations/accept", perAddress, async (req, res) => {
    const body = parseInput(acceptInvitationBodySchema, req.body, "form");
    const { user, token } = await acceptInvitation(body, actorOf(req));
    setSessionCookie(res, token);
    res.json({ user });
  });

  return r.router;
}
