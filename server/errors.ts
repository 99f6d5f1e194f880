import type { ErrorRequestHandler } from "express";
import { ZodError, type ZodType, z } from "zod";
import {
  BaseError,
  ConnectionAcquireTimeoutError,
  ConnectionError,
  ForeignKeyConstraintError,
  UniqueConstraintError,
} from "sequelize";
import multer from "multer";
import { UPLOAD_MAX_LABEL } from "../shared/schemas/upload";
import { EngineInputError } from "../shared/backtest/errors";
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

/** An AppError of one status and code whose message the caller writes, with details where they help. */
function errorWithDetails(status: number, code: string) {
  return class extends AppError {
    constructor(message: string, details?: unknown) {
      super(status, code, message, details);
    }
  };
}

/** An AppError of one status and code with a message that fits most cases. */
function errorWithMessage(status: number, code: string, defaultMessage: string) {
  return class extends AppError {
    constructor(message = defaultMessage) {
      super(status, code, message);
    }
  };
}

export class BadRequestError extends errorWithDetails(400, "bad_request") {}
export class UnauthorizedError extends errorWithMessage(401, "unauthorized", "Sign in to continue.") {}
export class ForbiddenError extends AppError {
  constructor(message = "Your role does not allow this.", code = "forbidden") {
    super(403, code, message);
  }
}
export class NotFoundError extends errorWithMessage(404, "not_found", "Not found.") {}
export class ConflictError extends errorWithDetails(409, "conflict") {}
export class TooManyRequestsError extends errorWithMessage(
  429,
  "too_many_requests",
  "Too many attempts. Wait a few minutes and try again.",
) {}
export class ServiceUnavailableError extends errorWithMessage(
  503,
  "database_unavailable",
  "The database is not reachable at the moment. Nothing was changed; try again shortly.",
) {}

