import request from "supertest";
import ExcelJS from "exceljs";
import Papa from "papaparse";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { sequelize } from "../../server/db/sequelize";
import { createTestUser, sessionCookieFor } from "./helpers";
import { approve, type Book, preparedAndSubmitted, signOffBook, snapshotApp as app } from "./snapshot-helpers";
import { putReview } from "./support/exception-reviews";

/**
 * Every table a user reads downloads as CSV and XLSX. Each test reads the file back (papaparse,
 * exceljs) and compares every value with the API's JSON for the same filter. Formula injection:
 * text starting with =, +, -, @, tab or CR gets a leading apostrophe in both formats (OWASP "CSV
 * injection", common practice); numbers are never touched.
 */
let book: Book;
let adminCookie = "";
let snapshotId = 0;
const INJECTION = '=HYPERLINK("http://attacker.test","click") and a stale FX rate overstated the loss';

type Cell = string | number | boolean | Date | null;

/** A binary response body as a Buffer (supertest buffers only text by default). */
function binary(res: request.Response, callback: (err: Error | null, body: Buffer) => void) {
  const chunks: Buffer[] = [];
  res.on("data", (c: Buffer) => chunks.push(c));
  res.on("end", () => callback(null, Buffer.concat(chunks)));
}

async function csvOf(path: string, cookie: string) {
  const res = await request(app).get(path).set("Cookie", cookie);
  expect(res.status, res.text).toBe(200);
  expect(res.headers["content-type"]).toMatch(/^text\/csv/);
  expect(res.headers["content-disposition"]).toMatch(/^attachment; filename=".+\.csv"/);
  expect(res.text.startsWith("\ufeff")).toBe(true);
  const parsed = Papa.parse<string[]>(res.text.slice(1).trimEnd(), { skipEmptyLines: true });
  expect(parsed.errors).toEqual([]);
  const [header, ...rows] = parsed.data;
  return { header, rows };
}

async function xlsxOf(path: string, cookie: string) {
  const res = await request(app).get(path).set("Cookie", cookie).buffer(true).parse(binary);
  expect(res.status).toBe(200);
  expect(res.headers["content-type"]).toBe("application/vnd.openxmlformats-officedocument.spreadsheetml.sheet");
  const workbook = new ExcelJS.Workbook();
  await workbook.xlsx.load(res.body as unknown as ExcelJS.Buffer);
  const sheet = workbook.worksheets[0];
  const header = (sheet.getRow(1).values as Cell[]).slice(1);
  const rows: ExcelJS.Row[] = [];
  sheet.eachRow((row, n) => n > 1 && rows.push(row));
  return { sheet, header, rows };
}

/** The CSV text a JSON value should become. */
function asCsv(v: unknown): string {
  if (v === null || v === undefined) return "";
  if (typeof v === "boolean") return v ? "yes" : "no";
  return String(v);
}

/** The XLSX cell a JSON value should become: dates as dates, numbers as numbers. */
function expectCell(cell: ExcelJS.Cell, v: unknown, kind: "date" | "datetime" | "value" = "value") {
  if (v === null || v === undefined || v === "") return expect(cell.value).toBeNull();
  if (kind !== "value") {
    expect(cell.value).toBeInstanceOf(Date);
    const iso = (cell.value as Date).toISOString();
    return expect(kind === "date" ? iso.slice(0, 10) : Date.parse(iso)).toBe(
      kind === "date" ? v : Date.parse(String(v)),
    );
  }
  if (typeof v === "boolean") return expect(cell.value).toBe(v ? "yes" : "no");
  expect(cell.value).toBe(v);
}

beforeAll(async () => {
  book = await signOffBook();
  const day = book.exceptionDays[1];
  const review = await putReview(book.portfolio.code, day, book.cookie, {
    cause: "data_issue",
    narrative: INJECTION,
    exclusion: false,
  });
  expect(review.status, JSON.stringify(review.body)).toBe(200);
  const submitted = await preparedAndSubmitted(book);
  snapshotId = submitted.id;
  await approve(submitted.id, book.croCookie).expect(200);
  await book.entity.update({ supervisorEmails: ["market-risk@bank-supervisor.test"] });
  const filed = await request(app)
    .post(`/api/snapshots/${submitted.id}/filings`)
    .set("Cookie", book.croCookie)
    .send({});
  expect(filed.status, JSON.stringify(filed.body)).toBeLessThan(300);
  adminCookie = await sessionCookieFor((await createTestUser("admin")).id);
}, 120_000);

