import type { Request } from "express";
import type { SessionUser } from "../../shared/schemas/auth";
import { UnauthorizedError } from "../errors";
import type { Actor, SignedIn } from "../kit/actor";

export function actorOf(req: Request): Actor {
  return { user: req.user ?? null, ip: req.ip ?? null, requestId: req.requestId ?? null };
}

export function signedInActor(req: Request): SignedIn {
  if (!req.user) throw new UnauthorizedError();
  return { user: req.user, ip: req.ip ?? null, requestId: req.requestId ?? null };
}

declare global {
  // eslint-disable-next-line @typescript-eslint/no-namespace
  namespace Express {
    interface Request {
      user?: SessionUser;
      /** How `user` signed in: the browser's session cookie, or a personal API token (read-only). */
      credential?: "session" | "api-token";
      requestId: string;
    }
  }
}
