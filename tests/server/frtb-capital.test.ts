import request from "supertest";
import { QueryTypes } from "sequelize";
import { afterAll, describe, expect, it } from "vitest";
import { sequelize } from "../../server/db/sequelize";
import { FrtbDeskStatusModel } from "../../server/models/frtb-desk-status";
import { createTestEntity, createTestPortfolio, createTestUser, sessionCookieFor, testApp } from "./helpers";
import { uploadCsv, weekdays } from "./ingest-helpers";
import { putReview } from "./support/exception-reviews";

const app = testApp();
afterAll(() => sequelize.close());

const HEADER = "portfolio,date,actual_pnl,hypothetical_pnl,var_99,var_975,es_975,ses,ima_drc,sbm,rrao,sa_drc";

/**
 * An FRTB entity: a top of house and two desks, 2025-04-01 to 2026-03-31. DESK-A has 13 losses
 * beyond its 99% VaR in the first quarter of 2026; DESK-B none. Charges (worked by hand below):
 * top IMCC 300, SES 50, DRC 40, SA 900 + 20 + 80 = 1,000; A: IMCC 200, SES 30, DRC 25, SA 550;
 * B: IMCC 150, SES 20, DRC 20, SA 450.
 */
async function frtbFixture() {
  const entity = await createTestEntity({ regime: "frtb" });
  const top = await createTestPortfolio(entity);
  const a = await createTestPortfolio(entity, "A", "Desk A", "desk");
  const b = await createTestPortfolio(entity, "B", "Desk B", "desk");
  const analyst = await createTestUser("analyst");
  const cookie = await sessionCookieFor(analyst.id);
  const dates = weekdays("2025-04-01", 600).filter((d) => d <= "2026-03-31");
  const q1 = dates.filter((d) => d >= "2026-01-05").slice(0, 13);
  const lines = [HEADER];
  dates.forEach((d, i) => {
    const v = 100 + (i % 5); // VaR moves daily (no stale-VaR finding)
    lines.push(`${top.code},${d},10,10,${v},80,300,50,40,900,20,80`);
    const loss = q1.includes(d) ? -150 : 10;
    lines.push(`${a.code},${d},${loss},10,${v},80,200,30,25,500,10,40`);
    lines.push(`${b.code},${d},10,10,${v},80,150,20,20,400,5,45`);
  });
  const res = await uploadCsv(app, cookie, `${lines.join("\n")}\n`);
  expect(res.body).toMatchObject({ invalid: 0 });
  const commit = await request(app).post(`/api/uploads/${res.body.id}/commit`).set("Cookie", cookie);
  expect(commit.status).toBe(200);
  return { entity, a, b, cookie, q1 };
}

describe("FRTB desk backtests and approved exclusions", () => {
  it("when the supervisor agrees to disregard one of a desk's 13 exceptions, then the desk counts 12 and stays in the model (CRR Art. 325bf, verified-secondary)", async () => {
    const { entity, a, cookie, q1 } = await frtbFixture();
    const statusAt = async () =>
      (await FrtbDeskStatusModel.findOne({ where: { portfolioId: a.id, periodEnd: "2026-03-31" } }))!;
    expect(await statusAt()).toMatchObject({ status: "out-of-model", backtest99: 13 });

    const review = await putReview(a.code, q1[0], cookie, {
      cause: "data_issue",
      narrative: "A non-modellable basis moved; SES covers the loss.",
      exclusion: true,
    });
    expect(review.status).toBe(200);
    const cro = await createTestUser("cro");
    const decision = await request(app)
      .put(`/api/portfolios/${a.code}/exceptions/${q1[0]}/decision`)
      .set("Cookie", await sessionCookieFor(cro.id))
      .send({ decision: "approved", reference: "SUP-FRTB-7", decidedOn: "2026-04-10", version: review.body.version });
    expect(decision.status).toBe(200);

    // MAR32.19: 12 at 99% is within the limit, so desk A stays in the model at 2026 Q1.
    expect(await statusAt()).toMatchObject({ status: "in-model", backtest99: 12, backtestPasses: true });
    const top = await request(app).get(`/api/portfolios/${entity.code}-TOP/backtest`).set("Cookie", cookie);
    const deskA = top.body.desks.find((d: { portfolio: string }) => d.portfolio === a.code);
    expect(deskA.backtest.at99).toMatchObject({ count: 12, excludedDays: 1, fails: false });
  });
});

