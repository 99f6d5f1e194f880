import request from "supertest";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { sequelize } from "../../server/db/sequelize";
import { POLICY, type Access } from "../../server/http/policy";
import { roleSchema, type Role } from "../../shared/schemas/common";
import { createTestEntity, createTestPortfolio, createTestUser, sessionCookieFor, testApp } from "./helpers";

const app = testApp();
const ROLES = roleSchema.options;

interface Layer {
  route?: { path: string; methods: Record<string, boolean> };
  handle?: { stack?: Layer[] };
}

/** Every method + path the Express app has registered, found by walking its router stacks. */
function registeredRoutes(): string[] {
  const found: string[] = [];
  const walk = (stack: Layer[]) => {
    for (const layer of stack) {
      if (layer.route) {
        for (const [method, on] of Object.entries(layer.route.methods)) {
          if (on && method !== "_all") found.push(`${method.toUpperCase()} ${layer.route.path}`);
        }
      } else if (layer.handle?.stack) {
        walk(layer.handle.stack);
      }
    }
  };
  walk((app as unknown as { router: { stack: Layer[] } }).router.stack);
  return found.filter((r) => r.includes(" /api/"));
}

function allows(access: Access, role: Role): boolean {
  return access === "public" || access === "signed-in" || access.includes(role);
}

const cookies = new Map<Role, number>();
let params: Record<string, string>;

beforeAll(async () => {
  for (const role of ROLES) cookies.set(role, (await createTestUser(role)).id);
  const entity = await createTestEntity();
  const portfolio = await createTestPortfolio(entity, "P", "P");
  const someUser = await createTestUser("analyst");
  params = {
    code: entity.code,
    portfolio: portfolio.code,
    date: "2031-12-25",
    id: String(someUser.id),
    userId: String(cookies.get("regulator")),
    entityCode: entity.code,
    index: "0",
    format: "csv",
  };
});
afterAll(() => sequelize.close());

function concrete(path: string): string {
  return path.replace(/:(\w+)/g, (_m, name: string) => {
    if (!(name in params)) throw new Error(`no test value for :${name}`);
    return params[name];
  });
}

describe("the access policy table", () => {
  it("when the app starts, then every API route it registers is in the policy table and every table entry is registered", () => {
    const registered = registeredRoutes().sort();
    const table = Object.keys(POLICY).sort();
    expect(registered).toEqual(table);
  });

  // Logout revokes the caller's session, so it runs last; each call uses a cookie of the current token version.
  const keys = Object.keys(POLICY).sort((a, b) => Number(a.endsWith("/logout")) - Number(b.endsWith("/logout")));
  for (const key of keys) {
    const access = POLICY[key as keyof typeof POLICY] as Access;
    const [method, path] = key.split(" ") as [string, string];

    it(`${key}: without a session → ${access === "public" ? "not 401" : "401"}`, async () => {
      const verb = method.toLowerCase() as "get";
      const call = request(app)[verb](concrete(path));
      const res = await call.send(method === "GET" ? undefined : {});
      if (access === "public") expect(res.status).not.toBe(401);
      else {
        expect(res.status).toBe(401);
        expect(res.body.error.code).toBe("unauthorized");
      }
    });

    for (const role of ROLES) {
      const allowed = allows(access, role);
      it(`${key} as ${role} → ${allowed ? "allowed" : "403"}`, async () => {
        const cookie = await sessionCookieFor(cookies.get(role)!);
        const call = request(app)[method.toLowerCase() as "get"](concrete(path)).set("Cookie", cookie);
        const res = await (method === "GET" || method === "DELETE" ? call : call.send({}));
        if (allowed) {
          expect([401, 403]).not.toContain(res.status);
        } else {
          expect(res.status).toBe(403);
          expect(res.body.error.code).toBe("forbidden");
        }
      });
    }
  }
});

// Written out by hand from docs/architecture.md#roles, independently of the policy table, so that a wrong entry
// in the table cannot pass by agreeing with itself.
const MUST_REFUSE: [Role, string][] = [
  ...(["treasury", "regulator"] as const).flatMap((role): [Role, string][] => [
    [role, "GET /api/overview"],
    [role, "GET /api/portfolios/:code/backtest"],
    [role, "GET /api/portfolios/:code/rolling"],
    [role, "GET /api/portfolios/:code/observations"],
    [role, "GET /api/evidence/:id"],
    [role, "GET /api/uploads"],
    [role, "POST /api/uploads"],
    [role, "GET /api/findings"],
    [role, "PUT /api/portfolios/:code/exceptions/:date/review"],
    [role, "PUT /api/portfolios/:code/exceptions/:date/decision"],
    [role, "GET /api/users"],
    [role, "GET /api/audit-events"],
  ]),
  ["admin", "PUT /api/portfolios/:code/exceptions/:date/decision"], // no sign-off rights
  ["admin", "POST /api/uploads/:id/commit"],
  ["analyst", "PUT /api/portfolios/:code/exceptions/:date/decision"], // the CRO records decisions
  ["cro", "POST /api/uploads"], // the CRO reads data; analysts bring it in
  ["analyst", "POST /api/users"],
  // Separation of duties: only administrators send set-password links and decide role grants.
  ["cro", "POST /api/users/:id/password-link"],
  ["analyst", "POST /api/role-requests"],
  ["cro", "POST /api/role-requests/:id/approve"],
  ["treasury", "GET /api/invitations"],
  ["cro", "PATCH /api/entities/:code"],
  // Quarter close: the analyst prepares, the CRO signs off; admin has no sign-off rights.
  ["admin", "POST /api/snapshots"],
  ["admin", "POST /api/snapshots/:id/approve"],
  ["analyst", "POST /api/snapshots/:id/approve"],
  ["analyst", "POST /api/snapshots/:id/return"],
  ["cro", "POST /api/snapshots"],
  ["treasury", "POST /api/snapshots"],
  ["treasury", "POST /api/snapshots/:id/approve"],
  ["regulator", "GET /api/snapshots"],
  ["regulator", "POST /api/snapshots/:id/approve"],
  // Capital planning on current data is the reporting office's and treasury's, not the supervisor's.
  ["regulator", "GET /api/entities/:code/capital/forecast"],
  ["regulator", "POST /api/entities/:code/capital/what-if"],
  ["admin", "GET /api/entities/:code/capital/forecast"],
  // The development mail outbox is the administrator's alone.
  ...(["analyst", "cro", "treasury", "regulator"] as const).map((role): [Role, string] => [
    role,
    "GET /api/admin/outbox/:id/attachments/:index",
  ]),
];

describe("what the roles forbid (docs/architecture.md#roles), checked without the policy table", () => {
  for (const [role, key] of MUST_REFUSE) {
    it(`${key} as ${role} → 403`, async () => {
      const [method, path] = key.split(" ") as [string, string];
      const cookie = await sessionCookieFor(cookies.get(role)!);
      const verb = method.toLowerCase() as "get";
      const call = request(app)[verb](concrete(path).replace(":id", "1")).set("Cookie", cookie);
      const res = await (method === "GET" || method === "DELETE" ? call : call.send({}));
      expect(res.status).toBe(403);
    });
  }
});
