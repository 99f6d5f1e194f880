import { Router, type RequestHandler } from "express";
import { accessFor, tokenMayCall, type Access } from "./policy";
import { ForbiddenError, UnauthorizedError } from "../errors";

type Method = "get" | "post" | "put" | "patch" | "delete";

const TOKEN_READ_ONLY =
  "API tokens are read-only: they may read and run the capital what-if, nothing else (creating or revoking tokens included). Sign in to Quartermark to make changes.";

function authorize(key: string, access: Access): RequestHandler {
  return (req, _res, next) => {
    if (req.credential === "api-token" && !tokenMayCall(key))
      return next(new ForbiddenError(TOKEN_READ_ONLY, "token_read_only"));
    if (access === "public") return next();
    if (!req.user) return next(new UnauthorizedError());
    if (access !== "signed-in" && !access.includes(req.user.role)) return next(new ForbiddenError());
    next();
  };
}

/**
 * A router whose every route is looked up in the policy table and guarded by it. Paths are
 * full (/api/...), so the key written here is the key in the table.
 */
export function createGuardedRouter() {
  const router = Router();
  const add =
    (method: Method) =>
    (path: string, ...handlers: RequestHandler[]) => {
      const key = `${method.toUpperCase()} ${path}`;
      const access = accessFor(key);
      if (!access) throw new Error(`Route "${key}" is not in the policy table (server/http/policy.ts)`);
      router[method](path, authorize(key, access), ...handlers);
    };
  return { router, get: add("get"), post: add("post"), put: add("put"), patch: add("patch"), delete: add("delete") };
}
