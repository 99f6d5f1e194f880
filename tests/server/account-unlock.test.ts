/**
 * An administrator unlocks an account locked out by failed sign-ins (issue 13 item 4). The lockout policy is the
 * environment's (SIGN_IN_MAX_FAILURES, SIGN_IN_WINDOW_MINUTES; README.md); here a limiter of 3 attempts.
 */
import request from "supertest";
import { afterAll, describe, expect, it } from "vitest";
import { sequelize } from "../../server/db/sequelize";
import { AuditEventModel } from "../../server/models/audit-event";
import { config } from "../../server/config";
import { createTestUser, sessionCookieFor, testApp, TEST_PASSWORD, unique } from "./helpers";

afterAll(() => sequelize.close());

// The server's own account limit, in a namespace of this file's (the address limit is set high so it never bites).
const app = testApp({
  signInLimits: {
    windowMs: 60_000,
    perAccount: config.signIn.perAccount,
    perAddress: 1000,
    namespace: unique("unlock-"),
  },
});

const signIn = (email: string, password: string) => request(app).post("/api/auth/login").send({ email, password });

describe("unlocking an account", () => {
  it("when an account is locked by failed sign-ins, then the users list says until when; an admin's unlock lets the person in at once and is audit-logged", async () => {
    const admin = await sessionCookieFor((await createTestUser("admin")).id);
    const person = await createTestUser("analyst");
    for (let i = 0; i < config.signIn.perAccount; i++) {
      expect((await signIn(person.email, "not the password")).status).toBe(401);
    }
    const refused = await signIn(person.email, TEST_PASSWORD);
    expect(refused.status).toBe(429);
    expect(refused.body.error.message).toBe("Too many sign-in attempts. Wait 1 minute and try again.");

    const list = await request(app).get("/api/users").set("Cookie", admin);
    const listed = list.body.find((u: { id: number }) => u.id === person.id);
    expect(Date.parse(listed.lockedUntil)).toBeGreaterThan(Date.now());

    const unlocked = await request(app).post(`/api/users/${person.id}/unlock`).set("Cookie", admin);
    expect(unlocked.status).toBe(200);
    expect(unlocked.body).toMatchObject({ id: person.id, lockedUntil: null });
    const audit = await AuditEventModel.findOne({ where: { action: "user.unlock", target: person.email } });
    // The refused attempt counted too: the limit's failures and the one refused.
    expect(JSON.parse(audit!.beforeJson!)).toMatchObject({ failedSignIns: config.signIn.perAccount + 1 });

    expect((await signIn(person.email, TEST_PASSWORD)).status).toBe(200);
    const after = await request(app).get("/api/users").set("Cookie", admin);
    expect(after.body.find((u: { id: number }) => u.id === person.id).lockedUntil).toBeNull();
  });

  it("when the account is not locked, then unlocking is 409 and nothing is logged; a non-admin may not unlock", async () => {
    const admin = await sessionCookieFor((await createTestUser("admin")).id);
    const person = await createTestUser("analyst");
    const res = await request(app).post(`/api/users/${person.id}/unlock`).set("Cookie", admin);
    expect(res.status).toBe(409);
    expect(res.body.error.message).toBe(`Test analyst (${person.email}) is not locked out; nothing to unlock.`);
    expect(await AuditEventModel.count({ where: { action: "user.unlock", target: person.email } })).toBe(0);
    const cro = await sessionCookieFor((await createTestUser("cro")).id);
    expect((await request(app).post(`/api/users/${person.id}/unlock`).set("Cookie", cro)).status).toBe(403);
  });
});