describe("FRTB capital on a date (MAR33.41–33.45)", () => {
  it("when a desk fails backtesting in a quarter, then it is out of the model from that determination and its SA moves into C_U", async () => {
    const { entity, a, b, cookie } = await frtbFixture();

    // Stored with the determinations: A in the model at 2025 Q4, out at 2026 Q1 (13 > 12, MAR32.19).
    const rowsA = await FrtbDeskStatusModel.findAll({ where: { portfolioId: a.id }, order: [["periodEnd", "ASC"]] });
    expect(rowsA.map((r) => [r.periodEnd, r.status])).toEqual([
      ["2025-06-30", "in-model"],
      ["2025-09-30", "in-model"],
      ["2025-12-31", "in-model"],
      ["2026-03-31", "out-of-model"],
    ]);
    expect(rowsA[3]).toMatchObject({ backtest99: 13, backtestPasses: false, plaZone: null });
    expect((await FrtbDeskStatusModel.findOne({ where: { portfolioId: b.id, periodEnd: "2026-03-31" } }))!.status).toBe(
      "in-model",
    );

    // On 2026-03-31 the 2025 Q4 determination is in force: both desks in the model, so the top of house's
    // figures stand: C_A = max(300 + 50, 1.5 · 300 + 50) = 500; IMA_G,A = 540; ACR = min(540, 1,000) + 0.
    const before = await request(app).get(`/api/entities/${entity.code}/capital?date=2026-03-31`).set("Cookie", cookie);
    expect(before.status).toBe(200);
    expect(before.body.frtb).toMatchObject({
      statusQuarterEnd: "2025-12-31",
      ca: 500,
      drc: 40,
      imaGA: 540,
      cU: 0,
      saAll: 1000,
      saGA: 1000,
      k: 0,
      surcharge: 0,
      acrTotal: 540,
    });
    expect(before.body.frtb.desks.map((d: { status: string }) => d.status)).toEqual(["in-model", "in-model"]);

    // From 2026-04-01 the 2026 Q1 determination is in force: A is out. C_A over B alone =
    // max(150 + 20, 1.5 · 150 + 20) = 245; IMA_G,A = 245 + 20 = 265; C_U = A's SA = 550;
    // SA_G,A = B's SA = 450 (no sa_ga supplied: noted); ACR = min(265 + 0 + 550, 1,000) + max(0, 265 − 450) = 815.
    const after = await request(app).get(`/api/entities/${entity.code}/capital?date=2026-04-01`).set("Cookie", cookie);
    expect(after.status).toBe(200);
    expect(after.body.frtb).toMatchObject({
      statusQuarterEnd: "2026-03-31",
      ca: 245,
      drc: 20,
      imaGA: 265,
      cU: 550,
      saAll: 1000,
      saGA: 450,
      k: 0,
      surcharge: 0,
      acrTotal: 815,
      sources: { imcc: "desks", drc: "desks", saAll: "top", saGA: "desks" },
    });
    expect(after.body.frtb.desks).toEqual([
      expect.objectContaining({ code: a.code, status: "out-of-model", backtest99: 13, plaZone: null, sa: 550 }),
      expect.objectContaining({ code: b.code, status: "in-model", backtest99: 0, sa: 450 }),
    ]);
    expect(after.body.frtb.notes.join(" ")).toMatch(/sa_ga\) is not supplied/);
    expect(after.body.frtbTimeline).toHaveLength(4);
    expect(after.body.frtbTimeline[3]).toMatchObject({ quarterEnd: "2026-03-31", effectiveFrom: "2026-04-01" });
  });

  it("when the quarter is snapshotted, then its figures freeze the aggregation with the statuses its determination set", async () => {
    const { entity, a, cookie } = await frtbFixture();
    const res = await request(app)
      .post("/api/snapshots")
      .set("Cookie", cookie)
      .send({ entity: entity.code, quarterEnd: "2026-03-31" });
    expect(res.status).toBe(201);
    // The 2026 Q1 determination puts A out, so the quarter's own figures are the 815 worked above.
    expect(res.body.figures.frtb).toMatchObject({ statusQuarterEnd: "2026-03-31", cU: 550, acrTotal: 815 });
    expect(res.body.figures.frtb.desks[0]).toMatchObject({ code: a.code, status: "out-of-model" });
    const stored = await sequelize.query<{ f: string }>("SELECT figures_json AS f FROM snapshots WHERE id = :id", {
      replacements: { id: res.body.id },
      type: QueryTypes.SELECT,
    });
    expect(JSON.parse(stored[0].f).frtb).toMatchObject({ imaGA: 265, saGA: 450, acrTotal: 815 });
  });

  it("when a signed-off quarter's desk data is restated, then the desk keeps the status the quarter froze", async () => {
    const { entity, a, cookie } = await frtbFixture();
    const cro = await createTestUser("cro");
    const croCookie = await sessionCookieFor(cro.id);
    const draft = await request(app)
      .post("/api/snapshots")
      .set("Cookie", cookie)
      .send({ entity: entity.code, quarterEnd: "2025-12-31" });
    expect(draft.status).toBe(201);
    const submitted = await request(app)
      .post(`/api/snapshots/${draft.body.id}/submit`)
      .set("Cookie", cookie)
      .send({ comment: "Figures checked", version: draft.body.version });
    expect(submitted.status, JSON.stringify(submitted.body)).toBe(200);
    const approved = await request(app)
      .post(`/api/snapshots/${draft.body.id}/approve`)
      .set("Cookie", croCookie)
      .send({ version: submitted.body.version });
    expect(approved.status, JSON.stringify(approved.body)).toBe(200);

    // A restatement puts 13 losses beyond VaR into desk A's 2025 Q4: computed afresh, A would be out at Q4.
    const q4 = weekdays("2025-10-01", 13);
    const csv = [HEADER, ...q4.map((d) => `${a.code},${d},-150,10,100,80,200,30,25,500,10,40`)].join("\n");
    const res = await uploadCsv(app, cookie, `${csv}\n`);
    expect(res.body.signedOffRestatements).toBe(13); // the preview warns: Q4 2025 is approved
    const commit = request(app).post(`/api/uploads/${res.body.id}/commit`).set("Cookie", cookie);
    expect((await commit.send({ confirmSignedOff: true })).status).toBe(200);

    const q4Row = await FrtbDeskStatusModel.findOne({ where: { portfolioId: a.id, periodEnd: "2025-12-31" } });
    expect(q4Row).toMatchObject({ status: "in-model", backtest99: 0 }); // as signed off
    const q1Row = await FrtbDeskStatusModel.findOne({ where: { portfolioId: a.id, periodEnd: "2026-03-31" } });
    expect(q1Row).toMatchObject({ status: "out-of-model", backtest99: 26 }); // the open quarter follows the data
  });

  it("when the entity reports under another rule set, then the capital on a date carries no FRTB block", async () => {
    const entity = await createTestEntity({ regime: "eu" });
    const top = await createTestPortfolio(entity);
    const analyst = await createTestUser("analyst");
    const cookie = await sessionCookieFor(analyst.id);
    const dates = weekdays("2026-01-05", 70);
    const csv = [
      "portfolio,date,actual_pnl,hypothetical_pnl,var_99",
      ...dates.map((d) => `${top.code},${d},10,10,100`),
    ].join("\n");
    const res = await uploadCsv(app, cookie, `${csv}\n`);
    await request(app).post(`/api/uploads/${res.body.id}/commit`).set("Cookie", cookie);
    const cap = await request(app).get(`/api/entities/${entity.code}/capital?date=${dates[69]}`).set("Cookie", cookie);
    expect(cap.status).toBe(200);
    expect(cap.body.frtb).toBeUndefined();
    expect(await FrtbDeskStatusModel.count({ where: { entityId: entity.id } })).toBe(0);
  });
});
