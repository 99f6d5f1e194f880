import type { RequestHandler, Response } from "express";
import { config } from "../../config";
import { logger } from "../../logger";
import { recordAudit } from "../audit/audit.service";
import { resolveSession } from "./auth.service";
import { SESSION_COOKIE, SESSION_TTL_SECONDS } from "./tokens";

// Forged or malformed cookies are audited once per address and minute, and logged otherwise,
// so the failure is on record without letting anyone fill the audit log.
const lastForgeryAudit = new Map<string, number>();
function firstForgeryThisMinute(ip: string): boolean {
  const now = Date.now();
  if ((lastForgeryAudit.get(ip) ?? 0) > now - 60_000) return false;
  if (lastForgeryAudit.size > 10_000) lastForgeryAudit.clear();
  lastForgeryAudit.set(ip, now);
  return true;
}

/** Attaches req.user when the session cookie is valid; a bad token is logged and ignored here (guards answer 401). */
export const sessionMiddleware: RequestHandler = async (req, res, next) => {
  const token: unknown = req.cookies?.[SESSION_COOKIE];
  if (typeof token !== "string" || token === "") return next();
  const session = await resolveSession(token);
  if ("user" in session) {
    req.user = session.user;
    return next();
  }
  clearSessionCookie(res);
  if (session.genuine || firstForgeryThisMinute(req.ip ?? "unknown")) {
    await recordAudit({ user: null, ip: req.ip ?? null, requestId: req.requestId }, "auth.session_rejected", null, {
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
