/**
 * Calendars from the holiday library (docs/rules.md#business-days): a year's public holidays imported as
 * "library" rows beside the bank's own closing days, with a confirmation of how many days change.
 *
 * Reference dates are the official calendars, from memory: GOV.UK "UK bank holidays" (England and Wales) 2026 —
 * Good Friday 3 April, Easter Monday 6 April, Boxing Day moved to Monday 28 December; OPM "Federal holidays" 2026 —
 * Thanksgiving Thursday 26 November, Independence Day observed Friday 3 July. The library (date-holidays, pinned)
 * must agree with them.
 */
import request from "supertest";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { sequelize } from "../../server/db/sequelize";
import { AuditEventModel } from "../../server/models/audit-event";
import { EntityModel } from "../../server/models/entity";
import { HolidayModel } from "../../server/models/holiday";
import { holidaysOf } from "../../server/modules/figures/engine-inputs";
import { publicHolidays } from "../../server/modules/entities/holiday-library";
import { isBusinessDay } from "../../shared/backtest/calendar";
import { CALENDAR_COUNTRIES, type CalendarCountry } from "../../shared/schemas/entity";
import { createTestUser, sessionCookieFor, testApp, unique } from "./helpers";

const app = testApp();
let admin: string;
let analyst: string;

beforeAll(async () => {
  admin = await sessionCookieFor((await createTestUser("admin")).id);
  analyst = await sessionCookieFor((await createTestUser("analyst")).id);
});
afterAll(() => sequelize.close());

async function newEntity(currency: string, country?: string) {
  const code = `T-${unique().toUpperCase()}`;
  const res = await request(app)
    .post("/api/entities")
    .set("Cookie", admin)
    .send({ code, name: "Calendar test", regime: "basel", currency, ...(country ? { country } : {}) });
  expect(res.status).toBe(201);
  return res.body as { code: string; country: string | null; version: number };
}

async function importYear(code: string, year: number) {
  const preview = await request(app).get(`/api/entities/${code}/holiday-import?year=${year}`).set("Cookie", admin);
  expect(preview.status).toBe(200);
  const done = await request(app)
    .post(`/api/entities/${code}/holiday-import`)
    .set("Cookie", admin)
    .send({ year, changes: preview.body.changes });
  expect(done.status).toBe(200);
  return { preview: preview.body, done: done.body };
}

const entityId = async (code: string) => (await EntityModel.findOne({ where: { code } }))!.id;

