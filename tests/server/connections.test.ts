import request from "supertest";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { sequelize } from "../../server/db/sequelize";
import { connectionsAskedInsideTransactions } from "../../server/db/transaction-context";
import { preparedAndSubmitted, signOffBook, snapshotApp as app, Q2, Q3, type Book } from "./snapshot-helpers";

afterAll(() => sequelize.close());

/** A request's answer, or "no answer" when it took longer than the stall ceiling. */
async function answerOf(req: request.Test): Promise<number | "no answer"> {
  try {
    return (await req.timeout({ response: STALL_CEILING_MS, deadline: STALL_CEILING_MS })).status;
  } catch (err) {
    if ((err as { timeout?: number }).timeout) return "no answer";
    throw err;
  }
}

// A generous ceiling against a stall (the pool waiting on itself held requests for 10 s and then
// answered 503), not a performance figure: bench/ measures speed.
const STALL_CEILING_MS = 5000;

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
  const submitted = await preparedAndSubmitted(filed, Q2);
  await request(app).post(`/api/snapshots/${submitted.id}/approve`).set("Cookie", filed.croCookie).send({}).expect(200);
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
      request(app)
        .put(`/api/portfolios/${filed.portfolio.code}/exceptions/${filed.exceptionDays[i % 5]}/review`)
        .set("Cookie", i % 2 ? filed.cookie : filed.analyst2Cookie)
        .send({ cause: "market_move", narrative: `A large market move on the day (edit ${i}).`, exclusion: false });

    const writes = [
      ...Array.from({ length: 10 }, () => prepare()),
      ...Array.from({ length: 10 }, () => file()),
      ...Array.from({ length: 10 }, (_, i) => review(i)),
    ];
    const answers = writes.map((w) => answerOf(w));
    // A read issued while the writes hold their transactions.
    const read = answerOf(request(app).get(`/api/snapshots?entity=${book.entity.code}`).set("Cookie", book.cookie));
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
