import request from "supertest";
import jwt from "jsonwebtoken";
import { afterAll, describe, expect, it } from "vitest";
import { config } from "../../server/config";
import { sequelize } from "../../server/db/sequelize";
import { AuditEventModel } from "../../server/models/audit-event";
import { UserModel } from "../../server/models/user";
import { SESSION_COOKIE } from "../../server/modules/auth/tokens";
import { cookieFrom, createTestUser, sessionCookieFor, signIn, testApp, TEST_PASSWORD, unique } from "./helpers";
import { editUser } from "./support/user-edits";

const app = testApp();
afterAll(() => sequelize.close());

function forge(payload: object, key = config.jwtSecret, options: jwt.SignOptions = {}) {
  return jwt.sign(payload, key, {
    algorithm: "HS256",
    issuer: "quartermark",
    audience: "quartermark-web",
    expiresIn: 600,
    ...options,
  });
}

describe("signing in", () => {
  it("when the password is right, then the user is returned and the session travels only in an HttpOnly SameSite=Strict cookie", async () => {
    const user = await createTestUser("analyst");
    const res = await request(app).post("/api/auth/login").send({ email: user.email, password: TEST_PASSWORD });
    expect(res.status).toBe(200);
    expect(res.body).toEqual({ user: { id: user.id, email: user.email, name: user.name, role: "analyst" } });
    expect(JSON.stringify(res.body)).not.toMatch(/eyJ/); // no token in the body
    const cookie = cookieFrom(res)!;
    expect(cookie).toMatch(/HttpOnly/i);
    expect(cookie).toMatch(/SameSite=Strict/i);
    const me = await request(app).get("/api/auth/me").set("Cookie", cookie.split(";")[0]);
    expect(me.status).toBe(200);
    expect(me.body.user.role).toBe("analyst");
    const row = await UserModel.findByPk(user.id);
    expect(row!.lastSignInAt).not.toBeNull();
    expect(await AuditEventModel.count({ where: { action: "auth.sign_in", target: user.email } })).toBe(1);
  });

  it("when the e-mail is typed in capitals, then it still signs in", async () => {
    const user = await createTestUser("cro");
    const res = await request(app)
      .post("/api/auth/login")
      .send({ email: user.email.toUpperCase(), password: TEST_PASSWORD });
    expect(res.status).toBe(200);
  });

  it("when the password is wrong or the e-mail unknown, then 401 with the same message and a failed sign-in in the audit log", async () => {
    const user = await createTestUser("analyst");
    const wrong = await request(app).post("/api/auth/login").send({ email: user.email, password: "not the password" });
    const unknown = await request(app)
      .post("/api/auth/login")
      .send({ email: `nobody-${unique()}@x.test`, password: "whatever" });
    expect(wrong.status).toBe(401);
    expect(unknown.status).toBe(401);
    expect(wrong.body.error.message).toBe(unknown.body.error.message);
    expect(cookieFrom(wrong)).toBeUndefined();
    const failed = await AuditEventModel.findOne({ where: { action: "auth.sign_in_failed", target: user.email } });
    expect(JSON.parse(failed!.afterJson!)).toEqual({ reason: "wrong password" });
  });

  it("when the password is longer than 72 bytes, then 422 says so instead of silently truncating", async () => {
    const user = await createTestUser("analyst");
    const res = await request(app)
      .post("/api/auth/login")
      .send({ email: user.email, password: `${TEST_PASSWORD}${"é".repeat(30)}` });
    expect(res.status).toBe(422);
    expect(res.body.error.code).toBe("validation_failed");
    expect(res.body.error.message).toMatch(/72 bytes/);
    expect(res.body.error.details.fields.password).toMatch(/72 bytes/);
  });

  it("when the account is disabled, then sign-in is refused like a wrong password", async () => {
    const user = await createTestUser("treasury", { disabled: true });
    const res = await request(app).post("/api/auth/login").send({ email: user.email, password: TEST_PASSWORD });
    expect(res.status).toBe(401);
  });
});

