import request from "supertest";
import { afterAll, describe, expect, it } from "vitest";
import { sequelize } from "../../server/db/sequelize";
import { AuditEventModel } from "../../server/models/audit-event";
import { ExceptionReviewModel } from "../../server/models/exception-review";
import { ExclusionDecisionModel } from "../../server/models/exclusion-decision";
import { reviewSchema } from "../../shared/schemas/review";
import { signOffBook, snapshotApp as app, type Book } from "./snapshot-helpers";
import { exclusionRequested, putDecision } from "./support/exception-reviews";

afterAll(() => sequelize.close());

const tomorrow = () => new Date(Date.now() + 86_400_000).toISOString().slice(0, 10);

const requestExclusion = (book: Book, day: string) =>
  exclusionRequested(book, day, "A stale FX rate overstated the loss on the day.");

const decide = (book: Book, day: string, body: Record<string, unknown>) =>
  putDecision(book.portfolio.code, day, book.croCookie, body);

const countedNow = async (book: Book) =>
  (await request(app).get(`/api/portfolios/${book.portfolio.code}/backtest`).set("Cookie", book.croCookie)).body
    .exceptions.counted as number;

describe("the supervisor's decision on an exclusion", () => {
  it("when the decision is dated in the future, then 422 names the field and nothing is written", async () => {
    const book = await signOffBook();
    const day = book.exceptionDays[0];
    await requestExclusion(book, day);
    const audits = await AuditEventModel.count({ where: { target: `${book.portfolio.code}/${day}` } });

    const res = await decide(book, day, {
      decision: "approved",
      reference: "SUP-1",
      decidedOn: tomorrow(),
      version: 1,
    });
    expect(res.status).toBe(422);
    expect(res.body.error.details.fields).toEqual({
      decidedOn: "The supervisor's decision cannot be dated in the future",
    });
    const row = await ExceptionReviewModel.findOne({ where: { portfolioId: book.portfolio.id, businessDate: day } });
    expect(row).toMatchObject({ exclusionStatus: "requested", decisionDate: null, decidedBy: null, version: 1 });
    expect(await ExclusionDecisionModel.count({ where: { reviewId: row!.id } })).toBe(0);
    expect(await AuditEventModel.count({ where: { target: `${book.portfolio.code}/${day}` } })).toBe(audits);
    // Five exceptions still count (worked by hand in snapshot-helpers).
    expect(await countedNow(book)).toBe(5);
  });

  it("when a recorded approval is corrected to a refusal, then a superseding record with its reason is added, both stay visible, and the exception counts again", async () => {
    const book = await signOffBook();
    const day = book.exceptionDays[1];
    await requestExclusion(book, day);
    const first = await decide(book, day, {
      decision: "approved",
      reference: "SUP-2026-7",
      decidedOn: "2026-10-20",
      version: 1,
    });
    expect(first.status).toBe(200);
    expect(await countedNow(book)).toBe(4);

    // A second decision without a reason would silently rewrite the first: refused, nothing written.
    const refusal = { decision: "rejected", reference: "SUP-2026-7a", decidedOn: "2026-10-27", version: 2 };
    const bare = await decide(book, day, refusal);
    expect(bare.status).toBe(422);
    expect(bare.body.error.details.fields).toHaveProperty("correctionReason");
    const review = await ExceptionReviewModel.findOne({ where: { portfolioId: book.portfolio.id, businessDate: day } });
    expect(await ExclusionDecisionModel.count({ where: { reviewId: review!.id } })).toBe(1);

    const corrected = await decide(book, day, {
      ...refusal,
      correctionReason: "The supervisor withdrew its letter of 20 October",
    });
    expect(corrected.status, JSON.stringify(corrected.body)).toBe(200);
    const body = reviewSchema.parse(corrected.body);
    expect(body).toMatchObject({ exclusionStatus: "rejected", decisionReference: "SUP-2026-7a", version: 3 });
    expect(body.decisions).toEqual([
      expect.objectContaining({
        decision: "approved",
        reference: "SUP-2026-7",
        decidedOn: "2026-10-20",
        recordedBy: book.cro.email,
        supersedes: null,
        correctionReason: null,
        superseded: true,
      }),
      expect.objectContaining({
        decision: "rejected",
        reference: "SUP-2026-7a",
        decidedOn: "2026-10-27",
        supersedes: body.decisions![0].id,
        correctionReason: "The supervisor withdrew its letter of 20 October",
        superseded: false,
      }),
    ]);
    const rows = await ExclusionDecisionModel.findAll({ where: { reviewId: review!.id }, order: [["id", "ASC"]] });
    expect(rows.map((r) => [r.decision, r.reference, r.supersedesId])).toEqual([
      ["approved", "SUP-2026-7", null],
      ["rejected", "SUP-2026-7a", rows[0].id],
    ]);
    const audit = await AuditEventModel.findOne({
      where: { action: "exception.exclusion_rejected", target: `${book.portfolio.code}/${day}` },
    });
    expect(audit!.afterJson).toContain("The supervisor withdrew its letter of 20 October");
    // The refusal puts the exception back into the count: five again.
    expect(await countedNow(book)).toBe(5);
  });
});
