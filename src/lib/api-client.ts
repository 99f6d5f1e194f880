import type { z } from "zod";
import { apiErrorSchema } from "@shared/schemas/common";

/** Every failure of a call to our API, whatever its cause, arrives as one of these. */
export class ApiError extends Error {
  readonly status: number;
  readonly code: string;
  readonly details: unknown;

  constructor(status: number, code: string, message: string, details?: unknown) {
    super(message);
    this.name = "ApiError";
    this.status = status;
    this.code = code;
    this.details = details;
  }
}

export function isApiError(e: unknown): e is ApiError {
  return e instanceof ApiError;
}

/** What to say of a failed call: the server's own message, or `fallback` when none came; nothing without an error. */
export function errorMessage(error: unknown, fallback: string): string | undefined {
  if (!error) return undefined;
  return isApiError(error) ? error.message : fallback;
}

/**
 * Per-field messages from an error's details: either a `fields` map `{ name: "message" }` or a
 * zod treeified error `{ properties: { name: { errors: [...] } } }`.
 */
export function fieldErrorsOf(e: unknown): Record<string, string> {
  if (!isApiError(e) || typeof e.details !== "object" || e.details === null) return {};
  const d = e.details as Record<string, unknown>;
  const out: Record<string, string> = {};
  if (typeof d.fields === "object" && d.fields !== null) {
    for (const [path, v] of Object.entries(d.fields as Record<string, unknown>)) {
      // "supervisorEmails.2" belongs beside the supervisorEmails field; "_" is about the whole form.
      const k = path.split(".")[0];
      if (!k || k === "_" || out[k]) continue;
      if (typeof v === "string") out[k] = v;
      else if (Array.isArray(v) && typeof v[0] === "string") out[k] = v[0];
    }
  }
  if (typeof d.properties === "object" && d.properties !== null) {
    for (const [k, v] of Object.entries(d.properties as Record<string, unknown>)) {
      const errors = (v as { errors?: unknown } | null)?.errors;
      if (Array.isArray(errors) && typeof errors[0] === "string" && !out[k]) out[k] = errors[0];
    }
  }
  return out;
}

/** The ApiError for a failed answer: the server's own `{ error }` body, or a plain sentence when it sent none. */
export function apiErrorFrom(status: number, statusText: string, json: unknown): ApiError {
  const parsed = apiErrorSchema.safeParse(json);
  if (parsed.success) {
    const { code, message, details } = parsed.data.error;
    return new ApiError(status, code, message, details);
  }
  return new ApiError(status, "http_error", `The server answered ${status} ${statusText || ""}`.trim() + ".");
}

/**
 * The row as it now stands, from a 409 `stale` refusal (`details.current`), read with its schema:
 * the one decoder of optimistic-locking refusals. Undefined for any other error.
 */
export function staleCurrent<S extends z.ZodType>(error: unknown, schema: S): z.output<S> | undefined {
  if (!isApiError(error) || error.status !== 409 || error.code !== "stale") return undefined;
  const parsed = schema.safeParse((error.details as { current?: unknown } | null | undefined)?.current);
  return parsed.success ? parsed.data : undefined;
}

/** The refusal when no answer came back at all. */
export function unreachable(): ApiError {
  return new ApiError(0, "network_error", "The server could not be reached. Check your connection and try again.");
}

/** A body's JSON, or undefined when it is empty or not JSON. */
export function jsonOf(text: string): unknown {
  if (text.length === 0) return undefined;
  try {
    return JSON.parse(text);
  } catch {
    return undefined;
  }
}

/**
 * What an answer means, for every way of calling the API (fetch or XMLHttpRequest): a refusal
 * throws the server's ApiError; a success is read with its schema (`what` names the call when the
 * shape is wrong).
 */
export function answerOf<S extends z.ZodType | undefined>(
  answer: { status: number; statusText: string; text: string },
  schema: S,
  what: string,
): S extends z.ZodType ? z.output<S> : void {
  const json = jsonOf(answer.text);
  if (answer.status < 200 || answer.status >= 300) throw apiErrorFrom(answer.status, answer.statusText, json);
  if (!schema) return undefined as never;
  const parsed = schema.safeParse(json);
  if (!parsed.success) {
    // The server and this client disagree on a payload: say so rather than show wrong figures.
    throw new ApiError(
      answer.status,
      "unexpected_response",
      `The server's answer to ${what} did not have the expected shape.`,
      parsed.error.issues,
    );
  }
  return parsed.data as never;
}

/** fetch() on our own origin with the session cookie; a failure to connect becomes `unreachable()`. */
export async function fetchApi(path: string, init: RequestInit = {}): Promise<Response> {
  try {
    return await fetch(path, { ...init, credentials: "same-origin" });
  } catch {
    throw unreachable();
  }
}

type Method = "GET" | "POST" | "PATCH" | "PUT" | "DELETE";

async function request<S extends z.ZodType | undefined>(
  method: Method,
  path: string,
  body: unknown,
  schema: S,
): Promise<S extends z.ZodType ? z.output<S> : void> {
  const headers: Record<string, string> = { Accept: "application/json" };
  const init: RequestInit = { method, headers };
  if (body !== undefined) {
    headers["Content-Type"] = "application/json";
    init.body = JSON.stringify(body);
  }
  const res = await fetchApi(path, init);
  return answerOf(
    { status: res.status, statusText: res.statusText, text: await res.text() },
    schema,
    `${method} ${path}`,
  );
}

export const api = {
  get: <S extends z.ZodType>(path: string, schema: S) => request("GET", path, undefined, schema),
  post: <S extends z.ZodType | undefined = undefined>(path: string, body?: unknown, schema?: S) =>
    request("POST", path, body, schema as S),
  patch: <S extends z.ZodType | undefined = undefined>(path: string, body: unknown, schema?: S) =>
    request("PATCH", path, body, schema as S),
  put: <S extends z.ZodType | undefined = undefined>(path: string, body: unknown, schema?: S) =>
    request("PUT", path, body, schema as S),
  del: (path: string) => request("DELETE", path, undefined, undefined),
};

/** Builds a query string, leaving out empty values. */
export function withQuery(path: string, params: Record<string, string | number | undefined | null>): string {
  const qs = new URLSearchParams();
  for (const [k, v] of Object.entries(params)) if (v !== undefined && v !== null && v !== "") qs.set(k, String(v));
  const s = qs.toString();
  return s ? `${path}?${s}` : path;
}
