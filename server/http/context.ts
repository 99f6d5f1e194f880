import type { Request } from "express";
import type { SessionUser } from "../../shared/schemas/auth";
import { UnauthorizedError, parseInput } from "../errors";
import type { Actor, SignedIn } from "../kit/actor";
import { entityCodeParamSchema, idParamSchema, portfolioCodeParamSchema } from "../../shared/schemas/common";
import { exportFormatParamSchema } from "../../shared/schemas/table-export";

export function actorOf(req: Request): Actor {
  return { user: req.user ?? null, ip: req.ip ?? null, requestId: req.requestId ?? null };
}

export function signedInActor(req: Request): SignedIn {
  if (!req.user) throw new UnauthorizedError();
  return { user: req.user, ip: req.ip ?? null, requestId: req.requestId ?? null };
}

// What the address of a request names, each read by its one schema (422, "The address is not valid", otherwise).

/** The numeric id of /api/…/:id. */
export const idOf = (req: Request) => parseInput(idParamSchema, req.params, "address").id;
/** The entity code of /api/entities/:code/…. */
export const entityCodeOf = (req: Request) => parseInput(entityCodeParamSchema, req.params, "address").code;
/** The portfolio code of /api/portfolios/:code/…, in capitals. */
export const portfolioCodeOf = (req: Request) => parseInput(portfolioCodeParamSchema, req.params, "address").code;
/** The format of a table export, /api/….:format (csv or xlsx). */
export const exportFormatOf = (req: Request) => parseInput(exportFormatParamSchema, req.params, "address").format;

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
