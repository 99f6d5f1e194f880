import request from "supertest";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { sequelize } from "../../server/db/sequelize";
import { AuditEventModel } from "../../server/models/audit-event";
import { EntityModel } from "../../server/models/entity";
import { HolidayModel } from "../../server/models/holiday";
import { PortfolioModel } from "../../server/models/portfolio";
import { RegulatorAssignmentModel } from "../../server/models/regulator-assignment";
import { UserModel } from "../../server/models/user";
import { UserInvitationModel } from "../../server/models/user-invitation";
import { createTestEntity, createTestUser, sessionCookieFor, signIn, testApp, unique } from "./helpers";
import { editUser } from "./support/user-edits";

const app = testApp();
let admin: string;
let adminEmail: string;

beforeAll(async () => {
  const user = await createTestUser("admin");
  adminEmail = user.email;
  admin = await sessionCookieFor(user.id);
});
afterAll(() => sequelize.close());

describe("managing users", () => {
  it("when an admin invites a user, then the row exists without any password, and the audit log holds the change", async () => {
    const email = `new-${unique()}@larkspur.test`;
    const res = await request(app)
      .post("/api/users")
      .set("Cookie", admin)
      .send({ email, name: "Nadia Fern", role: "analyst" });
    expect(res.status).toBe(201);
    expect(res.body.outcome).toBe("invited");
    expect(res.body.user).toMatchObject({
      email,
      name: "Nadia Fern",
      role: "analyst",
      disabled: false,
      lastSignInAt: null,
      passwordSet: false,
    });
    const row = await UserModel.findOne({ where: { email } });
    expect(row!.passwordHash).toBeNull();
    const audit = await AuditEventModel.findOne({ where: { action: "user.create", target: email } });
    expect(audit!.actorEmail).toBe(adminEmail);
    expect(audit!.ip).toMatch(/127\.0\.0\.1/);
    expect(JSON.parse(audit!.afterJson!)).toEqual({ email, name: "Nadia Fern", role: "analyst", disabled: false });
  });

  it("when the e-mail already exists, then 409 and no second row", async () => {
    const existing = await createTestUser("cro");
    const res = await request(app)
      .post("/api/users")
      .set("Cookie", admin)
      .send({ email: existing.email, name: "X", role: "treasury" });
    expect(res.status).toBe(409);
    expect(res.body.error.message).toContain(existing.email);
    expect(await UserModel.count({ where: { email: existing.email } })).toBe(1);
  });

  it("when the body smuggles extra fields such as tokenVersion or a password, then 422 and nothing is created", async () => {
    for (const extra of [{ tokenVersion: 99 }, { password: "a long enough password" }]) {
      const email = `smuggle-${unique()}@larkspur.test`;
      const res = await request(app)
        .post("/api/users")
        .set("Cookie", admin)
        .send({ email, name: "X", role: "analyst", ...extra });
      expect(res.status).toBe(422);
      expect(await UserModel.count({ where: { email } })).toBe(0);
    }
  });

  it("when an admin changes a role that needs no second admin, then it applies at once and the audit log keeps before and after", async () => {
    const user = await createTestUser("analyst");
    const res = await editUser(admin, user.id, { role: "treasury", version: 1 });
    expect(res.status).toBe(200);
    expect(res.body).toMatchObject({ role: "treasury", version: 2 });
    expect((await UserModel.findByPk(user.id))!.version).toBe(2);
    const audit = await AuditEventModel.findOne({ where: { action: "user.update", target: user.email } });
    expect(JSON.parse(audit!.beforeJson!).role).toBe("analyst");
    expect(JSON.parse(audit!.afterJson!).role).toBe("treasury");
  });

  it("when an admin tries to disable their own account, then 403 and they stay enabled", async () => {
    const self = await createTestUser("admin");
    const cookie = await sessionCookieFor(self.id);
    const res = await editUser(cookie, self.id, { disabled: true, version: 1 });
    expect(res.status).toBe(403);
    expect((await UserModel.findByPk(self.id))!.disabled).toBe(false);
  });
});

