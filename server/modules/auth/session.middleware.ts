import type { RequestHandler, Response } from "express";
import { config } from "../../config";
import { recordAudit } from "../audit/audit.service";
import { resolveSession } from "./auth.service";
import { SESSION_COOKIE, SESSION_TTL_SECONDS } from "./tokens";

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
  await recordAudit({ user: null, ip: req.ip ?? null, requestId: req.requestId }, "auth.session_rejected", null, {
    after: { reason: session.reason, path: req.path },
  });
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
