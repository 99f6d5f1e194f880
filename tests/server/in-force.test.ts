import request from "supertest";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { sequelize } from "../../server/db/sequelize";
import { AuditEventModel } from "../../server/models/audit-event";
import { DeterminationModel } from "../../server/models/determination";
import { SnapshotModel } from "../../server/models/snapshot";
import { SupervisorySettingsModel } from "../../server/models/supervisory-settings";
import { UserModel } from "../../server/models/user";
import { overviewResponseSchema } from "../../shared/schemas/backtest";
import { capitalOnDateSchema, determinationListSchema } from "../../shared/schemas/determination";
import { createTestUser, sessionCookieFor } from "./helpers";
import { ingestFixture } from "./ingest-helpers";
import { approve, HEADER, snapshotApp as app, submit, uploadAndCommit, weekdaysEndingOn } from "./snapshot-helpers";

afterAll(() => sequelize.close());

const Q2 = "2026-06-30";
const Q3 = "2026-09-30";
/** Worked by hand: 10-day VaR = 1-day VaR × √10 (CRR Art. 365; the square-root-of-time scaling is common practice). */
const SQRT_10 = Math.sqrt(10);

/**
 * An EU book (higher of actual and hypothetical overshootings) of 400 weekdays up to 30 September
 * 2026: a loss of 50 against a VaR of 100 or 101, stressed VaR 250, and a loss of 150 on the
 * days named. Three exceptions fall in the 250 days up to 30 June (so Q2 is determined green,
 * multiplier 3.00), two more arrive on 17 and 18 August, in the middle of Q3.
 */
const DATES = weekdaysEndingOn(Q3, 400);
const BEFORE_Q2 = [DATES[170], DATES[230], DATES[300]];
const MID_Q3 = ["2026-08-17", "2026-08-18"];
const line = (portfolio: string, d: string) => {
  const loss = BEFORE_Q2.includes(d) || MID_Q3.includes(d) ? 150 : 50;
  // VaR 100 or 101 on alternate days, so the data-quality check never finds it stale.
  return `${portfolio},${d},${-loss},${-loss + 10},${100 + (DATES.indexOf(d) % 2)},250`;
};
const csv = (portfolio: string, dates: string[]) => [HEADER, ...dates.map((d) => line(portfolio, d))].join("\n");

async function book() {
  const fx = await ingestFixture();
  const cro = await createTestUser("cro");
  const admin = await createTestUser("admin");
  return {
    ...fx,
    croCookie: await sessionCookieFor(cro.id),
    admin,
    adminCookie: await sessionCookieFor(admin.id),
    treasuryCookie: await sessionCookieFor((await createTestUser("treasury")).id),
    analyst2Cookie: await sessionCookieFor((await createTestUser("analyst")).id),
  };
}
type Book = Awaited<ReturnType<typeof book>>;

const capitalOn = async (b: Book, date: string) => {
  const res = await request(app).get(`/api/entities/${b.entity.code}/capital?date=${date}`).set("Cookie", b.cookie);
  expect(res.status, JSON.stringify(res.body)).toBe(200);
  return capitalOnDateSchema.parse(res.body);
};

async function approveQuarter(b: Book, quarterEnd: string) {
  const draft = await request(app)
    .post("/api/snapshots")
    .set("Cookie", b.cookie)
    .send({ entity: b.entity.code, quarterEnd });
  expect(draft.status, JSON.stringify(draft.body)).toBe(201);
  const submitted = await submit(draft.body.id, b.cookie, { version: draft.body.version });
  expect(submitted.status).toBe(200);
  const approved = await approve(draft.body.id, b.croCookie, { version: submitted.body.version });
  expect(approved.status, JSON.stringify(approved.body)).toBe(200);
  return approved.body as { id: number };
}

