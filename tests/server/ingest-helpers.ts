import request from "supertest";
import { HolidayModel } from "../../server/models/holiday";
import { createTestEntity, createTestPortfolio, createTestUser, sessionCookieFor } from "./helpers";
import type { createApp } from "../../server/app";

/** An entity with one portfolio and a holiday, and an analyst's cookie: the rows one test needs. */
export async function ingestFixture() {
  const entity = await createTestEntity();
  const portfolio = await createTestPortfolio(entity, "BOOK", "Book");
  await HolidayModel.create({ entityId: entity.id, date: "2026-12-25", name: "Christmas Day" });
  const analyst = await createTestUser("analyst");
  return { entity, portfolio, analyst, cookie: await sessionCookieFor(analyst.id) };
}

export const HEADER = "portfolio,date,actual_pnl,hypothetical_pnl,var_99";

/** Weekdays from a start date, as YYYY-MM-DD. */
export function weekdays(start: string, count: number, skip: ReadonlySet<string> = new Set()): string[] {
  const out: string[] = [];
  const d = new Date(`${start}T00:00:00Z`);
  while (out.length < count) {
    const wd = d.getUTCDay();
    const iso = d.toISOString().slice(0, 10);
    if (wd !== 0 && wd !== 6 && !skip.has(iso)) out.push(iso);
    d.setUTCDate(d.getUTCDate() + 1);
  }
  return out;
}

export function csvFor(
  portfolio: string,
  dates: string[],
  value = (i: number) => `${-100 * i - 1},${-90 * i},${1000 + i}`,
): string {
  return [HEADER, ...dates.map((d, i) => `${portfolio},${d},${value(i)}`)].join("\n") + "\n";
}

export function uploadCsv(
  app: ReturnType<typeof createApp>,
  cookie: string,
  content: string | Buffer,
  fileName = "daily.csv",
) {
  const bytes = Buffer.isBuffer(content) ? content : Buffer.from(content);
  // form-data keeps only the base name unless told the full path (filepath), as a hostile client would send it.
  const name = fileName.includes("/") ? { filepath: fileName, contentType: "text/csv" } : fileName;
  return request(app).post("/api/uploads").set("Cookie", cookie).attach("file", bytes, name);
}
