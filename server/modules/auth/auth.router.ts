import { rateLimit } from "express-rate-limit";
import { createGuardedRouter } from "../../http/routes";
import { actorOf, signedInActor } from "../../http/context";
import { parseInput, TooManyRequestsError } from "../../errors";
import { changePasswordBodySchema, loginBodySchema } from "../../../shared/schemas/auth";
import { changeOwnPassword, signIn, signOut } from "./auth.service";
import { clearSessionCookie, setSessionCookie } from "./session.middleware";
import { DatabaseCountStore } from "./sign-in-counts";

export interface SignInLimits {
  windowMs: number;
  perAccount: number;
  perAddress: number;
  /** Keys the counts in the database (shared by every server process); tests give their own. */
  namespace?: string;
}

export const DEFAULT_SIGN_IN_LIMITS: SignInLimits = { windowMs: 15 * 60 * 1000, perAccount: 5, perAddress: 30 };

export function authRouter(limits: SignInLimits = DEFAULT_SIGN_IN_LIMITS) {
  const r = createGuardedRouter();
  // Only failed attempts count; the message is the same whichever limit was reached.
  const tooMany = () => new TooManyRequestsError("Too many sign-in attempts. Wait 15 minutes and try again.");
  // The counts live in MariaDB, so every worker process enforces the one limit (server/cluster.ts).
  const ns = limits.namespace ?? "sign-in";
  const perAddress = rateLimit({
    store: new DatabaseCountStore(`${ns}:address`),
    windowMs: limits.windowMs,
    limit: limits.perAddress,
    skipSuccessfulRequests: true,
    standardHeaders: "draft-8",
    legacyHeaders: false,
    handler: (_req, _res, next) => next(tooMany()),
  });
  const perAccount = rateLimit({
    store: new DatabaseCountStore(`${ns}:account`),
    windowMs: limits.windowMs,
    limit: limits.perAccount,
    skipSuccessfulRequests: true,
    standardHeaders: false,
    legacyHeaders: false,
    keyGenerator: (req) =>
      `account:${String(req.body?.email ?? "")
        .trim()
        .toLowerCase()}`,
    handler: (_req, _res, next) => next(tooMany()),
  });

  r.post("/api/auth/login", perAddress, perAccount, async (req, res) => {
    const body = parseInput(loginBodySchema, req.body, "sign-in form");
    const { user, token } = await signIn(body, actorOf(req));
    setSessionCookie(res, token);
    res.json({ user });
  });

  // A session that keeps guessing its own current password is stopped like failed sign-ins.
  const passwordChangesPerAccount = rateLimit({
    store: new DatabaseCountStore(`${ns}:password-change`),
    windowMs: limits.windowMs,
    limit: limits.perAccount,
    skipSuccessfulRequests: true,
    standardHeaders: false,
    legacyHeaders: false,
    keyGenerator: (req) => `password-change:${req.user?.id ?? "none"}`,
    handler: (_req, _res, next) =>
      next(new TooManyRequestsError("Too many attempts to change your password. Wait 15 minutes and try again.")),
  });

  r.post("/api/auth/password", passwordChangesPerAccount, async (req, res) => {
    const body = parseInput(changePasswordBodySchema, req.body, "password form");
    const { user, token } = await changeOwnPassword(body, signedInActor(req));
    setSessionCookie(res, token);
    res.json({ user });
  });

  r.post("/api/auth/logout", async (req, res) => {
    await signOut(signedInActor(req));
    clearSessionCookie(res);
    res.status(204).end();
  });

  r.get("/api/auth/me", (req, res) => {
    res.json({ user: signedInActor(req).user });
  });

  // The client's "who is signed in?" probe: 200 either way (no 401 noise on a first visit).
  r.get("/api/auth/session", (req, res) => {
    res.json({ user: req.user ?? null });
  });

  return r.router;
}
