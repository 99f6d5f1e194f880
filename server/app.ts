import express, { type RequestHandler } from "express";
import helmet from "helmet";
import cookieParser from "cookie-parser";
import { randomUUID } from "node:crypto";
import { existsSync } from "node:fs";
import path from "node:path";
import { config } from "./config";
import { AppError, errorMiddleware, ForbiddenError, NotFoundError } from "./errors";
import { sessionMiddleware } from "./modules/auth/session.middleware";
import { authRouter, DEFAULT_SIGN_IN_LIMITS, type SignInLimits } from "./modules/auth/auth.router";
import { healthRouter } from "./modules/health/health.router";
import { usersRouter } from "./modules/users/users.router";
import { entitiesRouter } from "./modules/entities/entities.router";
import { assignmentsRouter } from "./modules/assignments/assignments.router";
import { auditRouter } from "./modules/audit/audit.router";
import { uploadsRouter, type UploadLimits } from "./modules/uploads/uploads.router";
import { observationsRouter } from "./modules/observations/observations.router";
import { findingsRouter } from "./modules/findings/findings.router";
import { backtestRouter } from "./modules/backtest/backtest.router";
import { reviewsRouter } from "./modules/reviews/reviews.router";
import { snapshotsRouter } from "./modules/snapshots/snapshots.router";
import { determinationsRouter } from "./modules/determinations/determinations.router";
import { settingsRouter } from "./modules/settings/settings.router";
import { capitalRouter } from "./modules/capital/capital.router";
import { filingsRouter } from "./modules/filings/filings.router";
import { apiTokensRouter } from "./modules/api-tokens/api-tokens.router";
import { outboxRouter } from "./modules/outbox/outbox.router";
import { notificationsRouter } from "./modules/notifications/notifications.router";
import { queueRouter } from "./modules/queue/queue.router";
import { noticesRouter } from "./modules/notices/notices.router";
import {
  DEFAULT_INVITATION_LIMITS,
  invitationsRouter,
  type InvitationLimits,
} from "./modules/invitations/invitations.router";

export interface AppOptions {
  signInLimits?: SignInLimits;
  /** The Host header values the app answers to (default: config.allowedHosts, from ALLOWED_HOSTS). */
  allowedHosts?: readonly string[];
  /** The proxies whose X-Forwarded-For is believed (default: config.trustProxy, from TRUST_PROXY). */
  trustProxy?: readonly string[];
  invitationLimits?: InvitationLimits;
  /** The turns large uploads take (tests hold one to see the queue refuse). */
  uploadLimits?: UploadLimits;
  /** Serve the built client from dist/client (when it exists). */
  serveClient?: boolean;
}

/** Every request gets an id, sent back as X-Request-Id and written beside any 500 in the log. */
export const requestId: RequestHandler = (req, res, next) => {
  req.requestId = randomUUID();
  res.setHeader("X-Request-Id", req.requestId);
  next();
};

function hostOf(url: string): string | null {
  return URL.canParse(url) ? new URL(url).host : null;
}

/**
 * Answers only to the host names it is configured for (ALLOWED_HOSTS): a page on another name
 * that resolves to this machine (DNS rebinding) gets 421 and nothing else. An entry without a
 * port allows that name on any port.
 */
export function hostAllowlist(allowed: readonly string[]): RequestHandler {
  const known = new Set(allowed.map((h) => h.toLowerCase()));
  return (req, _res, next) => {
    const host = (req.headers.host ?? "").toLowerCase();
    const colon = host.lastIndexOf(":");
    const name = colon > host.lastIndexOf("]") ? host.slice(0, colon) : host;
    if (host && (known.has(host) || known.has(name))) return next();
    next(
      new AppError(
        421,
        "unknown_host",
        `This server does not answer to the host name "${host.slice(0, 100)}". Use the address it is configured for.`,
      ),
    );
  };
}

/** Refuses state-changing requests that another site's page sent (SameSite=Strict is the first line). */
const sameOriginOnly: RequestHandler = (req, _res, next) => {
  if (req.method === "GET" || req.method === "HEAD" || req.method === "OPTIONS") return next();
  if (req.get("sec-fetch-site") === "cross-site")
    return next(new ForbiddenError("Cross-site requests are refused.", "cross_origin"));
  const origin = req.get("origin");
  if (origin && origin !== "null") {
    if (hostOf(origin) !== req.get("host"))
      return next(new ForbiddenError("Cross-origin requests are refused.", "cross_origin"));
  } else if (origin === "null") {
    return next(new ForbiddenError("Cross-origin requests are refused.", "cross_origin"));
  }
  next();
};

/** Builds the Express app: middleware, routers, error handler. Listening is server/index.ts's job. */
export function createApp(options: AppOptions = {}) {
  const app = express();
  app.disable("x-powered-by");
  // Only the proxies TRUST_PROXY names may say who the client is; otherwise the socket's address
  // is the client's (a header anyone can send must not pick the sign-in limit's key or the audit address).
  const trusted = options.trustProxy ?? config.trustProxy;
  app.set("trust proxy", trusted.length ? [...trusted] : false);
  app.use(requestId);
  // Over plain http on loopback (development), asking the browser to upgrade to https would break every asset.
  app.use(
    helmet({
      contentSecurityPolicy: { directives: { upgradeInsecureRequests: config.cookieSecure ? [] : null } },
      strictTransportSecurity: config.cookieSecure,
    }),
  );
  app.use(hostAllowlist(options.allowedHosts ?? config.allowedHosts));
  app.use(express.json({ limit: "1mb" }));
  app.use(cookieParser());
  app.use(sameOriginOnly);
  app.use(sessionMiddleware);
  app.use((_req, res, next) => {
    res.setHeader("Cache-Control", "no-store");
    next();
  });

  app.use(healthRouter());
  app.use(authRouter(options.signInLimits ?? DEFAULT_SIGN_IN_LIMITS));
  app.use(entitiesRouter());
  app.use(usersRouter());
  app.use(invitationsRouter(options.invitationLimits ?? DEFAULT_INVITATION_LIMITS));
  app.use(assignmentsRouter());
  app.use(auditRouter());
  app.use(uploadsRouter(options.uploadLimits));
  app.use(observationsRouter());
  app.use(findingsRouter());
  app.use(backtestRouter());
  app.use(reviewsRouter());
  app.use(snapshotsRouter());
  app.use(capitalRouter());
  app.use(determinationsRouter());
  app.use(settingsRouter());
  app.use(filingsRouter());
  app.use(apiTokensRouter());
  app.use(outboxRouter());
  app.use(queueRouter());
  app.use(noticesRouter());
  app.use(notificationsRouter());

  app.use("/api", (req, _res, next) => next(new NotFoundError(`No API route ${req.method} ${req.originalUrl}.`)));

  if (options.serveClient && existsSync(path.join(config.clientDir, "index.html"))) {
    app.use(express.static(config.clientDir, { index: false, maxAge: "1h" }));
    app.get("/{*splat}", (_req, res) => {
      res.setHeader("Cache-Control", "no-cache");
      res.sendFile(path.join(config.clientDir, "index.html"));
    });
  }

  app.use(errorMiddleware);
  return app;
}
