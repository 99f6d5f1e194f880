import request from "supertest";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { sequelize } from "../../server/db/sequelize";
import { AuditEventModel } from "../../server/models/audit-event";
import { EvidenceFileModel } from "../../server/models/evidence-file";
import { ExceptionReviewModel } from "../../server/models/exception-review";
import { createTestUser, sessionCookieFor, testApp } from "./helpers";
import { HEADER, ingestFixture, uploadCsv, weekdays } from "./ingest-helpers";
import { putReview, putDecision } from "./support/exception-reviews";

const app = testApp();
afterAll(() => sequelize.close());

/**
 * 260 business days of an EU entity (higher of actual and hypothetical counts): a loss of 50
 * against a VaR of 100 every day, except five days where both losses are 150 (exceptions).
 */
async function fiveExceptionBook() {
  const fx = await ingestFixture();
  const dates = weekdays("2025-10-01", 260, new Set(["2025-12-25", "2026-12-25"]));
  const exceptionDays = [dates[20], dates[80], dates[150], dates[200], dates[255]];
  const lines = dates.map((d) =>
    exceptionDays.includes(d) ? `${fx.portfolio.code},${d},-150,-150,100` : `${fx.portfolio.code},${d},-50,-40,100`,
  );
  const preview = await uploadCsv(app, fx.cookie, [HEADER, ...lines].join("\n"));
  expect(preview.body.invalid).toBe(0);
  await request(app).post(`/api/uploads/${preview.body.id}/commit`).set("Cookie", fx.cookie).expect(200);
  const cro = await createTestUser("cro");
  return { ...fx, dates, exceptionDays, croCookie: await sessionCookieFor(cro.id), cro };
}

let book: Awaited<ReturnType<typeof fiveExceptionBook>>;
beforeAll(async () => {
  book = await fiveExceptionBook();
});

describe("the backtest of a portfolio", () => {
  it("when five exceptions fall in a full 250-day window, then the zone is yellow, the plus factor 0.40 and the multiplier 3.40 (BCBS 1996 Table 2; CRR Art. 366 Table 1, from memory)", async () => {
    const res = await request(app).get(`/api/portfolios/${book.portfolio.code}/backtest`).set("Cookie", book.cookie);
    expect(res.status).toBe(200);
    expect(res.body).toMatchObject({
      portfolio: { code: book.portfolio.code, level: "top" },
      regime: "eu",
      pnlBasis: "max",
      asOf: book.dates[259],
      window: { start: book.dates[10], end: book.dates[259], observations: 250, complete: true },
      exceptions: { actual: 5, hypothetical: 5, counted: 5, excluded: 0 },
      zone: "yellow",
      plusFactor: 0.4,
      multiplier: 3.4,
    });
    expect(res.body.expected).toBeCloseTo(2.5, 9); // 250 × 1%
    // P(X ≤ 5) for Binomial(250, 0.01) = 95.88% (BCBS 1996 Table 2).
    expect(res.body.tests.cumulativeProbability).toBeCloseTo(0.9588, 4);
    expect(res.body.exceptionDays.map((d: { date: string }) => d.date)).toEqual(book.exceptionDays);
    expect(res.body.exceptionDays[0]).toMatchObject({ actualPnl: -150, var99: 100, excessActual: 50, review: null });
  });

  it("when asked as of an earlier date, then the window ends there", async () => {
    const res = await request(app)
      .get(`/api/portfolios/${book.portfolio.code}/backtest?asOf=${book.dates[150]}`)
      .set("Cookie", book.cookie);
    expect(res.body.window).toMatchObject({ end: book.dates[150], observations: 151, complete: false });
    expect(res.body.exceptions.counted).toBe(3);
  });

  it("when asked as of a day before the first stored day, then 404 names the first day instead of a green zone from no observations", async () => {
    const res = await request(app)
      .get(`/api/portfolios/${book.portfolio.code}/backtest?asOf=2020-01-06`)
      .set("Cookie", book.cookie);
    expect(res.status).toBe(404);
    expect(res.body.error.code).toBe("no_data_before");
    expect(res.body.error.message).toContain(`its first stored day is ${book.dates[0]}`);
    expect(res.body.zone).toBeUndefined();
  });

  it("when the rolling count is read, then its last row agrees with the backtest", async () => {
    const res = await request(app)
      .get(`/api/portfolios/${book.portfolio.code}/rolling?from=${book.dates[250]}`)
      .set("Cookie", book.cookie);
    expect(res.status).toBe(200);
    expect(res.body).toHaveLength(10);
    expect(res.body.at(-1)).toMatchObject({
      date: book.dates[259],
      counted: 5,
      zone: "yellow",
      plusFactor: 0.4,
      complete: true,
    });
  });

  it("when a portfolio has no data, then 404 says what to do", async () => {
    const empty = await ingestFixture();
    const res = await request(app).get(`/api/portfolios/${empty.portfolio.code}/backtest`).set("Cookie", empty.cookie);
    expect(res.status).toBe(404);
    expect(res.body.error).toMatchObject({ code: "no_data", message: expect.stringMatching(/upload/i) });
  });
});

