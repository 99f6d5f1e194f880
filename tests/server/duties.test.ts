import { createHash } from "node:crypto";
import request from "supertest";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { sequelize } from "../../server/db/sequelize";
import { AuditEventModel } from "../../server/models/audit-event";
import { RoleRequestModel } from "../../server/models/role-request";
import { UserInvitationModel } from "../../server/models/user-invitation";
import { UserModel } from "../../server/models/user";
import type { Role } from "../../shared/schemas/common";
import { cookieFrom, createTestUser, sessionCookieFor, signIn, testApp, TEST_PASSWORD, unique } from "./helpers";
import { latestLinkTokenFor, messagesTo } from "./mail-helpers";
import { editUser } from "./support/user-edits";

const app = testApp();
const STRONG = "tulip-orbit-mosaic-41"; // zxcvbn-ts score 4 (checked by the library, tests/shared/password-policy.test.ts)
const sha256 = (s: string) => createHash("sha256").update(s).digest("hex");

let adminA: { id: number; email: string; cookie: string };
let adminB: { id: number; email: string; cookie: string };

beforeAll(async () => {
  for (const which of ["a", "b"] as const) {
    const u = await createTestUser("admin", { name: `Admin ${which.toUpperCase()}` });
    const entry = { id: u.id, email: u.email, cookie: await sessionCookieFor(u.id) };
    if (which === "a") adminA = entry;
    else adminB = entry;
  }
});
afterAll(() => sequelize.close());

async function invite(role: "analyst" | "treasury" | "cro" | "admin" = "analyst", by = adminA) {
  const email = `invitee-${unique()}@larkspur.test`;
  const res = await request(app).post("/api/users").set("Cookie", by.cookie).send({ email, name: "Nadia Fern", role });
  return { email, res };
}

/** `by` proposes a change of someone's role, which another admin must decide; the caller checks the answer. */
const proposeRole = (by: { cookie: string }, body: { userId: number; role: Role; version: number }) =>
  request(app).post("/api/role-requests").set("Cookie", by.cookie).send(body);

/** `by` approves or rejects a proposed role change; the caller checks the answer. */
const decideRole = (by: { cookie: string }, requestId: number, decision: "approve" | "reject") =>
  request(app).post(`/api/role-requests/${requestId}/${decision}`).set("Cookie", by.cookie);

