import { rateLimit } from "express-rate-limit";
import { createGuardedRouter } from "../../http/routes";
import { actorOf, signedInActor } from "../../http/context";
import { parseInput, TooManyRequestsError } from "../../errors";
import { changePasswordBodySchema, loginBodySchema } from "../../../shared/schemas/auth";
import { changeOwnPassword, signIn, signOut } from "./auth.service";
import { clearSessionCookie, setSessionCookie } from "./session.middleware";
import { accountCounterKey, DatabaseCountStore, passwordChangeCounterKey, SIGN_IN_NAMESPACE } from "./sign-in-counts";
import { config } from "../../config";

export interface SignInLimits {
  windowMs: number;
  perAccount: number;
  perAddress: number;
  /** Keys the counts in the database (shared by every server process); tests give their own. */
  namespace?: string;
}

/** The lockout policy from the environment (SIGN_IN_MAX_FAILURES, SIGN_IN_WINDOW_MINUTES, …; README.md). */
export const DEFAULT_SIGN_IN_LIMITS: SignInLimits = { ...config.signIn };

const minutes = (ms: number) => {
  const m = Math.max(1, Math.round(ms / 60_000));
  return `${m} ${m === 1 ? "minute" : "minutes"}`;
};

export function authRouter(limits: SignInLimits = DEFAULT_SIGN_IN_LIMITS) {
  const r = createGuardedRouter();
  // Only failed attempts count; the message is the same whichever limit was reached.
  const tooMany = () =>
    new TooManyRequestsError(`Too many sign-in attempts. Wait ${minutes(limits.windowMs)} and try again.`);
  // The counts live in MariaDB, so every worker process enforces the one limit (server/cluster.ts).
  const ns = limits.namespace ?? SIGN_IN_NAMESPACE;
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
    keyGenerator: (req) => accountCounterKey(String(req.body?.email ?? "")),
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
    keyGenerator: (req) => passwordChangeCounterKey(req.user?.id ?? "none"),
    handler: (_req, _res, next) =>
      next(
        new TooManyRequestsError(
          `Too many attempts to change your password. Wait ${minutes(limits.windowMs)} and try again.`,
        ),
      ),
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
