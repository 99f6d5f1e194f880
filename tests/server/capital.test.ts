import request from "supertest";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { sequelize } from "../../server/db/sequelize";
import { forecastResponseSchema, whatIfResponseSchema } from "../../shared/schemas/capital";
import { createTestUser, sessionCookieFor, testApp } from "./helpers";
import { ingestFixture, uploadCsv } from "./ingest-helpers";

const app = testApp();
afterAll(() => sequelize.close());

const LAST_DAY = "2026-09-30";
const SQRT_10 = Math.sqrt(10);

/**
 * An EU book (higher of actual and hypothetical counts) with 300 business days up to 30 September
 * 2026: VaR 100 or 101 on alternate days, stressed VaR 250, a loss of 50 on most days and 150 on
 * five of the last 250 (yellow zone). The reporting office plans on current data (treasury reads
 * approved determinations only: tests/server/in-force.test.ts).
 */
async function capitalBook() {
  const fx = await ingestFixture();
  const dates: string[] = [];
  for (const d = new Date(`${LAST_DAY}T00:00:00Z`); dates.length < 300; d.setUTCDate(d.getUTCDate() - 1)) {
    if (d.getUTCDay() !== 0 && d.getUTCDay() !== 6) dates.unshift(d.toISOString().slice(0, 10));
  }
  const exceptionAt = new Set([60, 120, 200, 280, 299]);
  const lines = dates.map(
    (d, i) =>
      `${fx.portfolio.code},${d},${exceptionAt.has(i) ? -150 : -50},${exceptionAt.has(i) ? -150 : -40},${100 + (i % 2)},250`,
  );
  const preview = await uploadCsv(
    app,
    fx.cookie,
    ["portfolio,date,actual_pnl,hypothetical_pnl,var_99,svar_99", ...lines].join("\n"),
  );
  expect(preview.body.invalid).toBe(0);
  await request(app).post(`/api/uploads/${preview.body.id}/commit`).set("Cookie", fx.cookie).expect(200);
  return {
    ...fx,
    dates,
    exceptionDates: [...exceptionAt].map((i) => dates[i]),
    treasury: await sessionCookieFor((await createTestUser("treasury")).id),
  };
}

let book: Awaited<ReturnType<typeof capitalBook>>;
beforeAll(async () => {
  book = await capitalBook();
});

describe("the zone forecast", () => {
  it("when an analyst asks for a date ten business days ahead, then the count is known exceptions plus Binomial(10, 1%) new ones, and the zone probabilities add up to one", async () => {
    const res = await request(app)
      .get(`/api/entities/${book.entity.code}/capital/forecast?date=2026-10-14`)
      .set("Cookie", book.cookie);
    expect(res.status).toBe(200);
    const f = forecastResponseSchema.parse(res.body);
    // Today: five exceptions, yellow, plus factor 0.40, multiplier 3.40 (BCBS 1996 Table 2; CRR Art. 366, from memory).
    expect(f).toMatchObject({
      asOf: LAST_DAY,
      date: "2026-10-14",
      newDays: 10,
      knownRemaining: 5,
      today: { counted: 5, zone: "yellow", plusFactor: 0.4, multiplier: 3.4, windowComplete: true },
    });
    // P(no new exception in 10 days) = 0.99^10 (binomial; docs/rules.md#forecast).
    expect(f.distribution[0]).toEqual({ exceptions: 5, probability: expect.closeTo(0.99 ** 10, 12) });
    expect(f.distribution.reduce((s, d) => s + d.probability, 0)).toBeCloseTo(1, 12);
    expect(f.zones.green).toBe(0);
    expect(f.zones.yellow + f.zones.red).toBeCloseTo(1, 12);
    expect(f.ifNoNewException).toMatchObject({ counted: 5, zone: "yellow", plusFactor: 0.4 });
    expect(f.rollOffs.map((r) => r.date)).toEqual(book.exceptionDates);
  });

  it("when asked what the next exception costs, then it is the step from 5 to 6 exceptions (plus factor 0.40 → 0.50, BCBS 1996 Table 2) on the 60-day averages scaled by √10 (CRR Art. 364(1) formula, Art. 365 ten-day VaR, docs/rules.md#capital; the √10 square-root-of-time scaling is common practice)", async () => {
    const res = await request(app).get(`/api/entities/${book.entity.code}/capital/forecast`).set("Cookie", book.cookie);
    // Averages over the last 60 days: VaR (100 + 101) / 2, stressed VaR 250; both average terms bind.
    expect(res.body.nextExceptionCost).toBeCloseTo(0.1 * SQRT_10 * (100.5 + 250), 6);
  });

  it("when no date is given, then it forecasts to a quarter end after the last day with data", async () => {
    const res = await request(app).get(`/api/entities/${book.entity.code}/capital/forecast`).set("Cookie", book.cookie);
    expect(res.body.date).toMatch(/-(03-31|06-30|09-30|12-31)$/);
    expect(res.body.date > LAST_DAY).toBe(true);
  });

  it("when the date is before the last day with data, or not a date, then 422 says why", async () => {
    const before = await request(app)
      .get(`/api/entities/${book.entity.code}/capital/forecast?date=2026-09-01`)
      .set("Cookie", book.cookie);
    expect(before.status).toBe(422);
    expect(before.body.error.message).toMatch(/before the as-of date 2026-09-30/);
    expect(before.body.error.details.fields.date).toBe("On or after 2026-09-30");
    const bad = await request(app)
      .get(`/api/entities/${book.entity.code}/capital/forecast?date=next-week`)
      .set("Cookie", book.cookie);
    expect(bad.status).toBe(422);
    expect(bad.body.error.details.fields.date).toBeTruthy();
  });

  it("when the entity is unknown, then 404", async () => {
    expect(
      (await request(app).get("/api/entities/NOPE-ENTITY/capital/forecast").set("Cookie", book.cookie)).status,
    ).toBe(404);
  });
});