afterAll(() => sequelize.close());

describe("the exception list with its reviews, as CSV and XLSX", () => {
  it("when the analyst downloads the Backtest's exceptions, then every day and amount equals the API's, losses stay negative numbers, and a formula in an explanation is inert in both", async () => {
    const asOf = "2026-09-30";
    const json = (
      await request(app).get(`/api/portfolios/${book.portfolio.code}/backtest?asOf=${asOf}`).set("Cookie", book.cookie)
    ).body;
    const days = json.exceptionDays as Array<Record<string, unknown> & { review: Record<string, unknown> | null }>;
    expect(days.length).toBeGreaterThanOrEqual(5);
    const base = `/api/portfolios/${book.portfolio.code}/exceptions`;

    const csv = await csvOf(`${base}.csv?asOf=${asOf}`, book.cookie);
    expect(csv.header.slice(0, 4)).toEqual(["Date", "Actual P&L", "Hypothetical P&L", "VaR 99%"]);
    expect(csv.rows).toHaveLength(days.length);
    days.forEach((d, i) => {
      const row = csv.rows[i];
      expect(row[0]).toBe(d.date);
      expect(Number(row[1])).toBe(d.actualPnl);
      expect(Number(row[2])).toBe(d.hypotheticalPnl);
      expect(Number(row[3])).toBe(d.var99);
      expect(row[4]).toBe(asCsv(d.actual));
      expect(row[6]).toBe(asCsv(d.excessActual));
      expect(row[10]).toBe(asCsv(d.review?.cause));
    });
    const reviewed = days.findIndex((d) => d.review);
    expect(csv.rows[reviewed][11]).toBe(`'${INJECTION}`);
    expect(csv.rows[0][1].startsWith("-")).toBe(true); // a loss: a number, no apostrophe

    const xlsx = await xlsxOf(`${base}.xlsx?asOf=${asOf}`, book.cookie);
    expect(xlsx.header).toEqual(csv.header);
    expect(xlsx.rows).toHaveLength(days.length);
    days.forEach((d, i) => {
      const row = xlsx.rows[i];
      expectCell(row.getCell(1), d.date, "date");
      expectCell(row.getCell(2), d.actualPnl);
      expectCell(row.getCell(3), d.hypotheticalPnl);
      expectCell(row.getCell(4), d.var99);
      expectCell(row.getCell(5), d.actual);
      expectCell(row.getCell(7), d.excessActual);
      expectCell(row.getCell(18), d.review?.reviewedAt, "datetime");
    });
    const narrative = xlsx.rows[reviewed].getCell(12);
    expect(narrative.type).toBe(ExcelJS.ValueType.String);
    expect(narrative.value).toBe(`'${INJECTION}`);
    expect(typeof xlsx.rows[0].getCell(2).value).toBe("number");
    // The entity's currency in the amounts' format, a frozen header row, a bold header.
    expect(xlsx.rows[0].getCell(2).numFmt).toContain(`"${book.entity.currency}"`);
    expect(xlsx.sheet.views[0]).toMatchObject({ state: "frozen", ySplit: 1 });
    expect(xlsx.sheet.getRow(1).font?.bold).toBe(true);
  });

  it("when the rolling history is downloaded for a span, then it holds exactly the API's days and counts", async () => {
    const q = "from=2026-07-01&to=2026-09-30";
    const json = (
      await request(app).get(`/api/portfolios/${book.portfolio.code}/rolling?${q}`).set("Cookie", book.cookie)
    ).body as Array<{ date: string; counted: number; plusFactor: number; complete: boolean }>;
    expect(json.length).toBeGreaterThan(50);
    const csv = await csvOf(`/api/portfolios/${book.portfolio.code}/rolling.csv?${q}`, book.cookie);
    const xlsx = await xlsxOf(`/api/portfolios/${book.portfolio.code}/rolling.xlsx?${q}`, book.cookie);
    expect(csv.rows.map((r) => [r[0], Number(r[3]), Number(r[5]), r[6]])).toEqual(
      json.map((r) => [r.date, r.counted, r.plusFactor, asCsv(r.complete)]),
    );
    json.forEach((r, i) => {
      expectCell(xlsx.rows[i].getCell(1), r.date, "date");
      expectCell(xlsx.rows[i].getCell(4), r.counted);
      expectCell(xlsx.rows[i].getCell(6), r.plusFactor);
    });
  });
});