describe("two admins editing the same user (row version)", () => {
  const DTO_KEYS = [
    "createdAt",
    "disabled",
    "email",
    "id",
    "lastSignInAt",
    "lockedUntil",
    "name",
    "passwordSet",
    "role",
    "version",
  ];
  let otherAdmin: string;
  beforeAll(async () => {
    otherAdmin = await sessionCookieFor((await createTestUser("admin")).id);
  });

  it("when the list is read, then each user carries their row version", async () => {
    const user = await createTestUser("analyst");
    const res = await request(app).get("/api/users").set("Cookie", admin).expect(200);
    expect(res.body.find((u: { id: number }) => u.id === user.id)).toMatchObject({ id: user.id, version: 1 });
  });

  it("when the second admin disables a user with the version both read, after the first renamed them, then 409 stale with the current user, and nothing of the second is written", async () => {
    const target = await createTestUser("analyst");
    const targetSession = await sessionCookieFor(target.id);
    await editUser(admin, target.id, { name: "Renamed by the first", version: 1 }).expect(200);

    const late = await editUser(otherAdmin, target.id, { disabled: true, version: 1 });

    expect(late.status).toBe(409);
    expect(late.body.error.code).toBe("stale");
    expect(late.body.error.message).toMatch(/Someone else changed Renamed by the first/);
    expect(late.body.error.details.current).toMatchObject({
      id: target.id,
      name: "Renamed by the first",
      role: "analyst",
      disabled: false,
      version: 2,
    });
    expect(Object.keys(late.body.error.details.current).sort()).toEqual(DTO_KEYS); // no password hash, no token version
    const row = (await UserModel.findByPk(target.id))!;
    expect({ name: row.name, disabled: row.disabled, version: row.version, tokenVersion: row.tokenVersion }).toEqual({
      name: "Renamed by the first",
      disabled: false,
      version: 2, // bumped once, by the first admin
      tokenVersion: 1, // the refused disable revoked nothing
    });
    expect(await AuditEventModel.count({ where: { action: "user.update", target: target.email } })).toBe(1);
    expect((await request(app).get("/api/auth/me").set("Cookie", targetSession)).status).toBe(200);
  });

  it("when the second admin sends a set-password link with the old version, then 409 stale and no link is made", async () => {
    const target = await createTestUser("analyst");
    await editUser(admin, target.id, { role: "treasury", version: 1 }).expect(200);

    const late = await request(app)
      .post(`/api/users/${target.id}/password-link`)
      .set("Cookie", otherAdmin)
      .send({ version: 1 });

    expect(late.status).toBe(409);
    expect(late.body.error.code).toBe("stale");
    expect(late.body.error.details.current).toMatchObject({ id: target.id, role: "treasury", version: 2 });
    expect(JSON.stringify(late.body)).not.toMatch(/\$2[aby]\$/);
    const row = (await UserModel.findByPk(target.id))!;
    expect({ version: row.version, tokenVersion: row.tokenVersion }).toEqual({ version: 2, tokenVersion: 2 }); // only the role change's revocation
    expect(await UserInvitationModel.count({ where: { userId: target.id } })).toBe(0);
    await signIn(app, target.email); // the password still works
  });

  it("when both admins send the same version at once, then exactly one wins and the version moves once", async () => {
    const target = await createTestUser("analyst");
    const [a, b] = await Promise.all([
      editUser(admin, target.id, { role: "treasury", version: 1 }),
      editUser(otherAdmin, target.id, { role: "regulator", version: 1 }),
    ]);
    expect([a.status, b.status].sort()).toEqual([200, 409]);
    const winner = a.status === 200 ? a : b;
    const loser = a.status === 200 ? b : a;
    expect(loser.body.error.details.current).toMatchObject({ role: winner.body.role, version: 2 });
    const row = (await UserModel.findByPk(target.id))!;
    expect({ role: row.role, version: row.version, tokenVersion: row.tokenVersion }).toEqual({
      role: winner.body.role,
      version: 2,
      tokenVersion: 2,
    });
    expect(await AuditEventModel.count({ where: { action: "user.update", target: target.email } })).toBe(1);
  });

  it("when an edit carries no version or an invalid one, then 422 names the version and nothing is written", async () => {
    const target = await createTestUser("analyst");
    for (const body of [
      { role: "treasury" },
      { role: "treasury", version: "1" },
      { role: "treasury", version: 0 },
      { role: "treasury", version: 1.5 },
      { role: "treasury", version: null },
    ]) {
      const res = await editUser(admin, target.id, body);
      expect(res.status, JSON.stringify(body)).toBe(422);
      expect(Object.keys(res.body.error.details.fields)).toContain("version");
    }
    const link = await request(app).post(`/api/users/${target.id}/password-link`).set("Cookie", admin).send({});
    expect(link.status).toBe(422);
    expect(Object.keys(link.body.error.details.fields)).toContain("version");
    const row = (await UserModel.findByPk(target.id))!;
    expect({ role: row.role, version: row.version, tokenVersion: row.tokenVersion }).toEqual({
      role: "analyst",
      version: 1,
      tokenVersion: 1,
    });
    await signIn(app, target.email);
  });
});