describe("the multiplier in force and the indicative one", () => {
  let b: Book;
  beforeAll(async () => {
    b = await book();
    // Data up to Friday 14 August: Q2 is determined, Q3 is under way with no exception yet.
    await uploadAndCommit(
      b.cookie,
      csv(
        b.portfolio.code,
        DATES.filter((d) => d <= "2026-08-14"),
      ),
    );
  });

  it("when Q2 has ended, then its determination is counted on its last business day and in force from the next one", async () => {
    const res = await request(app).get(`/api/entities/${b.entity.code}/determinations`).set("Cookie", b.cookie);
    expect(res.status).toBe(200);
    const q2 = determinationListSchema.parse(res.body).find((d) => d.quarterEnd === Q2)!;
    // 12 CFR 217.204(b) / BCBS 1996 (from memory): counted at the quarter end, in force until the next.
    expect(q2).toMatchObject({
      asOf: "2026-06-30",
      effectiveFrom: "2026-07-01",
      effectiveTo: null,
      counted: 3,
      zone: "green",
      plusFactor: 0,
      multiplier: 3,
      status: "provisional",
      snapshotId: null,
    });
    const stored = await DeterminationModel.findOne({ where: { entityId: b.entity.id, periodEnd: Q2 } });
    expect(stored!.counted).toBe(3);
  });

  it("when exceptions arrive in the middle of a quarter, then the indicative multiplier moves at once and the one in force only from the day after the next quarter end", async () => {
    const before = await capitalOn(b, "2026-08-14");
    expect(before.indicative).toMatchObject({ counted: 3, zone: "green", multiplier: 3 });
    expect(before.inForce).toMatchObject({ quarterEnd: Q2, counted: 3, multiplier: 3 });

    // The rest of August, with two exceptions on 17 and 18 August (committed in one upload).
    await uploadAndCommit(
      b.cookie,
      csv(
        b.portfolio.code,
        DATES.filter((d) => d > "2026-08-14" && d <= "2026-08-31"),
      ),
    );
    const mid = await capitalOn(b, "2026-08-19");
    // BCBS 1996 Table 2 (from memory): five exceptions are yellow, plus factor 0.40, multiplier 3.40.
    expect(mid.indicative).toMatchObject({ counted: 5, zone: "yellow", plusFactor: 0.4, multiplier: 3.4 });
    expect(mid.inForce).toMatchObject({ quarterEnd: Q2, effectiveFrom: "2026-07-01", counted: 3, multiplier: 3 });
    // Capital on a mid-quarter day uses the previous quarter end's multiplier: the 60-day averages
    // bind, so the requirement is 3.00 × √10 × (100.5 + 250) (CRR Art. 364(1), worked by hand).
    expect(mid.requirement).toBeCloseTo(3 * SQRT_10 * 350.5, 2);
    expect(mid.addOn).toBe(0);
    expect(mid.indicativeRequirement).toBeCloseTo(3.4 * SQRT_10 * 350.5, 2);
    expect(mid.nextDetermination).toEqual({ quarterEnd: Q3, asOf: Q3, effectiveFrom: "2026-10-01" });
    // The Overview names both: Q2's multiplier stays in force (Q3 has no determination without data on
    // its last business day), beside the indicative one of the rolling count.
    const overview = await request(app).get("/api/overview").set("Cookie", b.cookie);
    const line = overviewResponseSchema.parse(overview.body).find((i) => i.entity === b.entity.code)!;
    expect(line).toMatchObject({ counted: 5, zone: "yellow", multiplier: 3.4 });
    expect(line.inForce).toEqual({
      quarterEnd: Q2,
      effectiveFrom: "2026-07-01",
      counted: 3,
      zone: "green",
      zoneLabel: "green",
      plusFactor: 0,
      multiplier: 3,
      status: "provisional",
    });

    // The quarter ends: Q3 is determined on 30 September and in force from 1 October.
    await uploadAndCommit(
      b.cookie,
      csv(
        b.portfolio.code,
        DATES.filter((d) => d > "2026-08-31"),
      ),
    );
    const lastDay = await capitalOn(b, Q3);
    expect(lastDay.inForce).toMatchObject({ quarterEnd: Q2, multiplier: 3 });
    const nextDay = await capitalOn(b, "2026-10-01");
    expect(nextDay.inForce).toMatchObject({
      quarterEnd: Q3,
      effectiveFrom: "2026-10-01",
      counted: 5,
      zone: "yellow",
      plusFactor: 0.4,
      multiplier: 3.4,
      status: "provisional",
    });
    expect(nextDay.requirement).toBeCloseTo(3.4 * SQRT_10 * 350.5, 2);
    const list = determinationListSchema.parse(
      (await request(app).get(`/api/entities/${b.entity.code}/determinations`).set("Cookie", b.cookie)).body,
    );
    expect(list.find((d) => d.quarterEnd === Q2)!.effectiveTo).toBe(Q3);
  });
});

