import request from "supertest";
import { afterAll, describe, expect, it } from "vitest";
import { sequelize } from "../../server/db/sequelize";
import { AuditEventModel } from "../../server/models/audit-event";
import { DataFindingModel } from "../../server/models/data-finding";
import { SnapshotModel } from "../../server/models/snapshot";
import { quarterFigures } from "../../server/modules/backtest/quarter-figures";
import { UserModel } from "../../server/models/user";
import { capitalAddOn, capitalRequirement } from "../../shared/backtest/capital";
import { capitalHistorySchema } from "../../shared/schemas/capital";
import {
  snapshotHeadlineFiguresSchema,
  snapshotListSchema,
  snapshotSchema,
  snapshotVerifySchema,
} from "../../shared/schemas/snapshot";
import type { Observation } from "../../shared/backtest/types";
import { createTestUser, sessionCookieFor } from "./helpers";
import { ingestFixture } from "./ingest-helpers";
import {
  approve,
  type Book,
  HEADER,
  prepare,
  preparedAndSubmitted,
  Q2,
  Q3,
  signOffBook,
  snapshotApp as app,
  submit,
  uploadAndCommit,
  verify,
  weekdaysEndingOn,
  approvedQuarter,
} from "./snapshot-helpers";
import { exclusionDecided } from "./support/exception-reviews";

afterAll(() => sequelize.close());

/** An open data-quality finding (an outlier on 12 August 2026) inside the book's Q3. */
function openFindingInQ3(book: Book) {
  return DataFindingModel.create({
    portfolioId: book.portfolio.id,
    kind: "outlier",
    dateFrom: "2026-08-12",
    dateTo: "2026-08-12",
    detail: "check",
    note: null,
    closedBy: null,
    closedAt: null,
  });
}

describe("preparing a quarter snapshot", () => {
  it("when an analyst prepares a past quarter, then the draft holds the engine's figures at the quarter's last business day, and the row and the audit say so", async () => {
    const book = await signOffBook();
    const res = await prepare(book);
    expect(res.status).toBe(201);
    expect(() => snapshotSchema.parse(res.body)).not.toThrow();
    // Five exceptions in 250 days: yellow, plus factor 0.40, multiplier 3.40 (BCBS 1996 Table 2; CRR Art. 366, from memory).
    expect(res.body).toMatchObject({
      entity: book.entity.code,
      quarterEnd: Q3,
      status: "draft",
      zone: "yellow",
      counted: 5,
      plusFactor: 0.4,
      multiplier: 3.4,
      preparedBy: expect.stringContaining("@"),
    });
    expect(res.body.figures).toMatchObject({
      asOf: Q3,
      window: { end: Q3, observations: 250, complete: true },
      exceptionDates: book.exceptionDays,
      qualitativeAddend: 0,
    });
    expect(res.body.inputsSha256).toMatch(/^[0-9a-f]{64}$/);

    // The capital figures are the engine's own (shared/backtest/capital.ts) over the same days.
    const series: Observation[] = book.dates.map((d, i) => {
      const loss = book.exceptionDays.includes(d) ? 150 : 50;
      return {
        date: d,
        actualPnl: -loss,
        hypotheticalPnl: -loss + 10,
        var99: 100 + (i % 2),
        var975: null,
        svar99: 250,
        var10d: null,
        svar10d: null,
        es975: null,
        ses: null,
        rtpl: null,
      };
    });
    const opts = { regime: "eu" as const, asOf: Q3, count: 5, qualitativeAddend: 0 };
    expect(res.body.capital).toBeCloseTo(capitalRequirement(series, opts).requirement, 2);
    expect(res.body.addOn).toBeCloseTo(capitalAddOn(series, opts), 2);
    expect(res.body.addOn).toBeGreaterThan(0);

    const row = await SnapshotModel.findByPk(res.body.id);
    expect(row).toMatchObject({ status: "draft", counted: 5, multiplier: 3.4, asOf: Q3, hash: null });
    expect(
      await AuditEventModel.count({ where: { action: "snapshot.prepare", target: `snapshot #${res.body.id}` } }),
    ).toBe(1);
  });

  it("when the quarter has not ended, is no quarter end, or has no data on its last business day, then it is refused with a clear message and nothing is stored", async () => {
    const book = await signOffBook();
    const future = await prepare(book, "2026-12-31");
    expect(future.status).toBe(422);
    expect(future.body.error.message).toMatch(/Q4 2026 has not ended yet/);
    const notAQuarter = await prepare(book, "2026-09-29");
    expect(notAQuarter.status).toBe(422);
    expect(notAQuarter.body.error.details.fields.quarterEnd).toMatch(/quarter ends on/);
    const beforeData = await prepare(book, "2024-12-31");
    expect(beforeData.status).toBe(422);
    expect(beforeData.body.error.code).toBe("quarter_data_incomplete");
    expect(await SnapshotModel.count({ where: { entityId: book.entity.id } })).toBe(0);
  });
});

