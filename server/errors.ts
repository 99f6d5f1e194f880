import type { ErrorRequestHandler } from "express";
import { ZodError, type ZodType, z } from "zod";
import { BaseError, ConnectionError, ForeignKeyConstraintError, UniqueConstraintError } from "sequelize";
import { logger } from "./logger";

/** Every failure a service means to report: status, a stable code and a sentence for a person. */
export class AppError extends Error {
  constructor(
    readonly status: number,
    readonly code: string,
    message: string,
    readonly details?: unknown,
  ) {
    super(message);
    this.name = new.target.name;
  }
}

export class BadRequestError extends AppError {
  constructor(message: string, details?: unknown) {
    super(400, "bad_request", message, details);
  }
}
export class UnauthorizedError extends AppError {
  constructor(message = "Sign in to continue.") {
    super(401, "unauthorized", message);
  }
}
export class ForbiddenError extends AppError {
  constructor(message = "Your role does not allow this.", code = "forbidden") {
    super(403, code, message);
  }
}
export class NotFoundError extends AppError {
  constructor(message = "Not found.") {
    super(404, "not_found", message);
  }
}
export class ConflictError extends AppError {
  constructor(message: string, details?: unknown) {
    super(409, "conflict", message, details);
  }
}
export class TooManyRequestsError extends AppError {
  constructor(message = "Too many attempts. Wait a few minutes and try again.") {
    super(429, "too_many_requests", message);
  }
}
export class ServiceUnavailableError extends AppError {
  constructor(message = "The database is not reachable at the moment. Nothing was changed; try again shortly.") {
    super(503, "database_unavailable", message);
  }
}

/** Input that failed its zod schema: 422 with a message per field. */
export class ValidationError extends AppError {
  constructor(error: ZodError, where = "request") {
    const fields: Record<string, string> = {};
    for (const issue of error.issues) {
      const key = issue.path.length ? issue.path.join(".") : "_";
      fields[key] ??= issue.message;
    }
    const first = error.issues[0];
    const lead = first ? `${first.path.length ? `${first.path.join(".")}: ` : ""}${first.message}` : "Invalid input";
    super(422, "validation_failed", `The ${where} is not valid. ${lead}`, { fields });
  }
}

/** Parses input with its schema or throws ValidationError: the one way input enters a service. */
export function parseInput<S extends ZodType>(schema: S, value: unknown, where = "request"): z.output<S> {
  const result = schema.safeParse(value);
  if (!result.success) throw new ValidationError(result.error, where);
  return result.data;
}

function toAppError(err: unknown): AppError {
  if (err instanceof AppError) return err;
  if (err instanceof ZodError) return new ValidationError(err);
  if (err instanceof ConnectionError) return new ServiceUnavailableError();
  if (err instanceof UniqueConstraintError) return new ConflictError("A record with the same key already exists.");
  if (err instanceof ForeignKeyConstraintError) return new ConflictError("This record is still referenced by others.");
  if (err instanceof BaseError && /ECONNREFUSED|connect|Connection/i.test(err.message)) return new ServiceUnavailableError();
  const e = err as { type?: string; status?: number; message?: string };
  if (e?.type === "entity.parse.failed") return new BadRequestError("The request body is not valid JSON.");
  if (e?.type === "entity.too.large") return new AppError(413, "payload_too_large", "The request body is too large.");
  if (typeof e?.status === "number" && e.status >= 400 && e.status < 500) {
    return new AppError(e.status, "bad_request", e.message ?? "Bad request.");
  }
  return new AppError(500, "internal_error", "Something went wrong on our side. The error was logged with its request id.");
}

/** The one error path: every failure leaves as { error: { code, message, details? } }. */
export const errorMiddleware: ErrorRequestHandler = (err, req, res, _next) => {
  const appError = toAppError(err);
  if (appError.status >= 500) {
    logger.error(`[${req.requestId ?? "-"}] ${req.method} ${req.originalUrl}: ${(err as Error)?.stack ?? String(err)}`);
  }
  if (res.headersSent) return;
  res.status(appError.status).json({
    error: {
      code: appError.code,
      message: appError.message,
      ...(appError.details !== undefined ? { details: appError.details } : {}),
      ...(appError.status >= 500 ? { requestId: req.requestId } : {}),
    },
  });
};