describe("governed supervisory settings", () => {
  let b: Book;
  beforeAll(async () => {
    b = await book();
    await uploadAndCommit(b.cookie, csv(b.portfolio.code, DATES));
    await approveQuarter(b, Q2);
  });

  const propose = (body: object, cookie = b.adminCookie) =>
    request(app).post(`/api/entities/${b.entity.code}/settings`).set("Cookie", cookie).send(body);

  it("when a change would take effect inside a signed-off quarter, then 422 and nothing is written", async () => {
    const res = await propose({ effectiveFrom: "2026-06-15", reference: "SUP-2026-014", qualitativeAddend: 0.5 });
    expect(res.status).toBe(422);
    expect(res.body.error.message).toMatch(/signed off/);
    expect(await SupervisorySettingsModel.count({ where: { entityId: b.entity.id, status: "proposed" } })).toBe(0);
  });

  it("when an admin proposes an addend from 3 August, then nothing changes until a CRO approves; the proposer cannot approve; from 3 August on the figures use it and none before", async () => {
    const before = await capitalOn(b, "2026-08-03");
    expect(before.inForce).toMatchObject({ quarterEnd: Q2, multiplier: 3 });
    const q2Snapshot = await SnapshotModel.findOne({ where: { entityId: b.entity.id, quarterEnd: Q2 } });

    const backtest = async () =>
      (await request(app).get(`/api/portfolios/${b.portfolio.code}/backtest`).set("Cookie", b.cookie)).body;
    // The stored backtest on 30 September: five exceptions, yellow, 3.00 + 0.40 (BCBS 1996 Table 2, from memory).
    expect(await backtest()).toMatchObject({ asOf: Q3, plusFactor: 0.4, multiplier: 3.4 });

    const proposed = await propose({ effectiveFrom: "2026-08-03", reference: "SUP-2026-021", qualitativeAddend: 0.5 });
    expect(proposed.status, JSON.stringify(proposed.body)).toBe(201);
    expect(proposed.body).toMatchObject({ id: expect.any(Number), status: "proposed" });
    expect((await capitalOn(b, "2026-08-03")).inForce!.multiplier).toBe(3);

    // An admin is not allowed to approve at all (the policy); and if the proposer later holds the
    // CRO role, four eyes still refuse their own proposal.
    expect(
      (await request(app).post(`/api/settings/${proposed.body.id}/approve`).set("Cookie", b.adminCookie)).status,
    ).toBe(403);
    await UserModel.update({ role: "cro" }, { where: { id: b.admin.id } });
    const own = await request(app)
      .post(`/api/settings/${proposed.body.id}/approve`)
      .set("Cookie", await sessionCookieFor(b.admin.id))
      .send({});
    expect(own.status).toBe(403);
    expect(own.body.error.code).toBe("four_eyes");
    await UserModel.update({ role: "admin" }, { where: { id: b.admin.id } });

    const approved = await request(app)
      .post(`/api/settings/${proposed.body.id}/approve`)
      .set("Cookie", b.croCookie)
      .send({ comment: "Letter of 28 July" });
    expect(approved.status, JSON.stringify(approved.body)).toBe(200);
    expect(approved.body.status).toBe("approved");

    // The day before: as it was. From 3 August: base 3 + plus factor 0 + addend 0.5 (CRR Art. 366, worked by hand).
    expect((await capitalOn(b, "2026-07-31")).inForce!.multiplier).toBe(3);
    const after = await capitalOn(b, "2026-08-03");
    expect(after.inForce).toMatchObject({ quarterEnd: Q2, multiplier: 3.5 });
    expect(after.requirement).toBeCloseTo(3.5 * SQRT_10 * 350.5, 2);

    // The stored figures (portfolio_figures) were refreshed in the approval's transaction with the
    // settings in force on their day: 3.00 + 0.40 + 0.50 on 30 September (CRR Art. 366, worked by hand).
    expect(await backtest()).toMatchObject({ asOf: Q3, plusFactor: 0.4, multiplier: 3.9 });
    // Q3's determination (provisional) was recomputed in the approval's transaction: 3 + 0.40 + 0.50.
    const q3 = await DeterminationModel.findOne({ where: { entityId: b.entity.id, periodEnd: Q3 } });
    expect(q3!.multiplier).toBeCloseTo(3.9, 10);
    expect(JSON.parse(q3!.settingsJson)).toMatchObject({ qualitativeAddend: 0.5, reference: "SUP-2026-021" });
    // The approved Q2 snapshot and its determination stay as they were.
    const q2 = await DeterminationModel.findOne({ where: { entityId: b.entity.id, periodEnd: Q2 } });
    expect(q2).toMatchObject({ status: "approved", multiplier: 3, snapshotId: q2Snapshot!.id });
    const q2Now = await SnapshotModel.findByPk(q2Snapshot!.id);
    expect(q2Now!.figuresJson).toBe(q2Snapshot!.figuresJson);
    expect(q2Now!.multiplier).toBe(3);

    const audit = await AuditEventModel.findOne({
      where: { action: "settings.approve", target: `${b.entity.code} settings #${proposed.body.id}` },
    });
    expect(JSON.parse(audit!.beforeJson!)).toMatchObject({ qualitativeAddend: 0 });
    expect(JSON.parse(audit!.afterJson!)).toMatchObject({ qualitativeAddend: 0.5, effectiveFrom: "2026-08-03" });
  });

  it("when a CRO rejects a proposal, then it is kept as rejected with the reason and changes nothing", async () => {
    const proposed = await propose({ effectiveFrom: "2026-09-01", reference: "SUP-2026-030", multiplierFloor: 3.6 });
    expect(proposed.status).toBe(201);
    const noReason = await request(app)
      .post(`/api/settings/${proposed.body.id}/reject`)
      .set("Cookie", b.croCookie)
      .send({});
    expect(noReason.status).toBe(422);
    const rejected = await request(app)
      .post(`/api/settings/${proposed.body.id}/reject`)
      .set("Cookie", b.croCookie)
      .send({ comment: "The floor letter was withdrawn" });
    expect(rejected.body).toMatchObject({ status: "rejected", decisionComment: "The floor letter was withdrawn" });
    expect((await capitalOn(b, "2026-09-15")).inForce!.multiplier).toBe(3.5);
    const list = await request(app).get(`/api/entities/${b.entity.code}/settings`).set("Cookie", b.cookie);
    expect(list.body.map((r: { status: string }) => r.status)).toEqual(["rejected", "approved"]);
  });
});