describe("managing entities, portfolios and calendars", () => {
  it("when an entity is created without a P&L basis, then it takes its rule set's default (US: actual, 12 CFR 217.204(b); docs/rules.md#pnl-basis)", async () => {
    const code = `T-${unique().toUpperCase()}`;
    const res = await request(app)
      .post("/api/entities")
      .set("Cookie", admin)
      .send({ code, name: "Test Securities", regime: "us", currency: "USD", supervisorEmails: ["desk@sup.test"] });
    expect(res.status).toBe(201);
    expect(res.body).toEqual({
      code,
      name: "Test Securities",
      regime: "us",
      pnlBasis: "actual",
      currency: "USD",
      country: "US", // derived from the currency (docs/rules.md#business-days)
      qualitativeAddend: 0,
      supervisorName: null,
      supervisorEmails: ["desk@sup.test"],
      version: 1,
    });
    const row = await EntityModel.findOne({ where: { code } });
    expect(row!.pnlBasis).toBe("actual");
    expect(await AuditEventModel.count({ where: { action: "entity.create", target: code } })).toBe(1);
  });

  it("when the EU rule set is chosen without a basis, then the higher of actual and hypothetical is used (EBA Q&A 2016_2759)", async () => {
    const code = `T-${unique().toUpperCase()}`;
    const res = await request(app)
      .post("/api/entities")
      .set("Cookie", admin)
      .send({ code, name: "EU Test", regime: "eu", currency: "EUR" });
    expect(res.body.pnlBasis).toBe("max");
  });

  it("when the code is malformed or the currency unknown-shaped, then 422 names the field and nothing is stored", async () => {
    const res = await request(app)
      .post("/api/entities")
      .set("Cookie", admin)
      .send({ code: "bad code", name: "X", regime: "eu", currency: "euro" });
    expect(res.status).toBe(422);
    expect(Object.keys(res.body.error.details.fields)).toEqual(expect.arrayContaining(["code", "currency"]));
    expect(await EntityModel.count({ where: { code: "bad code" } })).toBe(0);
  });

  it("when an entity code is taken, then 409", async () => {
    const entity = await createTestEntity();
    const res = await request(app)
      .post("/api/entities")
      .set("Cookie", admin)
      .send({ code: entity.code, name: "Again", regime: "eu", currency: "EUR" });
    expect(res.status).toBe(409);
  });

  it("when an admin edits the qualitative addend, then it is stored as a decimal and read back as a number", async () => {
    const entity = await createTestEntity();
    const res = await request(app)
      .patch(`/api/entities/${entity.code}`)
      .set("Cookie", admin)
      .send({ qualitativeAddend: 0.25, version: 1 });
    expect(res.status).toBe(200);
    expect(res.body).toMatchObject({ qualitativeAddend: 0.25, version: 2 });
    expect((await EntityModel.findByPk(entity.id))!.qualitativeAddend).toBe(0.25);
  });

  it("when two admins edit the same entity from the same version, then the second gets 409 with the current entity and its change is not applied", async () => {
    const entity = await createTestEntity();
    await request(app)
      .patch(`/api/entities/${entity.code}`)
      .set("Cookie", admin)
      .send({ qualitativeAddend: 0.1, version: 1 })
      .expect(200);
    const late = await request(app)
      .patch(`/api/entities/${entity.code}`)
      .set("Cookie", admin)
      .send({ qualitativeAddend: 0.5, version: 1 });
    expect(late.status).toBe(409);
    expect(late.body.error.details.current).toMatchObject({ qualitativeAddend: 0.1, version: 2 });
    expect((await EntityModel.findByPk(entity.id))!.qualitativeAddend).toBe(0.1);
  });

  it("when portfolios are added, then they list top of house first and a duplicate code is refused", async () => {
    const entity = await createTestEntity();
    await request(app)
      .post(`/api/entities/${entity.code}/portfolios`)
      .set("Cookie", admin)
      .send({ code: `${entity.code}-D1`, name: "Desk one", level: "desk" })
      .expect(201);
    await request(app)
      .post(`/api/entities/${entity.code}/portfolios`)
      .set("Cookie", admin)
      .send({ code: `${entity.code}-TOP`, name: "Whole book", level: "top" })
      .expect(201);
    const dup = await request(app)
      .post(`/api/entities/${entity.code}/portfolios`)
      .set("Cookie", admin)
      .send({ code: `${entity.code}-D1`, name: "Again", level: "desk" });
    expect(dup.status).toBe(409);
    const list = await request(app).get(`/api/entities/${entity.code}/portfolios`).set("Cookie", admin);
    expect(list.body.map((p: { code: string }) => p.code)).toEqual([`${entity.code}-TOP`, `${entity.code}-D1`]);
    expect(await PortfolioModel.count({ where: { entityId: entity.id } })).toBe(2);
  });

  it("when holidays are added and removed, then the calendar in the database follows and an impossible date is refused", async () => {
    const entity = await createTestEntity();
    await request(app)
      .post(`/api/entities/${entity.code}/holidays`)
      .set("Cookie", admin)
      .send({ date: "2027-12-27", name: "Substitute day" })
      .expect(201);
    const bad = await request(app)
      .post(`/api/entities/${entity.code}/holidays`)
      .set("Cookie", admin)
      .send({ date: "2027-02-30", name: "Nope" });
    expect(bad.status).toBe(422);
    expect(await HolidayModel.count({ where: { entityId: entity.id } })).toBe(1);
    const saturday = await request(app)
      .post(`/api/entities/${entity.code}/holidays`)
      .set("Cookie", admin)
      .send({ date: "2027-12-25", name: "Christmas Day" });
    expect(saturday.status).toBe(422);
    expect(saturday.body.error.message).toBe("2027-12-25 is a Saturday; only a weekday can be added as a holiday.");
    expect(await HolidayModel.count({ where: { entityId: entity.id } })).toBe(1);
    await request(app).delete(`/api/entities/${entity.code}/holidays/2027-12-27`).set("Cookie", admin).expect(204);
    expect(await HolidayModel.count({ where: { entityId: entity.id } })).toBe(0);
  });
});

