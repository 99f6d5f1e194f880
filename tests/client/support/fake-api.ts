import { vi } from "vitest";

/**
 * A stand-in for the HTTP server at the network boundary: `globalThis.fetch` answers from a table of
 * "METHOD /path" → reply. Anything not in the table answers 404 so a missing stub shows up plainly.
 */
export type Reply = {
  status: number;
  body?: unknown;
  /** A reply that is not JSON (a PDF): its bytes, sent as they are with `headers`. */
  raw?: BodyInit;
  headers?: Record<string, string>;
};
export type Call = { method: string; path: string; search: string; body: unknown };
type Handler = Reply | ((call: Call) => Reply);

export function fakeApi(routes: Record<string, Handler>) {
  const calls: Call[] = [];
  const fetchStub = vi.fn(async (input: RequestInfo | URL, init?: RequestInit) => {
    const url = new URL(String(input), "http://quartermark.test");
    const method = (init?.method ?? "GET").toUpperCase();
    const call: Call = {
      method,
      path: url.pathname,
      search: url.search,
      body: typeof init?.body === "string" ? JSON.parse(init.body) : undefined,
    };
    calls.push(call);
    const handler = routes[`${method} ${url.pathname}`];
    const reply: Reply = !handler
      ? { status: 404, body: { error: { code: "not_found", message: `No stub for ${method} ${url.pathname}` } } }
      : typeof handler === "function"
        ? handler(call)
        : handler;
    if (reply.raw !== undefined) return new Response(reply.raw, { status: reply.status, headers: reply.headers ?? {} });
    const text = reply.body === undefined ? null : JSON.stringify(reply.body);
    return new Response(text, { status: reply.status, headers: text ? { "Content-Type": "application/json" } : {} });
  });
  vi.stubGlobal("fetch", fetchStub);
  return {
    calls,
    callsTo: (method: string, path: string) => calls.filter((c) => c.method === method && c.path === path),
  };
}

/** The server refusing a call: its status and the one error shape, `{ error: { code, message, details? } }`. */
export function refusal(status: number, code: string, message: string, details?: unknown): Reply {
  return { status, body: { error: details === undefined ? { code, message } : { code, message, details } } };
}

/** What the session probe answers when nobody is signed in. */
export const signedOut: Reply = { status: 200, body: { user: null } };

export function signedInAs(role: "admin" | "analyst" | "cro" | "treasury" | "regulator", name = "Test Person"): Reply {
  return { status: 200, body: { user: { id: 7, email: `${role}@larkspur.test`, name, role } } };
}