describe("treasury reads approved figures only", () => {
  let b: Book;
  beforeAll(async () => {
    b = await book();
    await uploadAndCommit(b.cookie, csv(b.portfolio.code, DATES));
  });

  const whatIf = (body: object) =>
    request(app).post(`/api/entities/${b.entity.code}/capital/what-if`).set("Cookie", b.treasuryCookie).send(body);

  it("when no quarter is signed off, then treasury's forecast and what-if say that no approved determination exists", async () => {
    const w = await whatIf({ extraExceptions: 1 });
    expect(w.status).toBe(404);
    expect(w.body.error.code).toBe("no_approved_determination");
    const f = await request(app).get(`/api/entities/${b.entity.code}/capital/forecast`).set("Cookie", b.treasuryCookie);
    expect(f.status).toBe(404);
    expect(f.body.error.message).toMatch(/signed off/);
  });

  it("when Q3 is only a draft, then treasury's what-if at the quarter end does not return the draft's figures but starts from the approved Q2", async () => {
    await approveQuarter(b, Q2);
    const draft = await request(app)
      .post("/api/snapshots")
      .set("Cookie", b.cookie)
      .send({ entity: b.entity.code, quarterEnd: Q3 });
    expect(draft.status).toBe(201);
    expect(draft.body.figures.exceptions.counted).toBe(5); // the unapproved draft: yellow, 3.40

    const atQuarterEnd = await whatIf({ asOf: Q3 });
    expect(atQuarterEnd.status).toBe(422);
    expect(atQuarterEnd.body.error.message).toMatch(/approved/);

    const res = await whatIf({ extraExceptions: 2 });
    expect(res.status, JSON.stringify(res.body)).toBe(200);
    expect(res.body.asOf).toBe(Q2);
    expect(res.body.startsFrom).toMatchObject({ kind: "approved", quarterEnd: Q2, status: "approved" });
    // BCBS 1996 Table 2 (from memory): 3 counted → green 3.00; with 2 more, 5 → yellow 3.40.
    expect(res.body.base).toMatchObject({ counted: 3, zone: "green", multiplier: 3 });
    expect(res.body.scenario).toMatchObject({ counted: 5, zone: "yellow", multiplier: 3.4 });
    // More exceptions after 30 June would first count in the Q3 determination, in force from 1 October.
    expect(res.body.bitesFrom).toEqual({ quarterEnd: Q3, asOf: Q3, effectiveFrom: "2026-10-01" });

    const f = await request(app).get(`/api/entities/${b.entity.code}/capital/forecast`).set("Cookie", b.treasuryCookie);
    expect(f.status).toBe(200);
    expect(f.body).toMatchObject({ asOf: Q2, startsFrom: { kind: "approved", quarterEnd: Q2 } });
    expect(f.body.today).toMatchObject({ counted: 3, multiplier: 3 });

    // Treasury's list of determinations holds the signed-off ones only.
    const dets = await request(app)
      .get(`/api/entities/${b.entity.code}/determinations`)
      .set("Cookie", b.treasuryCookie);
    expect(dets.body.map((d: { quarterEnd: string }) => d.quarterEnd).at(-1)).toBe(Q2);
    expect(dets.body.every((d: { status: string }) => d.status !== "provisional")).toBe(true);
  });
});