describe("session tokens", () => {
  it("when a token is tampered with, unsigned (alg none), expired or signed with another key, then 401 and the failure is in the audit log (forgeries once per address and minute)", async () => {
    const user = await createTestUser("admin");
    const valid = (await sessionCookieFor(user.id)).split("=")[1];
    const [h, , s] = valid.split(".");
    const editedPayload = Buffer.from(
      JSON.stringify({ sub: String(user.id), tv: 1, iss: "quartermark", aud: "quartermark-web", exp: 9999999999 }),
    ).toString("base64url");
    const none = `${Buffer.from(JSON.stringify({ alg: "none", typ: "JWT" })).toString("base64url")}.${editedPayload}.`;
    const tokens = {
      tampered: `${h}.${editedPayload}.${s}`,
      algNone: none,
      expired: forge({ sub: String(user.id), tv: 1 }, config.jwtSecret, { expiresIn: -10 }),
      otherKey: forge({ sub: String(user.id), tv: 1 }, "another-secret-another-secret-another-secret"),
    };
    const before = await AuditEventModel.count({ where: { action: "auth.session_rejected" } });
    for (const [kind, token] of Object.entries(tokens)) {
      const res = await request(app).get("/api/users").set("Cookie", `${SESSION_COOKIE}=${token}`);
      expect(res.status, kind).toBe(401);
      expect(res.body.error.code, kind).toBe("unauthorized");
      expect(res.body, kind).not.toHaveProperty("user");
    }
    // The expired token was ours: audited. The three forgeries from one address: audited once.
    expect(await AuditEventModel.count({ where: { action: "auth.session_rejected" } })).toBe(before + 2);
    // A flood of forged cookies does not flood the audit log.
    for (let i = 0; i < 20; i++)
      await request(app).get("/api/users").set("Cookie", `${SESSION_COOKIE}=${tokens.otherKey}`).expect(401);
    expect(await AuditEventModel.count({ where: { action: "auth.session_rejected" } })).toBe(before + 2);
  });

  it("when the user signs out, then the old cookie replayed gets 401", async () => {
    const user = await createTestUser("analyst");
    const { agent, res } = await signIn(app, user.email);
    const oldCookie = cookieFrom(res)!.split(";")[0];
    expect((await agent.post("/api/auth/logout")).status).toBe(204);
    const replay = await request(app).get("/api/auth/me").set("Cookie", oldCookie);
    expect(replay.status).toBe(401);
  });

  it("when an admin disables a user or changes their role, then that user's existing session is refused at once", async () => {
    const admin = await createTestUser("admin");
    const target1 = await createTestUser("analyst");
    const target2 = await createTestUser("analyst");
    const adminCookie = await sessionCookieFor(admin.id);
    const c1 = await sessionCookieFor(target1.id);
    const c2 = await sessionCookieFor(target2.id);
    expect((await request(app).get("/api/auth/me").set("Cookie", c1)).status).toBe(200);

    await editUser(adminCookie, target1.id, { disabled: true, version: 1 }).expect(200);
    await editUser(adminCookie, target2.id, { role: "treasury", version: 1 }).expect(200);

    expect((await request(app).get("/api/auth/me").set("Cookie", c1)).status).toBe(401);
    expect((await request(app).get("/api/auth/me").set("Cookie", c2)).status).toBe(401);
    // Signing in again gives the new role.
    const { agent } = await signIn(app, target2.email);
    expect((await agent.get("/api/auth/me")).body.user.role).toBe("treasury");
  });
});

describe("sign-in rate limits", () => {
  it("when one account gets too many bad passwords, then 429 with a generic message, even for the right password", async () => {
    const limited = testApp({
      signInLimits: { windowMs: 60_000, perAccount: 3, perAddress: 100, namespace: unique() },
    });
    const user = await createTestUser("analyst");
    for (let i = 0; i < 3; i++) {
      expect(
        (await request(limited).post("/api/auth/login").send({ email: user.email, password: "nope" })).status,
      ).toBe(401);
    }
    const blocked = await request(limited).post("/api/auth/login").send({ email: user.email, password: TEST_PASSWORD });
    expect(blocked.status).toBe(429);
    expect(blocked.body.error.message).toMatch(/too many sign-in attempts/i);
    expect(blocked.body.error.message).not.toMatch(/password|e-mail/i);
    // Another account from the same address is not affected by this account's limit.
    const other = await createTestUser("analyst");
    expect(
      (await request(limited).post("/api/auth/login").send({ email: other.email, password: TEST_PASSWORD })).status,
    ).toBe(200);
  });

  it("when one address tries many accounts, then 429 after the address limit", async () => {
    const limited = testApp({
      signInLimits: { windowMs: 60_000, perAccount: 100, perAddress: 4, namespace: unique() },
    });
    for (let i = 0; i < 4; i++) {
      await request(limited)
        .post("/api/auth/login")
        .send({ email: `spray-${unique()}@x.test`, password: "nope" })
        .expect(401);
    }
    const res = await request(limited)
      .post("/api/auth/login")
      .send({ email: `spray-${unique()}@x.test`, password: "nope" });
    expect(res.status).toBe(429);
  });
});

describe("the session probe", () => {
  it("when nobody is signed in, then 200 with user null; when signed in, then the user", async () => {
    expect((await request(app).get("/api/auth/session")).body).toEqual({ user: null });
    const user = await createTestUser("treasury");
    const res = await request(app)
      .get("/api/auth/session")
      .set("Cookie", await sessionCookieFor(user.id));
    expect(res.status).toBe(200);
    expect(res.body.user).toMatchObject({ id: user.id, role: "treasury" });
  });
});