describe("what-if", () => {
  it("when five more exceptions are supposed, then ten counted exceptions are red with plus factor 1.00 and multiplier 4.00 (BCBS 1996 Table 2)", async () => {
    const res = await request(app)
      .post(`/api/entities/${book.entity.code}/capital/what-if`)
      .set("Cookie", book.cookie)
      .send({ extraExceptions: 5 });
    expect(res.status).toBe(200);
    const w = whatIfResponseSchema.parse(res.body);
    expect(w.base).toMatchObject({ zone: "yellow", counted: 5, plusFactor: 0.4, multiplier: 3.4 });
    expect(w.scenario).toMatchObject({ zone: "red", counted: 10, plusFactor: 1, multiplier: 4 });
    expect(w.delta).toMatchObject({ counted: 5, zoneChanged: true });
    expect(w.delta.multiplier).toBeCloseTo(0.6, 12);
    // The requirement is multiplier × (avg VaR + avg sVaR) × √10 when the averages bind.
    expect(w.scenario.capital).toBeCloseTo(4 * SQRT_10 * (100.5 + 250), 6);
    expect(w.delta.capital).toBeCloseTo(0.6 * SQRT_10 * (100.5 + 250), 6);
  });

  it("when VaR is doubled, then only the VaR term of the requirement doubles and the count stays", async () => {
    const res = await request(app)
      .post(`/api/entities/${book.entity.code}/capital/what-if`)
      .set("Cookie", book.cookie)
      .send({ varScale: 2 });
    expect(res.body.scenario.counted).toBe(5);
    expect(res.body.delta.capital).toBeCloseTo(3.4 * SQRT_10 * 100.5, 6);
  });

  it("when the inputs are out of range, then 422 names the field and nothing is computed", async () => {
    const res = await request(app)
      .post(`/api/entities/${book.entity.code}/capital/what-if`)
      .set("Cookie", book.cookie)
      .send({ extraExceptions: 1.5, varScale: -1 });
    expect(res.status).toBe(422);
    expect(Object.keys(res.body.error.details.fields).sort()).toEqual(["extraExceptions", "varScale"]);
    const late = await request(app)
      .post(`/api/entities/${book.entity.code}/capital/what-if`)
      .set("Cookie", book.cookie)
      .send({ asOf: "2026-10-30" });
    expect(late.status).toBe(422);
    expect(late.body.error.details.fields.asOf).toMatch(/At most 2026-09-30/);
  });
});
