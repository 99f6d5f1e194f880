import request from "supertest";
import { afterAll, describe, expect, it } from "vitest";
import { sequelize } from "../../server/db/sequelize";
import { AuditEventModel } from "../../server/models/audit-event";
import { createTestUser, sessionCookieFor, testApp } from "./helpers";
import { csvFor, ingestFixture, uploadCsv, weekdays } from "./ingest-helpers";
import { messagesTo } from "./mail-helpers";
import { preparedAndSubmitted, signOffBook } from "./snapshot-helpers";

const app = testApp();
afterAll(() => sequelize.close());

/** The messages for `to`, waiting up to 15 s for `count` of them: notices go out after the commit. */
async function waitForMessages(to: string, count: number) {
  const deadline = Date.now() + 15_000;
  let found = await messagesTo(to);
  while (found.length < count && Date.now() < deadline) {
    await new Promise((r) => setTimeout(r, 200));
    found = await messagesTo(to);
  }
  return found;
}

async function subscribe(cookie: string, on: string[]) {
  const res = await request(app).put("/api/notifications/choices").set("Cookie", cookie).send({ on });
  expect(res.status, JSON.stringify(res.body)).toBe(200);
  return res.body as { choices: { kind: string; on: boolean }[] };
}

describe("e-mail notifications, each person's choice", () => {
  it("when an analyst reads and sets their choices, then only the kinds for their role are offered and kept, and a wrong kind is 422 with nothing changed", async () => {
    const analyst = await createTestUser("analyst");
    const cookie = await sessionCookieFor(analyst.id);
    const first = await request(app).get("/api/notifications/choices").set("Cookie", cookie);
    expect(first.body.choices.map((c: { kind: string }) => c.kind)).toEqual([
      "new_exception",
      "snapshot_returned",
      "snapshot_approved",
      "notice_due",
    ]);
    expect(first.body.choices.every((c: { on: boolean }) => !c.on)).toBe(true); // nothing until chosen
    // "snapshot_submitted" goes to the CRO: asked for by an analyst, it is not kept.
    const set = await subscribe(cookie, ["new_exception", "snapshot_submitted"]);
    expect(set.choices.filter((c) => c.on).map((c) => c.kind)).toEqual(["new_exception"]);
    const wrong = await request(app)
      .put("/api/notifications/choices")
      .set("Cookie", cookie)
      .send({ on: ["coffee"] });
    expect(wrong.status).toBe(422);
    const after = await request(app).get("/api/notifications/choices").set("Cookie", cookie);
    expect(after.body.choices.filter((c: { on: boolean }) => c.on).map((c: { kind: string }) => c.kind)).toEqual([
      "new_exception",
    ]);
  });

  it("when a committed file holds a day whose loss beats the VaR, then each analyst who chose it gets one e-mail with the date, P&L, VaR, excess, count and zone, and it is in the audit log", async () => {
    const fx = await ingestFixture();
    const subscribed = await createTestUser("analyst", { name: "Nora Quill" });
    const other = await createTestUser("analyst");
    await subscribe(await sessionCookieFor(subscribed.id), ["new_exception"]);
    const dates = weekdays("2026-06-01", 30);
    // Losses of 100 against a VaR of 1,000, and on the last day a loss of 1,250.50: an exception of 250.50.
    const csv = csvFor(fx.portfolio.code, dates, (i) => (i === 29 ? "-1250.50,-900,1000" : "-100,-90,1000"));
    const preview = await uploadCsv(app, fx.cookie, csv);
    expect(preview.status, JSON.stringify(preview.body)).toBe(201);
    const commit = await request(app).post(`/api/uploads/${preview.body.id}/commit`).set("Cookie", fx.cookie);
    expect(commit.status).toBe(200);

    const [message] = await waitForMessages(subscribed.email, 1);
    expect(message, "the subscribed analyst's e-mail").toBeDefined();
    expect(message.subject).toBe(`Quartermark: a new exception on ${fx.portfolio.code}`);
    expect(message.text).toContain("Dear Nora Quill");
    expect(message.text).toContain(
      `- ${dates[29]}: P&L -1,250.50 ${fx.entity.currency}, VaR 1,000.00 ${fx.entity.currency}, excess 250.50 ${fx.entity.currency} (on actual P&L)`,
    );
    // One exception in a 30-day window: green under the rule set's table (BCBS 1996 Table 2: 0–4 green).
    expect(message.text).toMatch(/1 exception counts in the window ending \d{4}-\d{2}-\d{2}: green zone/);
    expect(message.text).toContain(`/backtest/${fx.portfolio.code}?exception=${dates[29]}`);
    expect(await messagesTo(other.email)).toEqual([]);
    const audited = await AuditEventModel.findAll({
      where: { action: "notification.sent", target: `${fx.entity.code} ${fx.portfolio.code}` },
    });
    expect(audited.map((a) => (a.afterJson ? JSON.parse(a.afterJson) : null))).toContainEqual({
      kind: "new_exception",
      to: subscribed.email,
    });
  });

  it("when a quarter is submitted, then a CRO who chose it is told, with the figures and the comment", async () => {
    const book = await signOffBook();
    const cro = await createTestUser("cro", { name: "Cora Vance" });
    await subscribe(await sessionCookieFor(cro.id), ["snapshot_submitted"]);
    await preparedAndSubmitted(book);
    const [message] = await waitForMessages(cro.email, 1);
    expect(message, "the CRO's e-mail").toBeDefined();
    expect(message.subject).toBe(`Quartermark: Q3 2026 of ${book.entity.code} submitted`);
    expect(message.text).toContain("5 exceptions counted, yellow zone, multiplier 3.40.");
    expect(message.text).toContain("Comment: Figures checked");
  });
});