describe("the lists of quarters, capital, filings, findings, uploads and the audit log", () => {
  it("when snapshots, capital history and determinations are downloaded, then each value equals the API's", async () => {
    const entity = book.entity.code;
    const snapshots = (await request(app).get(`/api/snapshots?entity=${entity}`).set("Cookie", book.cookie)).body;
    const csv = await csvOf(`/api/snapshots.csv?entity=${entity}`, book.cookie);
    expect(csv.rows.map((r) => [Number(r[0]), r[1], r[3], r[4], r[5], Number(r[6]), Number(r[8])])).toEqual(
      snapshots.map((s: Record<string, unknown>) => [
        s.id,
        s.entity,
        s.quarterEnd,
        s.status,
        s.zone,
        s.counted,
        s.multiplier,
      ]),
    );
    const xlsx = await xlsxOf(`/api/snapshots.xlsx?entity=${entity}`, book.cookie);
    snapshots.forEach((s: Record<string, unknown>, i: number) => {
      expectCell(xlsx.rows[i].getCell(1), s.id);
      expectCell(xlsx.rows[i].getCell(4), s.quarterEnd, "date");
      expectCell(xlsx.rows[i].getCell(11), s.capital);
      expectCell(xlsx.rows[i].getCell(14), s.preparedAt, "datetime");
    });

    const history = (await request(app).get(`/api/entities/${entity}/capital/history`).set("Cookie", book.cookie)).body;
    const historyCsv = await csvOf(`/api/entities/${entity}/capital/history.csv`, book.cookie);
    expect(historyCsv.rows.map((r) => [r[0], r[1], Number(r[3]), Number(r[5]), asCsv(r[6]) && Number(r[6])])).toEqual(
      history.map((h: Record<string, unknown>) => [
        h.quarterEnd,
        h.status,
        h.counted,
        h.multiplier,
        h.capital === null ? "" : h.capital,
      ]),
    );

    const determinations = (await request(app).get(`/api/entities/${entity}/determinations`).set("Cookie", book.cookie))
      .body;
    expect(determinations.length).toBeGreaterThan(0);
    const detXlsx = await xlsxOf(`/api/entities/${entity}/determinations.xlsx`, book.cookie);
    expect(detXlsx.rows).toHaveLength(determinations.length);
    determinations.forEach((d: Record<string, unknown>, i: number) => {
      expectCell(detXlsx.rows[i].getCell(1), d.quarterEnd, "date");
      expectCell(detXlsx.rows[i].getCell(3), d.effectiveFrom, "date");
      expectCell(detXlsx.rows[i].getCell(6), d.counted);
      expectCell(detXlsx.rows[i].getCell(11), d.multiplier);
    });
  });

  it("when findings, uploads and filings are downloaded with a filter, then the file holds what the filtered API returns", async () => {
    const q = `entity=${book.entity.code}`;
    const findings = (await request(app).get(`/api/findings?${q}`).set("Cookie", book.cookie)).body;
    const findingsCsv = await csvOf(`/api/findings.csv?${q}`, book.cookie);
    expect(findingsCsv.rows.map((r) => [Number(r[0]), r[2], r[3], r[7]])).toEqual(
      findings.map((f: Record<string, unknown>) => [f.id, f.portfolio, f.kind, f.status]),
    );

    const uploads = (await request(app).get("/api/uploads").set("Cookie", book.cookie)).body;
    const uploadsXlsx = await xlsxOf("/api/uploads.xlsx", book.cookie);
    expect(uploadsXlsx.rows).toHaveLength(uploads.length);
    uploads.slice(0, 20).forEach((u: Record<string, unknown>, i: number) => {
      expectCell(uploadsXlsx.rows[i].getCell(1), u.id);
      expectCell(uploadsXlsx.rows[i].getCell(4), u.rows);
      expectCell(uploadsXlsx.rows[i].getCell(14), u.uploadedAt, "datetime");
    });

    const filings = (await request(app).get("/api/filings").set("Cookie", book.croCookie)).body;
    expect(filings.length).toBeGreaterThan(0);
    const filingsCsv = await csvOf("/api/filings.csv", book.croCookie);
    expect(filingsCsv.rows.map((r) => [Number(r[0]), r[1], r[3], r[15]])).toEqual(
      filings.map((f: Record<string, unknown>) => [f.id, f.entity, f.quarterEnd, f.sha256]),
    );
  });

  it("when the admin downloads the audit log for one person and a span of days, then only their events of those days are in it", async () => {
    const today = new Date().toISOString().slice(0, 10);
    const q = `actor=${encodeURIComponent(book.analyst.email)}&from=${today}&to=${today}`;
    const csv = await csvOf(`/api/audit-events.csv?${q}`, adminCookie);
    expect(csv.rows.length).toBeGreaterThan(0);
    for (const row of csv.rows) {
      expect(row[2]).toBe(book.analyst.email);
      expect(row[1].slice(0, 10)).toBe(today);
    }
    const page = (await request(app).get(`/api/audit-events?${q}&limit=200`).set("Cookie", adminCookie)).body;
    expect(csv.rows.map((r) => Number(r[0]))).toEqual(page.items.map((e: { id: number }) => e.id));
    const none = await csvOf(
      `/api/audit-events.csv?actor=${encodeURIComponent(book.analyst.email)}&from=2001-01-01&to=2001-01-31`,
      adminCookie,
    );
    expect(none.rows).toEqual([]);
    expect(none.header[0]).toBe("Event");
  });

  it("when a snapshot's return data is downloaded, then each template row, value and source equals the API's", async () => {
    const json = (await request(app).get(`/api/snapshots/${snapshotId}/return`).set("Cookie", book.cookie)).body;
    const fields = json.fields as Array<{ key: string; templateRow?: string; value: number | null; source: string }>;
    expect(fields.length).toBeGreaterThan(5);
    const csv = await csvOf(`/api/snapshots/${snapshotId}/return.csv`, book.cookie);
    expect(csv.header).toEqual(["Template row", "Item", "Value", "Unit", "Source", "Entered by the analyst", "Key"]);
    expect(csv.rows.map((r) => [r[6], r[0], r[2] === "" ? null : Number(r[2]), r[4]])).toEqual(
      fields.map((f) => [f.key, f.templateRow ?? "", f.value, f.source]),
    );
    const xlsx = await xlsxOf(`/api/snapshots/${snapshotId}/return.xlsx`, book.cookie);
    expect(xlsx.sheet.name).toMatch(/^Return data /);
    fields.forEach((f, i) => {
      expectCell(xlsx.rows[i].getCell(3), f.value);
      expectCell(xlsx.rows[i].getCell(7), f.key);
    });
  });

  it("when a format other than csv or xlsx, or a reversed span, is asked for, then 422 with a clear message", async () => {
    const pdf = await request(app).get("/api/findings.pdf").set("Cookie", book.cookie);
    expect(pdf.status).toBe(422);
    expect(pdf.body.error.message).toMatch(/\.csv or \.xlsx/);
    const reversed = await request(app)
      .get("/api/audit-events.csv?from=2026-10-01&to=2026-09-01")
      .set("Cookie", adminCookie);
    expect(reversed.status).toBe(422);
    expect(reversed.body.error.message).toMatch(/first day comes after the last/);
  });

  it("when treasury asks for the exceptions or the regulator for the snapshots, then the policy refuses as it does for the JSON", async () => {
    const exceptions = await request(app)
      .get(`/api/portfolios/${book.portfolio.code}/exceptions.csv`)
      .set("Cookie", book.treasuryCookie);
    expect(exceptions.status).toBe(403);
    const regulator = await sessionCookieFor((await createTestUser("regulator")).id);
    expect((await request(app).get("/api/snapshots.xlsx").set("Cookie", regulator)).status).toBe(403);
  });
});
