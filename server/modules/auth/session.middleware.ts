import type { Request, RequestHandler, Response } from "express";
import { config } from "../../config";
import { logger } from "../../logger";
import { UnauthorizedError } from "../../errors";
import { recordAudit } from "../audit/audit.service";
import { resolveApiToken } from "../api-tokens/api-tokens.service";
import { resolveSession } from "./auth.service";
import { SESSION_COOKIE, SESSION_TTL_SECONDS } from "./tokens";

// Forged or malformed credentials are audited once per address and minute, and logged otherwise,
// so the failure is on record without letting anyone fill the audit log.
const lastForgeryAudit = new Map<string, number>();
function firstForgeryThisMinute(key: string): boolean {
  const now = Date.now();
  if ((lastForgeryAudit.get(key) ?? 0) > now - 60_000) return false;
  if (lastForgeryAudit.size > 10_000) lastForgeryAudit.clear();
  lastForgeryAudit.set(key, now);
  return true;
}

const anonymous = (req: Request) => ({ user: null, ip: req.ip ?? null, requestId: req.requestId });

// One answer whatever the reason (mistyped, expired, revoked, owner disabled): the reason is in the audit log only.
const TOKEN_REFUSED =
  "The API token was not accepted. Check that it is copied whole, or create a new one on the API tokens page of Quartermark.";

/**
 * `Authorization: Bearer <secret>`: the token's owner, with their current role, signs the request
 * in (read-only: server/http/policy.ts tokenMayCall). A bad token is refused here, at once, with
 * 401: a script that sent one wants to know, whatever route it called.
 */
async function signInWithToken(authorization: string, req: Request, res: Response): Promise<UnauthorizedError | null> {
  const secret = /^Bearer +(\S+) *$/i.exec(authorization)?.[1] ?? "";
  const resolved = await resolveApiToken(secret);
  if ("user" in resolved) {
    req.user = resolved.user;
    req.credential = "api-token";
    return null;
  }
  if (resolved.genuine || firstForgeryThisMinute(`token:${req.ip ?? "unknown"}`)) {
    await recordAudit(
      anonymous(req),
      "auth.token_rejected",
      resolved.token ? `api token #${resolved.token.id}` : null,
      {
        after: {
          reason: resolved.reason,
          path: req.path,
          ...(resolved.token ? { prefix: resolved.token.prefix, owner: resolved.token.owner } : {}),
        },
      },
    );
  } else {
    logger.info(`[${req.requestId}] rejected an API token again (${resolved.reason}) from ${req.ip}`);
  }
  res.setHeader("WWW-Authenticate", 'Bearer realm="quartermark", error="invalid_token"');
  return new UnauthorizedError(TOKEN_REFUSED);
}

/**
 * The one way a request becomes signed in: a personal API token in the Authorization header, else
 * the session cookie. Sets req.user and req.credential; a bad cookie is logged and ignored here
 * (the route guards answer 401), a bad token is answered 401 at once.
 */
export const sessionMiddleware: RequestHandler = async (req, res, next) => {
  // Browsers never attach Authorization on their own, so a bearer request needs no Origin check; its cookie is not read.
  const authorization = req.get("authorization");
  if (authorization !== undefined) return next((await signInWithToken(authorization, req, res)) ?? undefined);

  const token: unknown = req.cookies?.[SESSION_COOKIE];
  if (typeof token !== "string" || token === "") return next();
  const session = await resolveSession(token);
  if ("user" in session) {
    req.user = session.user;
    req.credential = "session";
    return next();
  }
  clearSessionCookie(res);
  if (session.genuine || firstForgeryThisMinute(req.ip ?? "unknown")) {
    await recordAudit(anonymous(req), "auth.session_rejected", null, {
      after: { reason: session.reason, path: req.path },
    });
  } else {
    logger.info(`[${req.requestId}] rejected a forged session cookie again (${session.reason}) from ${req.ip}`);
  }
  next();
};

export function setSessionCookie(res: Response, token: string): void {
  res.cookie(SESSION_COOKIE, token, {
    httpOnly: true,
    sameSite: "strict",
    secure: config.cookieSecure,
    path: "/",
    maxAge: SESSION_TTL_SECONDS * 1000,
  });
}

export function clearSessionCookie(res: Response): void {
  res.clearCookie(SESSION_COOKIE, { httpOnly: true, sameSite: "strict", secure: config.cookieSecure, path: "/" });
}
