import { Router, type RequestHandler } from "express";
import { accessFor, type Access } from "./policy";
import { ForbiddenError, UnauthorizedError } from "../errors";

type Method = "get" | "post" | "put" | "patch" | "delete";

function authorize(access: Access): RequestHandler {
  return (req, _res, next) => {
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
      router[method](path, authorize(access), ...handlers);
    };
  return { router, get: add("get"), post: add("post"), put: add("put"), patch: add("patch"), delete: add("delete") };
}