describe("creating a user by invitation (the admin never sets or learns a password)", () => {
  it("when an admin invites an analyst, then the e-mail carries a one-time link, only its hash is stored, and the invitee chooses a password and is signed in", async () => {
    const { email, res } = await invite();
    expect(res.status).toBe(201);
    expect(res.body.invitation.expiresAt).toMatch(/^\d{4}-/);
    const [mail] = await messagesTo(email);
    expect(mail.subject).toMatch(/choose your password/);
    const token = await latestLinkTokenFor(email);
    const user = (await UserModel.findOne({ where: { email } }))!;
    expect(user.passwordHash).toBeNull();
    const link = (await UserInvitationModel.findOne({ where: { userId: user.id } }))!;
    expect(link.tokenHash).toBe(sha256(token)); // the hash, never the token
    expect(JSON.stringify(await UserInvitationModel.findAll({ raw: true }))).not.toContain(token);
    // 72 h by default (INVITATION_TTL_HOURS)
    expect(link.expiresAt.getTime() - link.createdAt.getTime()).toBeCloseTo(72 * 3600_000, -4);
    // Without a password the account cannot be signed in to.
    expect((await request(app).post("/api/auth/login").send({ email, password: "anything at all" })).status).toBe(401);

    const shown = await request(app).post("/api/invitations/lookup").send({ token });
    expect(shown.status).toBe(200);
    expect(shown.body).toMatchObject({ purpose: "invite", email, name: "Nadia Fern", role: "analyst" });

    const accepted = await request(app).post("/api/invitations/accept").send({ token, password: STRONG });
    expect(accepted.status).toBe(200);
    expect(accepted.body.user).toMatchObject({ email, role: "analyst" });
    const cookie = cookieFrom(accepted)!.split(";")[0];
    expect((await request(app).get("/api/auth/me").set("Cookie", cookie)).body.user.email).toBe(email);
    await signIn(app, email, STRONG);
    expect((await UserInvitationModel.findByPk(link.id))!.usedAt).not.toBeNull();
    expect(await AuditEventModel.count({ where: { action: "invitation.accept", target: email } })).toBe(1);
    expect(await AuditEventModel.count({ where: { action: "user.invite", target: email } })).toBe(1);

    // A used link is refused, and nothing is written.
    const again = await request(app)
      .post("/api/invitations/accept")
      .send({ token, password: "another-orbit-tulip-77" });
    expect(again.status).toBe(410);
    expect(again.body.error.code).toBe("link_used");
    expect(again.body.error.message).toMatch(/already been used/);
    await signIn(app, email, STRONG);
  });

  it("when the invitee picks a weak password or one with their own name, then 422 with the reason and nothing is written", async () => {
    const { email } = await invite();
    const token = await latestLinkTokenFor(email);
    for (const [password, reason] of [
      ["aaaaaaaaaaaa", /Repeated characters/],
      ["123456789012", /commonly used password/],
      ["short-1", /at least 12 characters/],
      ["nadia-fern-orbit-91", /your name or the first part of your e-mail/],
      [`${email.split("@")[0]}-tulip`, /your name or the first part of your e-mail/],
    ] as const) {
      const res = await request(app).post("/api/invitations/accept").send({ token, password });
      expect(res.status, password).toBe(422);
      expect(res.body.error.details.fields.password).toMatch(reason);
    }
    const user = (await UserModel.findOne({ where: { email } }))!;
    expect(user.passwordHash).toBeNull();
    expect((await UserInvitationModel.findOne({ where: { userId: user.id } }))!.usedAt).toBeNull();
  });

  it("when the link expired or is unknown, then a clear message and nothing is written", async () => {
    const { email } = await invite();
    const token = await latestLinkTokenFor(email);
    const user = (await UserModel.findOne({ where: { email } }))!;
    await UserInvitationModel.update({ expiresAt: new Date(Date.now() - 1000) }, { where: { userId: user.id } });
    for (const [path, body] of [
      ["/api/invitations/lookup", { token }],
      ["/api/invitations/accept", { token, password: STRONG }],
    ] as const) {
      const res = await request(app).post(path).send(body);
      expect(res.status).toBe(410);
      expect(res.body.error.code).toBe("link_expired");
      expect(res.body.error.message).toMatch(/expired on .* Ask your administrator to send a new one/);
    }
    expect((await UserModel.findByPk(user.id))!.passwordHash).toBeNull();
    const unknown = await request(app)
      .post("/api/invitations/accept")
      .send({ token: "A".repeat(43), password: STRONG });
    expect(unknown.status).toBe(404);
    expect(unknown.body.error.code).toBe("link_unknown");
    const cut = await request(app)
      .post("/api/invitations/lookup")
      .send({ token: token.slice(0, 20) });
    expect(cut.status).toBe(422);
    expect(cut.body.error.message).toMatch(/not complete/);
  });

  it("when the admin sends the invitation again, then the earlier link stops working and the new one works", async () => {
    const { email } = await invite();
    const first = await latestLinkTokenFor(email);
    const user = (await UserModel.findOne({ where: { email } }))!;
    const resent = await request(app)
      .post(`/api/users/${user.id}/password-link`)
      .set("Cookie", adminA.cookie)
      .send({ version: user.version });
    expect(resent.status).toBe(200);
    expect(resent.body.invitation.purpose).toBe("invite");
    const second = await latestLinkTokenFor(email);
    expect(second).not.toBe(first);
    const old = await request(app).post("/api/invitations/accept").send({ token: first, password: STRONG });
    expect(old.status).toBe(410);
    expect(old.body.error.code).toBe("link_replaced");
    expect((await UserModel.findByPk(user.id))!.passwordHash).toBeNull();
    expect((await request(app).post("/api/invitations/accept").send({ token: second, password: STRONG })).status).toBe(
      200,
    );
  });

  it("when two tabs use the same link at once, then exactly one sets the password", async () => {
    const { email } = await invite();
    const token = await latestLinkTokenFor(email);
    const [a, b] = await Promise.all([
      request(app).post("/api/invitations/accept").send({ token, password: STRONG }),
      request(app).post("/api/invitations/accept").send({ token, password: "mosaic-tulip-orbit-52" }),
    ]);
    expect([a.status, b.status].sort()).toEqual([200, 410]);
    const winner = a.status === 200 ? STRONG : "mosaic-tulip-orbit-52";
    await signIn(app, email, winner);
  });

  it("when an admin sends a reset link to a user with a password, then the old password works until the link is used, and using it ends every session", async () => {
    const user = await createTestUser("treasury");
    const session = await sessionCookieFor(user.id);
    const res = await request(app)
      .post(`/api/users/${user.id}/password-link`)
      .set("Cookie", adminA.cookie)
      .send({ version: 1 });
    expect(res.body.invitation.purpose).toBe("reset");
    expect(JSON.stringify(res.body)).not.toMatch(/set-password#/); // the admin never sees the link
    await signIn(app, user.email); // still the old password
    const token = await latestLinkTokenFor(user.email);
    expect((await request(app).post("/api/invitations/accept").send({ token, password: STRONG })).status).toBe(200);
    expect((await request(app).get("/api/auth/me").set("Cookie", session)).status).toBe(401);
    expect(
      (await request(app).post("/api/auth/login").send({ email: user.email, password: TEST_PASSWORD })).status,
    ).toBe(401);
    await signIn(app, user.email, STRONG);
  });

  it("when an admin tries the old way of setting someone's password, then there is no such route", async () => {
    const user = await createTestUser("analyst");
    const res = await request(app)
      .post(`/api/users/${user.id}/password`)
      .set("Cookie", adminA.cookie)
      .send({ password: "brand new passphrase", version: 1 });
    expect(res.status).toBe(404);
    await signIn(app, user.email);
  });

  it("when someone keeps trying links from one address, then 429 after the limit", async () => {
    const limited = testApp({
      invitationLimits: { windowMs: 60_000, perAddress: 3, namespace: unique("invitation-test-") },
    });
    const codes: number[] = [];
    for (let i = 0; i < 4; i++) {
      codes.push(
        (
          await request(limited)
            .post("/api/invitations/lookup")
            .send({ token: "B".repeat(43) })
        ).status,
      );
    }
    expect(codes).toEqual([404, 404, 404, 429]);
  });
});

describe("changing one's own password", () => {
  it("when the current password is right and the new one strong, then it changes, other sessions end, this one goes on, and the audit log has it", async () => {
    const user = await createTestUser("cro");
    const other = await sessionCookieFor(user.id);
    const { agent } = await signIn(app, user.email);
    const res = await agent.post("/api/auth/password").send({ currentPassword: TEST_PASSWORD, newPassword: STRONG });
    expect(res.status).toBe(200);
    expect((await request(app).get("/api/auth/me").set("Cookie", other)).status).toBe(401);
    expect((await agent.get("/api/auth/me")).status).toBe(200); // the new cookie replaced the old one
    await signIn(app, user.email, STRONG);
    expect(await AuditEventModel.count({ where: { action: "auth.password_change", target: user.email } })).toBe(1);
  });

  it("when the current password is wrong or the new one weak, then 422 beside the field and nothing changes", async () => {
    const user = await createTestUser("analyst");
    const cookie = await sessionCookieFor(user.id);
    const wrong = await request(app)
      .post("/api/auth/password")
      .set("Cookie", cookie)
      .send({ currentPassword: "not my password", newPassword: STRONG });
    expect(wrong.status).toBe(422);
    expect(wrong.body.error.details.fields.currentPassword).toMatch(/not your current password/);
    for (const newPassword of ["aaaaaaaaaaaa", "123456789012"]) {
      const weak = await request(app)
        .post("/api/auth/password")
        .set("Cookie", cookie)
        .send({ currentPassword: TEST_PASSWORD, newPassword });
      expect(weak.status).toBe(422);
      expect(weak.body.error.details.fields.newPassword).toBeTruthy();
    }
    expect((await request(app).get("/api/auth/me").set("Cookie", cookie)).status).toBe(200);
    await signIn(app, user.email);
  });
});

describe("granting or removing the CRO or admin role needs a second admin", () => {
  it("when an admin sets a CRO role directly, then 403 and the role stays", async () => {
    const user = await createTestUser("analyst");
    const res = await editUser(adminA.cookie, user.id, { role: "cro", version: 1 });
    expect(res.status).toBe(403);
    expect(res.body.error.code).toBe("approval_required");
    expect((await UserModel.findByPk(user.id))!.role).toBe("analyst");
  });

  it("when one admin proposes a CRO grant, then nothing changes until another approves; the proposer cannot approve (403); both steps are audited", async () => {
    const user = await createTestUser("analyst");
    const session = await sessionCookieFor(user.id);
    const proposed = await proposeRole(adminA, { userId: user.id, role: "cro", version: 1 });
    expect(proposed.status).toBe(201);
    expect(proposed.body).toMatchObject({
      kind: "change",
      fromRole: "analyst",
      toRole: "cro",
      status: "pending",
      proposedBy: { id: adminA.id },
    });
    expect((await UserModel.findByPk(user.id))!.role).toBe("analyst");
    const list = await request(app).get("/api/role-requests").set("Cookie", adminB.cookie);
    expect(list.body.map((r: { id: number }) => r.id)).toContain(proposed.body.id);

    const own = await decideRole(adminA, proposed.body.id, "approve");
    expect(own.status).toBe(403);
    expect(own.body.error.code).toBe("four_eyes");
    expect((await UserModel.findByPk(user.id))!.role).toBe("analyst");

    const approved = await decideRole(adminB, proposed.body.id, "approve");
    expect(approved.status).toBe(200);
    expect(approved.body).toMatchObject({ status: "approved", decidedBy: { id: adminB.id } });
    const row = (await UserModel.findByPk(user.id))!;
    expect({ role: row.role, version: row.version }).toEqual({ role: "cro", version: 2 });
    expect((await request(app).get("/api/auth/me").set("Cookie", session)).status).toBe(401);
    const propose = await AuditEventModel.findOne({ where: { action: "role_request.propose", target: user.email } });
    const approve = await AuditEventModel.findOne({ where: { action: "role_request.approve", target: user.email } });
    expect(propose!.actorEmail).toBe(adminA.email);
    expect(approve!.actorEmail).toBe(adminB.email);
    expect(JSON.parse(approve!.beforeJson!)).toEqual({ role: "analyst" });

    const twice = await decideRole(adminB, proposed.body.id, "approve");
    expect(twice.status).toBe(409);
  });

  it("when the second admin rejects a removal of the CRO role, then the role stays and the rejection is audited", async () => {
    const user = await createTestUser("cro");
    const proposed = await proposeRole(adminA, { userId: user.id, role: "analyst", version: 1 }).expect(201);
    // While it waits, no other change of the role gets in between.
    const between = await editUser(adminB.cookie, user.id, { role: "treasury", version: 1 });
    expect(between.status).toBe(403); // removing the CRO role needs approval, whichever way
    const second = await proposeRole(adminB, { userId: user.id, role: "treasury", version: 1 });
    expect(second.status).toBe(409);
    const rejected = await decideRole(adminB, proposed.body.id, "reject");
    expect(rejected.status).toBe(200);
    expect(rejected.body.status).toBe("rejected");
    expect((await UserModel.findByPk(user.id))!.role).toBe("cro");
    expect(await AuditEventModel.count({ where: { action: "role_request.reject", target: user.email } })).toBe(1);
  });

  it("when the admin role itself is granted, then the person it is about cannot decide it, and a stale version is refused", async () => {
    const user = await createTestUser("treasury");
    const stale = await proposeRole(adminA, { userId: user.id, role: "admin", version: 7 });
    expect(stale.status).toBe(409);
    expect(stale.body.error.code).toBe("stale");
    const notNeeded = await proposeRole(adminA, { userId: user.id, role: "analyst", version: 1 });
    expect(notNeeded.status).toBe(422);
    const removal = await proposeRole(adminA, { userId: adminB.id, role: "analyst", version: 1 });
    expect(removal.status).toBe(201);
    const bySubject = await decideRole(adminB, removal.body.id, "approve");
    expect(bySubject.status).toBe(403);
    await decideRole(adminA, removal.body.id, "reject").expect(200);
    expect((await UserModel.findByPk(adminB.id))!.role).toBe("admin");
  });

  it("when an admin invites a CRO, then no account and no e-mail exist until a second admin approves; then the invitation goes out", async () => {
    const { email, res } = await invite("cro");
    expect(res.status).toBe(202);
    expect(res.body).toMatchObject({ outcome: "awaiting_approval", request: { kind: "invite", toRole: "cro", email } });
    expect(await UserModel.count({ where: { email } })).toBe(0);
    expect(await messagesTo(email)).toHaveLength(0);
    const again = await request(app)
      .post("/api/users")
      .set("Cookie", adminB.cookie)
      .send({ email, name: "X", role: "analyst" });
    expect(again.status).toBe(409);

    const id = res.body.request.id;
    expect((await decideRole(adminA, id, "approve")).status).toBe(403);
    expect(await UserModel.count({ where: { email } })).toBe(0);
    const approved = await decideRole(adminB, id, "approve");
    expect(approved.status).toBe(200);
    const user = (await UserModel.findOne({ where: { email } }))!;
    expect({ role: user.role, passwordHash: user.passwordHash }).toEqual({ role: "cro", passwordHash: null });
    expect((await RoleRequestModel.findByPk(id))!.userId).toBe(user.id);
    const token = await latestLinkTokenFor(email);
    expect((await request(app).post("/api/invitations/accept").send({ token, password: STRONG })).status).toBe(200);
  });
});
