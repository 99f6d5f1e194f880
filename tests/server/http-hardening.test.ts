import request from "supertest";
import { afterAll, describe, expect, it, vi } from "vitest";
import { sequelize } from "../../server/db/sequelize";
import { UserModel } from "../../server/models/user";
import { createTestUser, sessionCookieFor, testApp, unique } from "./helpers";

const app = testApp();
afterAll(() => sequelize.close());

describe("HTTP hardening", () => {
  it("when the database answers, then /api/health says ok and up", async () => {
    const res = await request(app).get("/api/health");
    expect(res.status).toBe(200);
    expect(res.body).toEqual({ status: "ok", db: "up" });
  });

  it("when another site posts with the user's cookie, then 403 and nothing changes", async () => {
    const admin = await createTestUser("admin");
    const cookie = await sessionCookieFor(admin.id);
    const email = `csrf-${unique()}@x.test`;
    const res = await request(app)
      .post("/api/users")
      .set("Cookie", cookie)
      .set("Origin", "https://evil.example")
      .send({ email, name: "X", role: "analyst" });
    expect(res.status).toBe(403);
    expect(res.body.error.code).toBe("cross_origin");
    expect(await UserModel.count({ where: { email } })).toBe(0);
  });

  it("when any response leaves, then it carries security headers and no X-Powered-By — errors included", async () => {
    for (const res of [await request(app).get("/api/health"), await request(app).get("/api/nowhere")]) {
      expect(res.headers["x-powered-by"]).toBeUndefined();
      expect(res.headers["x-content-type-options"]).toBe("nosniff");
      expect(res.headers["content-security-policy"]).toContain("default-src 'self'");
      expect(res.headers["x-request-id"]).toMatch(/^[0-9a-f-]{36}$/);
    }
  });

  it("when an API path does not exist, then a JSON 404 in the common error shape", async () => {
    const res = await request(app).get("/api/nowhere");
    expect(res.status).toBe(404);
    expect(res.body).toEqual({ error: { code: "not_found", message: expect.stringContaining("/api/nowhere") } });
  });

  it("when the body is not valid JSON, then 400 with a clear message and no stack trace", async () => {
    const res = await request(app).post("/api/auth/login").set("Content-Type", "application/json").send('{"email":');
    expect(res.status).toBe(400);
    expect(res.body.error.message).toBe("The request body is not valid JSON.");
    expect(JSON.stringify(res.body)).not.toMatch(/at .*\.ts:\d+/);
  });
});

describe("the one error path", () => {
  it("when a handler throws or rejects, then a JSON 500 with the request id and no stack trace, the error is logged with that id, and the process keeps serving", async () => {
    const { default: express } = await import("express");
    const { errorMiddleware } = await import("../../server/errors");
    const { requestId } = await import("../../server/app");
    const broken = express();
    broken.use(requestId);
    broken.get("/throws", () => {
      throw new Error("secret internals at /srv/app.ts:42");
    });
    broken.get("/rejects", async () => {
      await Promise.reject(new TypeError("cannot read x of undefined"));
    });
    broken.get("/fine", (_req, res) => {
      res.json({ ok: true });
    });
    broken.use(errorMiddleware);

    const logged: string[] = [];
    const spy = vi.spyOn(console, "error").mockImplementation((m: unknown) => void logged.push(String(m)));
    try {
      for (const path of ["/throws", "/rejects"]) {
        const res = await request(broken).get(path);
        expect(res.status).toBe(500);
        expect(res.body.error).toEqual({
          code: "internal_error",
          message: expect.stringContaining("request id"),
          requestId: res.headers["x-request-id"],
        });
        expect(JSON.stringify(res.body)).not.toMatch(/secret internals|TypeError|\.ts:\d+/);
        expect(logged.some((l) => l.includes(res.headers["x-request-id"]))).toBe(true);
      }
    } finally {
      spy.mockRestore();
    }
    expect((await request(broken).get("/fine")).body).toEqual({ ok: true });
  });
});