describe("calendars from the holiday library", () => {
  it("when a GBP entity imports 2026, then Good Friday 3 April and Easter Monday 6 April are not business days (GOV.UK, from memory)", async () => {
    const entity = await newEntity("GBP");
    expect(entity.country).toBe("GB"); // derived from the currency
    const { preview } = await importYear(entity.code, 2026);
    // England and Wales 2026: eight bank holidays, all on weekdays (Boxing Day's substitute on Monday 28 December).
    expect(preview.add.map((h: { date: string }) => h.date)).toEqual([
      "2026-01-01",
      "2026-04-03",
      "2026-04-06",
      "2026-05-04",
      "2026-05-25",
      "2026-08-31",
      "2026-12-25",
      "2026-12-28",
    ]);
    expect(preview).toMatchObject({ year: 2026, country: "GB", changes: 8, remove: [] });
    const off = await holidaysOf(await entityId(entity.code));
    expect(isBusinessDay("2026-04-03", off)).toBe(false); // Good Friday
    expect(isBusinessDay("2026-04-06", off)).toBe(false); // Easter Monday
    expect(isBusinessDay("2026-04-07", off)).toBe(true);
    const rows = await HolidayModel.findAll({ where: { entityId: await entityId(entity.code) } });
    expect(rows.every((r) => r.source === "library")).toBe(true);
    const listed = await request(app).get(`/api/entities/${entity.code}/holidays`).set("Cookie", analyst);
    expect(listed.body).toContainEqual({ date: "2026-04-03", name: "Good Friday", source: "library" });
    const audit = await AuditEventModel.findOne({ where: { action: "holiday.import", target: `${entity.code}/2026` } });
    expect(JSON.parse(audit!.afterJson!).added).toHaveLength(8);
  });

  it("when a USD entity imports 2026, then Thanksgiving 26 November is a holiday and the day after is not (OPM, from memory)", async () => {
    const entity = await newEntity("USD");
    await importYear(entity.code, 2026);
    const off = await holidaysOf(await entityId(entity.code));
    expect(isBusinessDay("2026-11-26", off)).toBe(false); // Thanksgiving Day, fourth Thursday of November
    expect(isBusinessDay("2026-11-27", off)).toBe(true); // an observance in the library, not a federal holiday
    expect(isBusinessDay("2026-07-03", off)).toBe(false); // 4 July is a Saturday: observed on Friday 3 July
    expect(isBusinessDay("2026-12-24", off)).toBe(true); // Christmas Eve is "optional", not imported
  });

  it("when the import runs again, then nothing changes; the bank's own day on a library date stays the bank's", async () => {
    const entity = await newEntity("GBP");
    const bank = await request(app)
      .post(`/api/entities/${entity.code}/holidays`)
      .set("Cookie", admin)
      .send({ date: "2026-12-25", name: "Christmas (office closed)" });
    expect(bank.status).toBe(201);
    expect(bank.body.source).toBe("bank");
    const first = await importYear(entity.code, 2026);
    expect(first.preview.changes).toBe(7);
    expect(first.preview.alreadyBank).toEqual([{ date: "2026-12-25", name: "Christmas Day" }]);
    const again = await importYear(entity.code, 2026);
    expect(again.preview).toMatchObject({ changes: 0, add: [], remove: [] });
    const christmas = await HolidayModel.findOne({
      where: { entityId: await entityId(entity.code), date: "2026-12-25" },
    });
    expect(christmas).toMatchObject({ source: "bank", name: "Christmas (office closed)" });
  });

  it("when the confirmed number of changes is no longer right, then 409 with the plan as it stands and nothing written", async () => {
    const entity = await newEntity("USD");
    const res = await request(app)
      .post(`/api/entities/${entity.code}/holiday-import`)
      .set("Cookie", admin)
      .send({ year: 2026, changes: 3 });
    expect(res.status).toBe(409);
    expect(res.body.error.code).toBe("stale");
    expect(res.body.error.message).toMatch(/now changes 11 days, not 3/);
    expect(res.body.error.details.current.add).toHaveLength(11);
    expect(await HolidayModel.count({ where: { entityId: await entityId(entity.code) } })).toBe(0);
  });

  it("when a euro entity has no country, then the import is refused with 422; once one is chosen, the country's days come in", async () => {
    const entity = await newEntity("EUR");
    expect(entity.country).toBeNull();
    const refused = await request(app)
      .get(`/api/entities/${entity.code}/holiday-import?year=2026`)
      .set("Cookie", admin);
    expect(refused.status).toBe(422);
    expect(refused.body.error.code).toBe("no_country");
    const patched = await request(app)
      .patch(`/api/entities/${entity.code}`)
      .set("Cookie", admin)
      .send({ country: "DE", version: entity.version });
    expect(patched.status).toBe(200);
    expect(patched.body.country).toBe("DE");
    const { preview } = await importYear(entity.code, 2026);
    // Germany's nationwide days include Good Friday and Ascension (Thursday 14 May 2026), from memory.
    expect(preview.add.map((h: { date: string }) => h.date)).toEqual(
      expect.arrayContaining(["2026-04-03", "2026-04-06", "2026-05-14"]),
    );
    // Changing the country again: the next import removes the days the new country does not keep.
    await request(app)
      .patch(`/api/entities/${entity.code}`)
      .set("Cookie", admin)
      .send({ country: "LU", version: patched.body.version })
      .expect(200);
    const moved = await importYear(entity.code, 2026);
    expect(moved.preview.remove.map((h: { date: string }) => h.date)).toContain("2026-04-03"); // no Good Friday in LU
    const off = await holidaysOf(await entityId(entity.code));
    expect(isBusinessDay("2026-04-03", off)).toBe(true);
    expect(isBusinessDay("2026-06-23", off)).toBe(false); // Luxembourg's National Day
  });

  it("when a country is unknown or the year is out of range, then 422 names the field", async () => {
    const entity = await newEntity("GBP");
    const badCountry = await request(app)
      .patch(`/api/entities/${entity.code}`)
      .set("Cookie", admin)
      .send({ country: "XX", version: entity.version });
    expect(badCountry.status).toBe(422);
    expect(badCountry.body.error.details.fields).toHaveProperty("country");
    const badYear = await request(app)
      .get(`/api/entities/${entity.code}/holiday-import?year=1850`)
      .set("Cookie", admin);
    expect(badYear.status).toBe(422);
    expect(badYear.body.error.details.fields).toHaveProperty("year");
  });

  it("when a holiday falls on a weekend, then adding it by hand is still refused with 422 and nothing is written", async () => {
    const entity = await newEntity("GBP");
    const res = await request(app)
      .post(`/api/entities/${entity.code}/holidays`)
      .set("Cookie", admin)
      .send({ date: "2026-12-26", name: "Boxing Day" }); // a Saturday
    expect(res.status).toBe(422);
    expect(res.body.error.code).toBe("weekend_holiday");
    expect(await HolidayModel.count({ where: { entityId: await entityId(entity.code) } })).toBe(0);
  });

  it("every country the entity form offers is one the library knows, with weekday public holidays in 2026", () => {
    for (const country of Object.keys(CALENDAR_COUNTRIES) as CalendarCountry[]) {
      const days = publicHolidays(country, 2026);
      expect(days.length, country).toBeGreaterThan(3);
      for (const d of days) expect(isBusinessDay(d.date), `${country} ${d.date}`).toBe(true); // weekdays only
    }
  });
});