describe("regulator assignments", () => {
  it("when a regulator is assigned one entity, then they see only that entity and another entity answers 404", async () => {
    const regulator = await createTestUser("regulator");
    const mine = await createTestEntity();
    const other = await createTestEntity();
    await request(app)
      .post("/api/regulator-assignments")
      .set("Cookie", admin)
      .send({ userId: regulator.id, entityCode: mine.code })
      .expect(201);
    expect(await RegulatorAssignmentModel.count({ where: { userId: regulator.id } })).toBe(1);
    const cookie = await sessionCookieFor(regulator.id);
    const list = await request(app).get("/api/entities").set("Cookie", cookie);
    expect(list.body.map((e: { code: string }) => e.code)).toEqual([mine.code]);
    expect(other.code).not.toBe(mine.code);
  });

  it("when a non-regulator is assigned, then 400 explains why", async () => {
    const analyst = await createTestUser("analyst");
    const entity = await createTestEntity();
    const res = await request(app)
      .post("/api/regulator-assignments")
      .set("Cookie", admin)
      .send({ userId: analyst.id, entityCode: entity.code });
    expect(res.status).toBe(400);
    expect(res.body.error.message).toMatch(/not a regulator/);
  });
});

describe("the audit log screen's API", () => {
  it("when filtered by action, then only those events come back, newest first", async () => {
    const user = await createTestUser("analyst");
    await editUser(admin, user.id, { name: "Renamed once", version: 1 }).expect(200);
    await editUser(admin, user.id, { name: "Renamed twice", version: 2 }).expect(200);
    const res = await request(app).get("/api/audit-events?action=user.update&limit=200").set("Cookie", admin);
    expect(res.status).toBe(200);
    expect(res.body.items.every((e: { action: string }) => e.action === "user.update")).toBe(true);
    const mine = res.body.items.filter((e: { target: string }) => e.target === user.email);
    expect(mine.map((e: { after: { name: string } }) => e.after.name)).toEqual(["Renamed twice", "Renamed once"]);
  });
});
