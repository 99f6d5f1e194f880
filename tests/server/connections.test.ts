import request from "supertest";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { sequelize } from "../../server/db/sequelize";
import { connectionsAskedInsideTransactions } from "../../server/db/transaction-context";
import { approvedQuarter, type Book, Q2, Q3, signOffBook, snapshotApp as app } from "./snapshot-helpers";
import { putReview } from "./support/exception-reviews";

afterAll(() => sequelize.close());

/** A request's answer, or "no answer" when it took longer than `ceilingMs`. */
async function answerOf(req: request.Test, ceilingMs: number): Promise<number | "no answer"> {
  try {
    return (await req.timeout({ response: ceilingMs, deadline: ceilingMs })).status;
  } catch (err) {
    if ((err as { timeout?: number }).timeout) return "no answer";
    throw err;
  }
}

// Ceilings against a stall, not performance figures (bench/ measures speed). A pool waiting on
// itself held every request for its 10 s wait (DB_POOL_ACQUIRE_MS) and then answered 503, and a
// read waited behind the writers. The read must come back within 5 s; a write within 15 s, which
// is above the pool's wait (a stall shows as 503) and leaves room for a machine shared with other
// work, where 30 writes that take turns at the same rows can legitimately need more than 5 s.
const READ_CEILING_MS = 5000;
const WRITE_CEILING_MS = 15_000;

let book: Book;
let filed: Book;
let approvedId: number;

beforeAll(async () => {
  // Two entities' books: preparations on one, review edits and filings on the other.
  book = await signOffBook();
  filed = await signOffBook();
  await filed.entity.update({
    supervisorEmails: [`supervisor-${filed.entity.code.toLowerCase()}@tests.quartermark.test`],
  });
  const submitted = await approvedQuarter(filed, Q2);
  approvedId = submitted.id;
}, 120_000);

describe("one connection per transaction", () => {
  it("when 30 writes that use transactions arrive at once (snapshot preparation, filing, review edits), then every one answers 2xx or a clear 4xx/409, a read during them answers, and no transaction asked the pool for a second connection", async () => {
    const before = connectionsAskedInsideTransactions().length;
    const prepare = () =>
      request(app).post("/api/snapshots").set("Cookie", book.cookie).send({ entity: book.entity.code, quarterEnd: Q3 });
    const file = () =>
      request(app).post(`/api/snapshots/${approvedId}/filings`).set("Cookie", filed.croCookie).send({});
    const review = (i: number) =>
      putReview(filed.portfolio.code, filed.exceptionDays[i % 5], i % 2 ? filed.cookie : filed.analyst2Cookie, {
        cause: "market_move",
        narrative: `A large market move on the day (edit ${i}).`,
        exclusion: false,
      });

    const writes = [
      ...Array.from({ length: 10 }, () => prepare()),
      ...Array.from({ length: 10 }, () => file()),
      ...Array.from({ length: 10 }, (_, i) => review(i)),
    ];
    const answers = writes.map((w) => answerOf(w, WRITE_CEILING_MS));
    // A read issued while the writes hold their transactions.
    const read = answerOf(
      request(app).get(`/api/snapshots?entity=${book.entity.code}`).set("Cookie", book.cookie),
      READ_CEILING_MS,
    );
    const statuses = await Promise.all(answers);
    expect(await read).toBe(200);

    expect(statuses).toHaveLength(30);
    for (const status of statuses) {
      expect(status).not.toBe("no answer");
      expect(status as number).toBeLessThan(500);
    }
    // Preparations of one quarter take turns (a first one racing another is told so: 409); one filing
    // wins and the others are told it is filed; review edits from a stale version are told to reload.
    expect(statuses.slice(0, 10).filter((s) => s === 201)).toHaveLength(1);
    expect(statuses.slice(0, 10).every((s) => s === 200 || s === 201 || s === 409)).toBe(true);
    expect(statuses.slice(10, 20).filter((s) => s === 201 || s === 202)).toHaveLength(1);
    expect(statuses.slice(10, 20).filter((s) => s === 409)).toHaveLength(9);
    expect(statuses.slice(20).every((s) => s === 200 || s === 409)).toBe(true);
    expect(connectionsAskedInsideTransactions().slice(before)).toEqual([]);
  });
});