describe("the four-eyes sign-off", () => {
  it("when a CRO approves an analyst's submitted snapshot, then it is signed off with a hash, the next approval links to it, and both verify", async () => {
    const book = await signOffBook();
    const submitted = await preparedAndSubmitted(book);
    expect(submitted).toMatchObject({ status: "submitted", submittedBy: submitted.preparedBy });

    const approved = await approve(submitted.id, book.croCookie, { comment: "Agreed", version: submitted.version });
    expect(approved.status, JSON.stringify(approved.body)).toBe(200);
    expect(approved.body).toMatchObject({
      status: "approved",
      approvedBy: book.cro.email,
      prevHash: null,
      hash: expect.stringMatching(/^[0-9a-f]{64}$/),
    });
    expect(approved.body.history.map((e: { action: string }) => e.action)).toEqual([
      "prepared",
      "submitted",
      "approved",
    ]);
    expect(await SnapshotModel.findByPk(submitted.id)).toMatchObject({
      status: "approved",
      approvedBy: book.cro.id,
      hash: approved.body.hash,
    });

    const second = await preparedAndSubmitted(book, Q2);
    const approvedQ2 = await approve(second.id, book.croCookie);
    expect(approvedQ2.body.prevHash).toBe(approved.body.hash);

    for (const id of [submitted.id, second.id]) {
      const verified = await verify(id, book.treasuryCookie);
      expect(snapshotVerifySchema.parse(verified.body)).toMatchObject({ valid: true });
    }
  });

  it("when two CROs approve two quarters of one entity at the same moment, then the approvals take turns and the chain stays one line", async () => {
    const book = await signOffBook();
    const q3 = await preparedAndSubmitted(book, Q3);
    const q2 = await preparedAndSubmitted(book, Q2);
    const otherCro = await sessionCookieFor((await createTestUser("cro")).id);
    const [a, b] = await Promise.all([approve(q3.id, book.croCookie), approve(q2.id, otherCro)]);
    expect([a.status, b.status]).toEqual([200, 200]);
    const [first, second] = [a.body, b.body].sort((x, y) => (x.approvedAt < y.approvedAt ? -1 : 1));
    expect(first.prevHash).toBeNull();
    expect(second.prevHash).toBe(first.hash);
    for (const id of [q3.id, q2.id]) {
      expect((await verify(id, book.cookie)).body.valid).toBe(true);
    }
  });

  it("when the capital figure column is altered behind the application's back, then verify says it is not valid", async () => {
    const book = await signOffBook();
    const submitted = await approvedQuarter(book);
    await sequelize.query("UPDATE snapshots SET capital = capital - 1 WHERE id = :id", {
      replacements: { id: submitted.id },
    });
    const verified = await verify(submitted.id, book.croCookie);
    expect(verified.body).toMatchObject({ valid: false });
  });

  it("when the person who prepared it (now a CRO) tries to approve it, then 403 says four eyes and the snapshot stays submitted", async () => {
    const book = await signOffBook();
    const draft = await prepare(book, Q3, book.analyst2Cookie);
    await submit(draft.body.id, book.analyst2Cookie).expect(200);
    await UserModel.update({ role: "cro" }, { where: { id: book.analyst2.id } });
    const res = await approve(draft.body.id, await sessionCookieFor(book.analyst2.id));
    expect(res.status).toBe(403);
    expect(res.body.error).toMatchObject({
      code: "four_eyes",
      message: expect.stringMatching(/someone else must approve/),
    });
    expect((await SnapshotModel.findByPk(draft.body.id))!.status).toBe("submitted");
  });

  it("when open data-quality findings lie inside the quarter, then submit is refused until they are resolved", async () => {
    const book = await signOffBook();
    const finding = await openFindingInQ3(book);
    const draft = await prepare(book);
    expect(draft.body.openFindings).toBe(1);
    const refused = await submit(draft.body.id, book.cookie);
    expect(refused.status).toBe(409);
    expect(refused.body.error).toMatchObject({
      code: "open_findings",
      message: expect.stringMatching(/1 open data-quality finding inside Q3 2026 blocks sign-off/),
    });
    expect((await SnapshotModel.findByPk(draft.body.id))!.status).toBe("draft");

    await finding.update({ status: "explained", note: "Confirmed with the desk" });
    const submitted = await submit(draft.body.id, book.cookie);
    expect(submitted.body).toMatchObject({ status: "submitted", openFindings: 0 });
  });

  it("when the data changes between submission and approval, then approval is refused; returned, it is prepared again from the new data", async () => {
    const book = await signOffBook();
    const submitted = await preparedAndSubmitted(book);
    const day = book.dates.indexOf("2026-09-15");
    await uploadAndCommit(book.cookie, [HEADER, book.row(book.dates[day], day, 150)].join("\n")); // a sixth exception
    const refused = await approve(submitted.id, book.croCookie);
    expect(refused.status).toBe(409);
    expect(refused.body.error.code).toBe("inputs_changed");

    const noReason = await request(app)
      .post(`/api/snapshots/${submitted.id}/return`)
      .set("Cookie", book.croCookie)
      .send({ comment: " " });
    expect(noReason.status).toBe(422);
    const returned = await request(app)
      .post(`/api/snapshots/${submitted.id}/return`)
      .set("Cookie", book.croCookie)
      .send({ comment: "Data restated on 15 Sep" });
    expect(returned.body).toMatchObject({ status: "returned", counted: 5 });
    const again = await prepare(book);
    expect(again.status).toBe(200);
    // Six exceptions: yellow, plus factor 0.50, multiplier 3.50 (BCBS 1996 Table 2; CRR Art. 366, from memory).
    expect(again.body).toMatchObject({
      id: submitted.id,
      status: "draft",
      counted: 6,
      zone: "yellow",
      plusFactor: 0.5,
      multiplier: 3.5,
    });
    expect(again.body.history.map((e: { action: string }) => e.action)).toEqual([
      "prepared",
      "submitted",
      "returned",
      "recomputed",
    ]);
  });

  it("when someone acts on a version they no longer see, or on the wrong status, then 409 says so", async () => {
    const book = await signOffBook();
    const draft = await prepare(book);
    const stale = await submit(draft.body.id, book.cookie, { version: draft.body.version + 5 });
    expect(stale.status).toBe(409);
    expect(stale.body.error).toMatchObject({ code: "stale" });
    const early = await approve(draft.body.id, book.croCookie);
    expect(early.status).toBe(409);
    expect(early.body.error.message).toMatch(/only a submitted snapshot can be approved/);
  });
});