/** Too much at once: the request was not started; the client may try again after `retryAfterSeconds`. */
export class ServerBusyError extends AppError {
  constructor(
    what: string,
    readonly retryAfterSeconds = 5,
  ) {
    super(503, "busy", `${what} Nothing was changed; try again in a few seconds.`);
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

const MULTER_MESSAGES: Record<string, [number, string]> = {
  LIMIT_FILE_SIZE: [413, `The file is larger than the ${UPLOAD_MAX_LABEL} limit. Split it into smaller files.`],
  LIMIT_FILE_COUNT: [400, "Send one file at a time."],
  LIMIT_UNEXPECTED_FILE: [400, 'Send exactly one file, in the form field "file".'],
  LIMIT_FIELD_COUNT: [400, 'Only the form field "file" is accepted.'],
  LIMIT_PART_COUNT: [400, 'Send exactly one file, in the form field "file", and nothing else.'],
};

// Driver codes that mean the database went away mid-request (MariaDB connector / server).
const LOST_CONNECTION = new Set([
  "ECONNREFUSED",
  "ECONNRESET",
  "EPIPE",
  "ER_CONNECTION_KILLED",
  "ER_SOCKET_UNEXPECTED_CLOSE",
  "ER_CMD_CONNECTION_CLOSED",
  "ER_CONNECTION_ALREADY_CLOSED",
  "ER_GET_CONNECTION_TIMEOUT",
  "ER_SERVER_SHUTDOWN",
  "ER_QUERY_INTERRUPTED",
  "ER_CONNECTION_TIMEOUT",
  "ER_CLOSING_POOL",
]);

function lostConnection(err: unknown): boolean {
  const chain = [err, (err as { parent?: unknown })?.parent, (err as { original?: unknown })?.original];
  return chain.some((e) => {
    const x = e as { code?: string; errno?: number; fatal?: boolean } | undefined;
    return (
      !!x &&
      ((x.code !== undefined && LOST_CONNECTION.has(x.code)) ||
        x.errno === 1927 ||
        x.errno === 1053 ||
        x.errno === 2006 ||
        x.errno === 2013)
    );
  });
}

/** Two writers collided on the same row: a unique key taken a moment ago, or a deadlock the database broke. */
export function isWriteConflict(err: unknown): boolean {
  if (err instanceof UniqueConstraintError) return true;
  const chain = [err, (err as { parent?: unknown })?.parent, (err as { original?: unknown })?.original];
  return chain.some((e) => {
    const x = e as { errno?: number; code?: string } | undefined;
    // 1062: a duplicate key from a raw driver query (bulk writes), which Sequelize has not wrapped.
    return (
      !!x &&
      (x.errno === 1213 ||
        x.errno === 1205 ||
        x.errno === 1062 ||
        x.code === "ER_LOCK_DEADLOCK" ||
        x.code === "ER_LOCK_WAIT_TIMEOUT" ||
        x.code === "ER_DUP_ENTRY")
    );
  });
}

function toAppError(err: unknown): AppError {
  if (err instanceof AppError) return err;
  if (err instanceof multer.MulterError) {
    const [status, message] = MULTER_MESSAGES[err.code] ?? [400, err.message];
    return new AppError(status, status === 413 ? "payload_too_large" : "bad_upload", message);
  }
  // Every pooled connection stayed taken for the whole wait: busy, not broken.
  if (err instanceof ConnectionAcquireTimeoutError)
    return new ServerBusyError("The database is busy with other requests.");
  if (lostConnection(err)) return new ServiceUnavailableError();
  // The engine refuses inputs it cannot compute on (e.g. a forecast date before the as-of date).
  if (err instanceof EngineInputError) return new AppError(422, "cannot_compute", err.message);
  if (err instanceof ZodError) return new ValidationError(err);
  if (err instanceof ConnectionError) return new ServiceUnavailableError();
  if (err instanceof UniqueConstraintError) return new ConflictError("A record with the same key already exists.");
  if (isWriteConflict(err))
    return new ConflictError("Someone else was changing the same record at the same moment. Reload and try again.");
  if (err instanceof ForeignKeyConstraintError) return new ConflictError("This record is still referenced by others.");
  if (err instanceof BaseError && /ECONNREFUSED|connect|Connection/i.test(err.message))
    return new ServiceUnavailableError();
  const e = err as { type?: string; status?: number; message?: string };
  if (e?.type === "entity.parse.failed") return new BadRequestError("The request body is not valid JSON.");
  if (e?.type === "entity.too.large") return new AppError(413, "payload_too_large", "The request body is too large.");
  if (typeof e?.status === "number" && e.status >= 400 && e.status < 500) {
    return new AppError(e.status, "bad_request", e.message ?? "Bad request.");
  }
  return new AppError(
    500,
    "internal_error",
    "Something went wrong on our side. The error was logged with its request id.",
  );
}

/** The one error path: every failure leaves as { error: { code, message, details? } }. */
export const errorMiddleware: ErrorRequestHandler = (err, req, res, next) => {
  const appError = toAppError(err);
  if (appError.status === 500) {
    logger.error(`[${req.requestId ?? "-"}] ${req.method} ${req.originalUrl}: ${(err as Error)?.stack ?? String(err)}`);
  } else if (appError.status === 503 && !(appError instanceof ServerBusyError)) {
    const cause = err as { code?: string; parent?: { code?: string } };
    logger.error(
      `[${req.requestId ?? "-"}] ${req.method} ${req.originalUrl}: database unavailable (${cause?.parent?.code ?? cause?.code ?? "no code"})`,
    );
  }
  if (res.headersSent) return next(err); // Express closes the half-sent response
  if (appError instanceof ServerBusyError) res.setHeader("Retry-After", String(appError.retryAfterSeconds));
  res.status(appError.status).json({
    error: {
      code: appError.code,
      message: appError.message,
      ...(appError.details !== undefined ? { details: appError.details } : {}),
      ...(appError.status >= 500 ? { requestId: req.requestId } : {}),
    },
  });
};
