import request from "supertest";
import { afterAll, describe, expect, it } from "vitest";
import { sequelize } from "../../server/db/sequelize";
import { DataFindingModel } from "../../server/models/data-finding";
import { RoleRequestModel } from "../../server/models/role-request";
import { queueSchema, type QueueItem } from "../../shared/schemas/queue";
import { createTestUser, sessionCookieFor } from "./helpers";
import { approve, prepare, preparedAndSubmitted, Q2, Q3, signOffBook, snapshotApp as app } from "./snapshot-helpers";
import { putReview } from "./support/exception-reviews";

afterAll(() => sequelize.close());

async function queueOf(cookie: string, entity?: string): Promise<QueueItem[]> {
  const res = await request(app).get("/api/queue").set("Cookie", cookie);
  expect(res.status).toBe(200);
  const items = queueSchema.parse(res.body);
  return entity === undefined ? items : items.filter((i) => i.entity === entity);
}

const kinds = (items: QueueItem[]) => items.map((i) => i.kind);

describe("waiting for me", () => {
  it("when an entity has a year of data, no snapshot and five exceptions, then the analyst is waited for on each ended quarter and each exception, and the CRO on nothing yet", async () => {
    const book = await signOffBook();
    const code = book.entity.code;
    const analystItems = await queueOf(book.cookie, code);
    // Today is after Q3 2026; the data start in 2025, so the last four ended quarters are all within it.
    const quarters = analystItems.filter((i) => i.kind === "quarter_without_snapshot");
    expect(quarters.map((i) => i.title)).toEqual(
      ["Q4 2025", "Q1 2026", "Q2 2026", "Q3 2026"].map((q) => `${q} of ${code} has ended and has no snapshot yet`),
    );
    expect(new Set(quarters.map((i) => i.href))).toEqual(new Set([`/quarters?entity=${code}`]));
    // The five exception days of the window (worked by hand in snapshot-helpers: losses of 150 against a VaR of 100).
    const exceptions = analystItems.filter((i) => i.kind === "unexplained_exception");
    expect(exceptions.map((i) => i.href)).toEqual(
      book.exceptionDays.map((d) => `/backtest/${book.portfolio.code}?exception=${d}`),
    );
    expect(await queueOf(book.croCookie, code)).toEqual([]);
  });

  it("when an exception is explained with an exclusion request, an older quarter is submitted and a finding is open, then each lands in the right person's list and leaves the other's", async () => {
    const book = await signOffBook();
    const code = book.entity.code;
    const [first] = book.exceptionDays;
    const review = await putReview(book.portfolio.code, first, book.cookie, {
      cause: "market_move",
      narrative: "A sharp move in rates on the day.",
      exclusion: true,
    });
    expect(review.status, JSON.stringify(review.body)).toBe(200);
    const older = await preparedAndSubmitted(book, Q2);
    await DataFindingModel.create({
      portfolioId: book.portfolio.id,
      kind: "missing_day",
      dateFrom: "2026-10-05",
      dateTo: "2026-10-05",
      detail: "No row for this business day",
    });

    const analyst = await queueOf(book.cookie, code);
    expect(analyst.filter((i) => i.kind === "unexplained_exception")).toHaveLength(4);
    expect(analyst.some((i) => i.href.endsWith(`exception=${first}`))).toBe(false);
    expect(analyst.filter((i) => i.kind === "quarter_without_snapshot").map((i) => i.title)).not.toContain(
      `Q2 2026 of ${code} has ended and has no snapshot yet`,
    );
    expect(analyst.filter((i) => i.kind === "open_finding")).toEqual([
      {
        kind: "open_finding",
        entity: code,
        title: `Open finding in ${book.portfolio.code}: missing day, 2026-10-05`,
        href: `/data?entity=${code}`,
      },
    ]);

    const cro = await queueOf(book.croCookie, code);
    expect(kinds(cro).sort()).toEqual(["exclusion_request", "snapshot_submitted"]);
    expect(cro.find((i) => i.kind === "snapshot_submitted")).toMatchObject({
      title: expect.stringMatching(new RegExp(`^Q2 2026 of ${code} submitted for sign-off by `)),
      href: `/quarters?entity=${code}&snapshot=${older.id}`,
    });
    expect(cro.find((i) => i.kind === "exclusion_request")?.href).toBe(
      `/backtest/${book.portfolio.code}?exception=${first}`,
    );

    // Returned: back with the analysts, gone from the CRO's list.
    const returned = await request(app)
      .post(`/api/snapshots/${older.id}/return`)
      .set("Cookie", book.croCookie)
      .send({ comment: "Explain the exclusion first", version: older.version });
    expect(returned.status).toBe(200);
    expect(kinds(await queueOf(book.croCookie, code))).toEqual(["exclusion_request"]);
    expect((await queueOf(book.cookie, code)).filter((i) => i.kind === "snapshot_returned")).toEqual([
      {
        kind: "snapshot_returned",
        entity: code,
        title: `Q2 2026 of ${code} was returned: prepare it again`,
        href: `/quarters?entity=${code}&snapshot=${older.id}`,
      },
    ]);
  });

  it("when a quarter is approved and an administrator proposes new settings, then the CRO is waited for to file the one and decide the other", async () => {
    const book = await signOffBook();
    const code = book.entity.code;
    const submitted = await preparedAndSubmitted(book, Q3);
    const approved = await approve(submitted.id, book.croCookie, { version: submitted.version });
    expect(approved.status, JSON.stringify(approved.body)).toBe(200);
    expect(await queueOf(book.croCookie, code)).toEqual([
      {
        kind: "approved_not_filed",
        entity: code,
        title: `Q3 2026 of ${code} approved, not yet filed with the supervisor`,
        href: `/quarters?entity=${code}&snapshot=${submitted.id}`,
      },
    ]);
    // A draft of another quarter is the analysts' work still: not the CRO's.
    expect((await prepare(book, Q2)).status).toBe(201);
    expect(kinds(await queueOf(book.croCookie, code))).toEqual(["approved_not_filed"]);

    const admin = await createTestUser("admin", { name: "Queue admin" });
    const proposed = await request(app)
      .post(`/api/entities/${code}/settings`)
      .set("Cookie", await sessionCookieFor(admin.id))
      .send({ effectiveFrom: "2026-10-01", reference: "Supervisor letter of 2 October", qualitativeAddend: 0.25 });
    expect(proposed.status, JSON.stringify(proposed.body)).toBe(201);
    expect((await queueOf(book.croCookie, code)).find((i) => i.kind === "settings_proposal")).toEqual({
      kind: "settings_proposal",
      entity: code,
      title: `Settings of ${code} from 2026-10-01 proposed by Queue admin (Supervisor letter of 2 October)`,
      href: `/waiting#settings-${proposed.body.id}`,
    });
  });

  it("when an administrator proposes a role change, then the other administrators are waited for and the proposer is not", async () => {
    const [proposer, second, person] = await Promise.all([
      createTestUser("admin"),
      createTestUser("admin"),
      createTestUser("analyst", { name: `Queue person ${Date.now()}` }),
    ]);
    await RoleRequestModel.create({
      kind: "change",
      userId: person.id,
      email: person.email,
      name: person.name,
      fromRole: "analyst",
      toRole: "cro",
      proposedBy: proposer.id,
      decidedBy: null,
      decidedAt: null,
    });
    const mine = (items: QueueItem[]) => items.filter((i) => i.title.startsWith(person.name));
    expect(mine(await queueOf(await sessionCookieFor(second.id)))).toEqual([
      {
        kind: "role_request",
        entity: "",
        title: `${person.name} to become a chief risk officer: proposed by Test admin, waiting for a second administrator`,
        href: "/admin/users",
      },
    ]);
    expect(mine(await queueOf(await sessionCookieFor(proposer.id)))).toEqual([]);
    expect(await queueOf(await sessionCookieFor((await createTestUser("treasury")).id))).toEqual([]);
  });
});