describe("after sign-off", () => {
  it("when a day inside an approved snapshot's window is restated, then the upload is accepted, the snapshot is flagged and its figures and hash stay as approved", async () => {
    const book = await signOffBook();
    const submitted = await preparedAndSubmitted(book);
    const approved = (await approve(submitted.id, book.croCookie)).body;
    const day = book.dates.indexOf("2026-09-15");
    const commit = await uploadAndCommit(book.cookie, [HEADER, book.row(book.dates[day], day, 150)].join("\n"));
    expect(commit).toMatchObject({ inserted: 1, restated: 1 });

    const after = await request(app).get(`/api/snapshots/${submitted.id}`).set("Cookie", book.cookie);
    expect(after.body).toMatchObject({ status: "approved", counted: 5, multiplier: 3.4, hash: approved.hash });
    expect(after.body.restatedAfterSignOff.detail).toMatch(
      /1 day inside this snapshot's window changed by upload #\d+: 1 restated \(.* 2026-09-15\)/,
    );
    expect((await SnapshotModel.findByPk(submitted.id))!.restatedAt).not.toBeNull();
    expect(
      await AuditEventModel.count({ where: { action: "snapshot.restated", target: `snapshot #${submitted.id}` } }),
    ).toBe(1);
    const verified = await verify(submitted.id, book.croCookie);
    expect(verified.body.valid).toBe(true);
  });

  it("when a day that had no data inside an approved window is filled in later, then the snapshot is flagged as well", async () => {
    const fx = await ingestFixture();
    const dates = weekdaysEndingOn(Q3, 300);
    const gap = dates.indexOf("2026-08-19");
    const line = (i: number) => `${fx.portfolio.code},${dates[i]},-50,-40,${100 + (i % 2)},250`;
    await uploadAndCommit(
      fx.cookie,
      [
        HEADER,
        ...dates
          .map((_, i) => i)
          .filter((i) => i !== gap)
          .map(line),
      ].join("\n"),
    );
    // The missing day is a finding inside the quarter: it must be explained before sign-off.
    const finding = (await DataFindingModel.findOne({
      where: { portfolioId: fx.portfolio.id, kind: "missing_day", status: "open" },
    }))!;
    await request(app)
      .put(`/api/findings/${finding.id}`)
      .set("Cookie", fx.cookie)
      .send({ status: "explained", note: "Feed outage, value to follow", version: finding.version })
      .expect(200);
    const draft = await request(app)
      .post("/api/snapshots")
      .set("Cookie", fx.cookie)
      .send({ entity: fx.entity.code, quarterEnd: Q3 });
    await submit(draft.body.id, fx.cookie).expect(200);
    const cro = await sessionCookieFor((await createTestUser("cro")).id);
    await approve(draft.body.id, cro).expect(200);

    await uploadAndCommit(fx.cookie, [HEADER, line(gap)].join("\n"));
    const after = await request(app).get(`/api/snapshots/${draft.body.id}`).set("Cookie", fx.cookie);
    expect(after.body.restatedAfterSignOff.detail).toMatch(
      /1 day inside this snapshot's window changed by upload #\d+: 1 added where there was no data \(.* 2026-08-19\)/,
    );
    expect(after.body).toMatchObject({ status: "approved", counted: draft.body.counted });
  });

  it("when the supervisor's decision to disregard an exception inside an approved window is recorded later, then the snapshot is flagged and keeps its count", async () => {
    const book = await signOffBook();
    const submitted = await approvedQuarter(book);
    const day = book.exceptionDays[3];
    await exclusionDecided(book, day, "The P&L feed double-counted a trade on this day.", {
      decision: "approved",
      reference: "SUP-2026-118",
      decidedOn: "2026-11-20",
    });
    const after = await request(app).get(`/api/snapshots/${submitted.id}`).set("Cookie", book.cookie);
    expect(after.body).toMatchObject({ status: "approved", counted: 5 });
    expect(after.body.restatedAfterSignOff.detail).toMatch(
      new RegExp(`changed by the exclusion decision recorded for ${day}: 1 with an exclusion decided`),
    );
  });

  it("when a signed quarter is recomputed from today's unchanged data, then the engine gives exactly the stored figures and inputs hash", async () => {
    const book = await signOffBook();
    const submitted = await approvedQuarter(book);
    const row = (await SnapshotModel.findByPk(submitted.id))!;
    const again = await quarterFigures(book.entity, Q3);
    expect(again.figures).toEqual(JSON.parse(row.figuresJson));
    expect(again.inputsSha256).toBe(row.inputsSha256);
  });

  it("when a signed-off snapshot's stored figures are altered behind the application's back, then verify says it is not valid", async () => {
    const book = await signOffBook();
    const submitted = await approvedQuarter(book);
    await sequelize.query(
      "UPDATE snapshots SET figures_json = REPLACE(figures_json, '\"counted\":5', '\"counted\":3') WHERE id = :id",
      { replacements: { id: submitted.id } },
    );
    const verified = await verify(submitted.id, book.croCookie);
    expect(verified.body).toMatchObject({
      valid: false,
      detail: expect.stringMatching(/figures \(sha256\) is now .* signed as .*changed behind the application's back/),
    });
  });

  it("when treasury lists snapshots, then only signed-off ones are there, and a draft is not found", async () => {
    const book = await signOffBook();
    const submitted = await approvedQuarter(book);
    const draft = await prepare(book, Q2);
    const list = await request(app).get(`/api/snapshots?entity=${book.entity.code}`).set("Cookie", book.treasuryCookie);
    expect(list.body.map((s: { id: number; status: string }) => [s.id, s.status])).toEqual([
      [submitted.id, "approved"],
    ]);
    expect((await request(app).get(`/api/snapshots/${draft.body.id}`).set("Cookie", book.treasuryCookie)).status).toBe(
      404,
    );
    const analystList = await request(app).get(`/api/snapshots?entity=${book.entity.code}`).set("Cookie", book.cookie);
    expect(analystList.body.map((s: { quarterEnd: string }) => s.quarterEnd)).toEqual([Q3, Q2]);

    // The capital history reads the same snapshots, oldest first.
    const history = await request(app)
      .get(`/api/entities/${book.entity.code}/capital/history`)
      .set("Cookie", book.treasuryCookie);
    expect(capitalHistorySchema.parse(history.body)).toEqual([
      {
        quarterEnd: Q3,
        status: "approved",
        zone: "yellow",
        counted: 5,
        plusFactor: 0.4,
        multiplier: 3.4,
        capital: submitted.capital,
        addOn: submitted.addOn,
        snapshotId: submitted.id,
        restatedAfterSignOff: false,
        windowComplete: true,
      },
    ]);
    const fullHistory = await request(app)
      .get(`/api/entities/${book.entity.code}/capital/history`)
      .set("Cookie", book.croCookie);
    expect(fullHistory.body.map((h: { quarterEnd: string; status: string }) => [h.quarterEnd, h.status])).toEqual([
      [Q2, "draft"],
      [Q3, "approved"],
    ]);
  });

  it("when an analyst lists snapshots, then each item carries the headline of its figures without the window's days, and the detail keeps everything", async () => {
    const book = await signOffBook();
    await openFindingInQ3(book);
    const q3 = (await prepare(book)).body;
    const q2 = (await prepare(book, Q2)).body;
    const list = await request(app).get(`/api/snapshots?entity=${book.entity.code}`).set("Cookie", book.cookie);
    expect(list.status).toBe(200);
    expect(() => snapshotListSchema.parse(list.body)).not.toThrow();
    expect(list.body.map((s: { id: number }) => s.id)).toEqual([q3.id, q2.id]);
    const [item] = list.body;
    // Light: no history, no window days, exceptions or capital details (GET /api/snapshots/:id has them).
    expect(item).not.toHaveProperty("history");
    expect(item).not.toHaveProperty("amendment");
    for (const heavy of ["days", "exceptionDetail", "exceptionDates", "capitalDetail", "desks", "tests", "settings"])
      expect(item.figures).not.toHaveProperty(heavy);
    const detail = (await request(app).get(`/api/snapshots/${q3.id}`).set("Cookie", book.cookie)).body;
    expect(detail.figures.days).toHaveLength(250);
    expect(detail.figures.exceptionDates).toEqual(book.exceptionDays);
    // Everything the item carries is the detail's own, the open finding in Q3 (not in Q2) included.
    const { history: _history, amendment: _amendment, figures, ...rest } = detail;
    expect(item).toEqual({ ...rest, figures: snapshotHeadlineFiguresSchema.parse(figures) });
    expect([item.openFindings, list.body[1].openFindings]).toEqual([1, 0]);
    expect(JSON.stringify(item).length).toBeLessThan(JSON.stringify(detail).length / 5);
  });

  it("when a quarter's window held fewer than 250 days, then its capital history says the window is short (the zone is provisional)", async () => {
    const fx = await ingestFixture();
    const dates = weekdaysEndingOn(Q3, 120);
    await uploadAndCommit(
      fx.cookie,
      [HEADER, ...dates.map((d, i) => `${fx.portfolio.code},${d},-50,-40,${100 + (i % 2)},250`)].join("\n"),
    );
    const draft = await request(app)
      .post("/api/snapshots")
      .set("Cookie", fx.cookie)
      .send({ entity: fx.entity.code, quarterEnd: Q3 });
    expect(draft.status).toBe(201);
    expect(JSON.parse((await SnapshotModel.findByPk(draft.body.id))!.figuresJson).window).toMatchObject({
      observations: 120,
      complete: false,
    });
    const history = await request(app).get(`/api/entities/${fx.entity.code}/capital/history`).set("Cookie", fx.cookie);
    expect(history.body).toEqual([expect.objectContaining({ quarterEnd: Q3, status: "draft", windowComplete: false })]);
  });
});