describe("reviewing exceptions and recording exclusion decisions", () => {
  it("when an analyst explains an exception and asks to exclude it, and the CRO records the supervisor's approval, then the counted figure drops to 4, green, multiplier 3.00 (BCBS 1996 Table 2)", async () => {
    const day = book.exceptionDays[1];
    const review = await putReview(book.portfolio.code, day, book.cookie, {
      cause: "data_issue",
      narrative: "A stale FX rate in the end-of-day snapshot overstated the loss.",
      exclusion: true,
    });
    expect(review.status).toBe(200);
    expect(review.body).toMatchObject({ cause: "data_issue", exclusionStatus: "requested", version: 1 });

    // Requested is not approved: the count stands.
    let bt = await request(app).get(`/api/portfolios/${book.portfolio.code}/backtest`).set("Cookie", book.cookie);
    expect(bt.body.exceptions.counted).toBe(5);

    const decision = await putDecision(book.portfolio.code, day, book.croCookie, {
      decision: "approved",
      reference: "NBA/2026/117",
      decidedOn: "2026-10-20",
      version: 1,
    });
    expect(decision.status).toBe(200);
    expect(decision.body).toMatchObject({
      exclusionStatus: "approved",
      decisionReference: "NBA/2026/117",
      decidedBy: book.cro.email,
      version: 2,
    });

    bt = await request(app).get(`/api/portfolios/${book.portfolio.code}/backtest`).set("Cookie", book.croCookie);
    expect(bt.body.exceptions).toMatchObject({ counted: 4, excluded: 1 });
    expect(bt.body).toMatchObject({ zone: "green", plusFactor: 0, multiplier: 3 });
    expect(bt.body.exceptionDays.find((d: { date: string }) => d.date === day)).toMatchObject({
      excluded: true,
      review: { exclusionStatus: "approved" },
    });

    const row = await ExceptionReviewModel.findOne({ where: { portfolioId: book.portfolio.id, businessDate: day } });
    expect(row).toMatchObject({
      exclusionStatus: "approved",
      decidedBy: book.cro.id,
      decisionReference: "NBA/2026/117",
      version: 2,
    });
    expect(
      await AuditEventModel.count({
        where: { action: "exception.exclusion_approved", target: `${book.portfolio.code}/${day}` },
      }),
    ).toBe(1);

    // The analyst cannot quietly withdraw an approved exclusion, nor rewrite the approved explanation.
    const withdraw = { cause: "data_issue", narrative: "Changed my mind about this one entirely.", exclusion: false };
    const rewrite = { cause: "market_move", narrative: "On reflection it was simply a market move.", exclusion: true };
    for (const change of [withdraw, rewrite])
      expect((await putReview(book.portfolio.code, day, book.cookie, { ...change, version: 2 })).status).toBe(409);
    expect(
      (await ExceptionReviewModel.findOne({ where: { portfolioId: book.portfolio.id, businessDate: day } }))!.cause,
    ).toBe("data_issue");
  });

  it("when two analysts save the same review at once from the same version, then one wins and the other gets 409 with the current review", async () => {
    const day = book.exceptionDays[2];
    const other = await createTestUser("analyst");
    const otherCookie = await sessionCookieFor(other.id);
    const send = (cookie: string, narrative: string) =>
      putReview(book.portfolio.code, day, cookie, { cause: "market_move", narrative, exclusion: false, version: 0 });
    const [a, b] = await Promise.all([
      send(book.cookie, "Rates gapped after the central bank surprise."),
      send(otherCookie, "A large move in long-dated swap spreads."),
    ]);
    expect([a.status, b.status].sort()).toEqual([200, 409]);
    const loser = a.status === 409 ? a : b;
    const winner = a.status === 200 ? a : b;
    expect(loser.body.error.details.current).toMatchObject({ narrative: winner.body.narrative, version: 1 });
    expect(await ExceptionReviewModel.count({ where: { portfolioId: book.portfolio.id, businessDate: day } })).toBe(1);
  });

  it("when a day without an exception is reviewed, then 422 explains it", async () => {
    const res = await putReview(book.portfolio.code, book.dates[3], book.cookie, {
      cause: "other",
      narrative: "Nothing happened on this day at all.",
      exclusion: false,
    });
    expect(res.status).toBe(422);
    expect(res.body.error.code).toBe("not_an_exception");
  });

  it("when evidence is attached, then it is stored with its hash and always served as a download; an unknown binary is refused", async () => {
    const day = book.exceptionDays[3];
    await putReview(book.portfolio.code, day, book.cookie, {
      cause: "pricing",
      narrative: "Vendor curve for the credit book arrived late.",
      exclusion: false,
    }).expect(200);
    const pdf = Buffer.from("%PDF-1.4\n1 0 obj <<>> endobj\ntrailer <<>>\n%%EOF\n");
    const added = await request(app)
      .post(`/api/portfolios/${book.portfolio.code}/exceptions/${day}/evidence`)
      .set("Cookie", book.cookie)
      .attach("file", pdf, "vendor-note.pdf");
    expect(added.status).toBe(201);
    const ev = added.body.evidence[0];
    expect(ev).toMatchObject({ fileName: "vendor-note.pdf", contentType: "application/pdf", sizeBytes: pdf.length });
    expect((await EvidenceFileModel.findByPk(ev.id))!.sha256).toBe(ev.sha256);

    const download = await request(app).get(`/api/evidence/${ev.id}`).set("Cookie", book.croCookie).buffer(true);
    expect(download.status).toBe(200);
    expect(download.headers["content-type"]).toBe("application/octet-stream");
    expect(download.headers["content-disposition"]).toMatch(/^attachment; filename="vendor-note.pdf"/);
    expect(Buffer.from(download.body).equals(pdf)).toBe(true);

    const exe = await request(app)
      .post(`/api/portfolios/${book.portfolio.code}/exceptions/${day}/evidence`)
      .set("Cookie", book.cookie)
      .attach("file", Buffer.from([0x4d, 0x5a, 0x90, 0x00, 0x03]), "tool.pdf");
    expect(exe.status).toBe(415);
    expect(
      await EvidenceFileModel.count({
        where: {
          reviewId: (await ExceptionReviewModel.findOne({
            where: { portfolioId: book.portfolio.id, businessDate: day },
          }))!.id,
        },
      }),
    ).toBe(1);
  });
});

describe("the overview", () => {
  it("when an entity has data, then it shows the zone, the count, the multiplier and what is still open", async () => {
    const res = await request(app).get("/api/overview").set("Cookie", book.cookie);
    expect(res.status).toBe(200);
    const mine = res.body.find((e: { entity: string }) => e.entity === book.entity.code);
    expect(mine).toMatchObject({ portfolio: book.portfolio.code, asOf: book.dates[259], complete: true });
    expect(typeof mine.counted).toBe("number");
    expect(mine.zone).toMatch(/green|yellow/);
    expect(mine.openReviews).toBeGreaterThanOrEqual(1);
    expect(mine.nextRollOff).toMatchObject({ date: book.exceptionDays[0] });
    expect(mine.quarterClose).toBeNull(); // no snapshot prepared for this entity
  });
});
