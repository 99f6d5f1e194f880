import { execFileSync } from "node:child_process";
import { createHash } from "node:crypto";
import { mkdirSync, readdirSync, readFileSync, writeFileSync } from "node:fs";
import path from "node:path";
import request from "supertest";
import { simpleParser } from "mailparser";
import { afterAll, describe, expect, it } from "vitest";
import { sequelize } from "../../server/db/sequelize";
import { AuditEventModel } from "../../server/models/audit-event";
import { HolidayModel } from "../../server/models/holiday";
import { OvershootingNoticeModel } from "../../server/models/overshooting-notice";
import { remindNoticesComingDue } from "../../server/modules/notices/notices.reminders";
import { CAUTION } from "../../shared/schemas/common";
import { createTestEntity, createTestPortfolio, createTestUser, sessionCookieFor, testApp, unique } from "./helpers";
import { csvFor, ingestFixture, uploadCsv, weekdays } from "./ingest-helpers";
import { messagesTo } from "./mail-helpers";
import { fileText, flat } from "./pdf-helpers";

const app = testApp();
afterAll(() => sequelize.close());

const today = () => new Date().toISOString().slice(0, 10);
const nextDay = (iso: string) => new Date(Date.parse(`${iso}T00:00:00Z`) + 86_400_000).toISOString().slice(0, 10);
/** Christmas Day, the holiday ingestFixture gives every entity. */
const FIXTURE_HOLIDAY = "2026-12-25";

/**
 * The 30 weekdays before today (inside the 250-day window a notice looks at): losses of 100 against a
 * VaR of 1,000, and on the last day 1,250.50 (actual).
 */
const DATES = weekdays(new Date(Date.now() - 50 * 86_400_000).toISOString().slice(0, 10), 60)
  .filter((d) => d < today())
  .slice(-30);
const overshootingCsv = (portfolio: string) =>
  csvFor(portfolio, DATES, (i) => (i === 29 ? "-1250.50,-900,1000" : "-100,-90,1000"));

async function commit(cookie: string, csv: string) {
  const preview = await uploadCsv(app, cookie, csv);
  expect(preview.status, JSON.stringify(preview.body)).toBe(201);
  const res = await request(app).post(`/api/uploads/${preview.body.id}/commit`).set("Cookie", cookie);
  expect(res.status, JSON.stringify(res.body)).toBe(200);
  return preview.body.id as number;
}

/** An EU book with supervisor contacts, a holiday on the second business day after today, and a committed overshooting. */
async function euOvershooting() {
  const fx = await ingestFixture();
  const supervisor = `supervisor-${unique()}@authority.test`;
  await fx.entity.update({ supervisorName: "Test Authority", supervisorEmails: [supervisor] });
  // The holiday lies between the day the commit reveals the overshooting and the due day.
  const [, second] = weekdays(nextDay(today()), 2, new Set([FIXTURE_HOLIDAY]));
  if (second !== FIXTURE_HOLIDAY) await HolidayModel.create({ entityId: fx.entity.id, date: second, name: "Bank day" });
  const uploadId = await commit(fx.cookie, overshootingCsv(fx.portfolio.code));
  return { ...fx, supervisor, holiday: second, uploadId };
}

async function listOf(entity: string, cookie: string) {
  const res = await request(app).get(`/api/notices?entity=${entity}`).set("Cookie", cookie);
  expect(res.status, JSON.stringify(res.body)).toBe(200);
  return res.body as {
    id: number;
    date: string;
    dueOn: string;
    revealedOn: string;
    status: string;
    late: boolean;
    version: number;
    actualPnl: number;
    var99: number;
    excess: number;
    series: string;
    sentAt?: string | null;
    sentBy?: string | null;
    note: string | null;
    recipients: string[];
  }[];
}

/** Every message in the sink for `to`, with its attachments (waits up to `waitMs` for `count` of them). */
async function mailsTo(to: string, count = 1, waitMs = 10_000) {
  const deadline = Date.now() + waitMs;
  const dir = process.env.MAIL_SINK_DIR!;
  for (;;) {
    const found = [];
    for (const f of readdirSync(dir).filter((x) => x.endsWith(".eml"))) {
      const raw = readFileSync(path.join(dir, f));
      if (!raw.includes(to)) continue;
      found.push(await simpleParser(raw));
    }
    if (found.length >= count || Date.now() > deadline) return found;
    await new Promise((r) => setTimeout(r, 200));
  }
}

describe("overshooting notices (CRR Art. 366(5))", () => {
  it("when an EU upload with a new overshooting of the top-of-house book is committed, then one open notice is due five working days later on the entity's calendar, skipping its holiday", async () => {
    const fx = await euOvershooting();
    const cro = await createTestUser("cro");
    const notices = await listOf(fx.entity.code, await sessionCookieFor(cro.id));
    expect(notices).toHaveLength(1);
    const [n] = notices;
    // Worked by hand: day 0 is the commit's day; working days 1–5 are the next weekdays that are
    // neither the holiday placed on the second of them nor the fixture's Christmas Day.
    const due = weekdays(nextDay(today()), 5, new Set([fx.holiday, FIXTURE_HOLIDAY])).at(-1);
    expect(n).toMatchObject({
      date: DATES[29],
      status: "open",
      revealedOn: today(),
      dueOn: due,
      late: false,
      series: "actual", // the hypothetical loss of 900 stays inside the VaR of 1,000
      actualPnl: -1250.5,
      var99: 1000,
      excess: 250.5,
    });
    expect(n.sentAt ?? null).toBeNull();
    const row = await OvershootingNoticeModel.findByPk(n.id);
    expect(row?.uploadId).toBe(fx.uploadId);
    const audit = await AuditEventModel.findAll({
      where: { action: "notice.open", target: `${fx.entity.code} ${fx.portfolio.code}` },
    });
    expect(audit.map((a) => JSON.parse(a.afterJson!))).toEqual([
      {
        upload: fx.uploadId,
        days: [{ notice: n.id, date: DATES[29], dueOn: due, excess: 250.5, series: "actual" }],
      },
    ]);
  });

  it("when the overshooting is on a desk, older than the 250-day window, or the entity is not under the EU rule set, then no notice opens", async () => {
    const basel = await createTestEntity({ regime: "basel" });
    const top = await createTestPortfolio(basel);
    const analyst = await createTestUser("analyst");
    const cookie = await sessionCookieFor(analyst.id);
    await commit(cookie, overshootingCsv(top.code));
    expect(await OvershootingNoticeModel.count({ where: { portfolioId: top.id } })).toBe(0);

    const eu = await createTestEntity({ regime: "eu" });
    await createTestPortfolio(eu);
    const desk = await createTestPortfolio(eu, "DESK", "Desk", "desk");
    await commit(cookie, overshootingCsv(desk.code));
    expect(await listOf(eu.code, cookie)).toEqual([]);

    // An EU top-of-house overshooting two years back lies outside the 250-day window: none either.
    const old = await createTestEntity({ regime: "eu" });
    const oldTop = await createTestPortfolio(old);
    const twoYearsBack = new Date(Date.now() - 730 * 86_400_000).toISOString().slice(0, 10);
    await commit(
      cookie,
      csvFor(oldTop.code, weekdays(twoYearsBack, 3), (i) => (i === 2 ? "-1500,-1500,1000" : "-1,-1,1000")),
    );
    expect(await listOf(old.code, cookie)).toEqual([]);
  });

  it("when the analyst drafts and the CRO sends, then the supervisor gets one e-mail with the notice as a PDF, and the notice records who sent it and when; the analyst cannot send and the CRO cannot draft", async () => {
    const fx = await euOvershooting();
    const cro = await createTestUser("cro", { name: "Cora Vance" });
    const croCookie = await sessionCookieFor(cro.id);
    const [n] = await listOf(fx.entity.code, fx.cookie);

    // Sending before a draft: 422, nothing sent.
    const early = await request(app)
      .post(`/api/notices/${n.id}/send`)
      .set("Cookie", croCookie)
      .send({ version: n.version });
    expect(early.status).toBe(422);
    expect(early.body.error.code).toBe("notice_not_drafted");

    const croDraft = await request(app)
      .put(`/api/notices/${n.id}/draft`)
      .set("Cookie", croCookie)
      .send({ cause: "x", version: n.version });
    expect(croDraft.status).toBe(403);
    const cause = "Sharp move in EUR swap rates after the central bank's announcement; model review under way.";
    const drafted = await request(app)
      .put(`/api/notices/${n.id}/draft`)
      .set("Cookie", fx.cookie)
      .send({ cause, version: n.version });
    expect(drafted.status, JSON.stringify(drafted.body)).toBe(200);
    expect(drafted.body).toMatchObject({ cause, status: "open", version: n.version + 1 });
    expect(drafted.body.draftedBy).toBeTruthy();

    // A second tab with the old version: 409 stale with the notice as it now stands.
    const stale = await request(app)
      .put(`/api/notices/${n.id}/draft`)
      .set("Cookie", fx.cookie)
      .send({ cause: "older text", version: n.version });
    expect(stale.status).toBe(409);
    expect(stale.body.error.code).toBe("stale");
    expect(stale.body.error.details.current.cause).toBe(cause);

    const analystSend = await request(app)
      .post(`/api/notices/${n.id}/send`)
      .set("Cookie", fx.cookie)
      .send({ version: drafted.body.version });
    expect(analystSend.status).toBe(403);

    const sent = await request(app)
      .post(`/api/notices/${n.id}/send`)
      .set("Cookie", croCookie)
      .send({ version: drafted.body.version });
    expect(sent.status, JSON.stringify(sent.body)).toBe(200);
    expect(sent.body).toMatchObject({ status: "sent", sentBy: "Cora Vance", recipients: [fx.supervisor], late: false });
    expect(Date.now() - Date.parse(sent.body.sentAt)).toBeLessThan(60_000);

    const [mail] = await mailsTo(fx.supervisor);
    expect(mail, "the supervisor's e-mail").toBeDefined();
    expect(mail.subject).toBe(`Test entity: overshooting notice, ${fx.portfolio.code} on ${DATES[29]}`);
    expect(mail.attachments).toHaveLength(1);
    expect(mail.attachments[0].contentType).toBe("application/pdf");
    expect(mail.attachments[0].filename).toBe(
      `quartermark-${fx.entity.code.toLowerCase()}-${DATES[29]}-overshooting-notice.pdf`,
    );
    const row = await OvershootingNoticeModel.findByPk(n.id);
    expect(row?.status).toBe("sent");
    expect(row?.sentBy).toBe(cro.id);
    expect(row?.sentAt).toBeInstanceOf(Date);
    expect(await AuditEventModel.count({ where: { action: "notice.send", actorEmail: cro.email } })).toBe(1);

    // The PDF as sent can be read back by the office, byte for byte, with its sha256.
    const copy = await request(app)
      .get(`/api/notices/${n.id}/notice.pdf`)
      .set("Cookie", fx.cookie)
      .buffer(true)
      .parse((res, done) => {
        const chunks: Buffer[] = [];
        res.on("data", (c: Buffer) => chunks.push(c));
        res.on("end", () => done(null, Buffer.concat(chunks)));
      });
    expect(copy.status).toBe(200);
    expect(Buffer.compare(copy.body as Buffer, mail.attachments[0].content)).toBe(0);
    expect(copy.headers["x-notice-sha256"]).toBe(
      createHash("sha256").update(mail.attachments[0].content).digest("hex"),
    );

    // Sent once: again is 409, and a sent notice no longer takes a draft.
    const again = await request(app)
      .post(`/api/notices/${n.id}/send`)
      .set("Cookie", croCookie)
      .send({ version: sent.body.version });
    expect(again.status).toBe(409);
    expect(await mailsTo(fx.supervisor, 2, 1_000)).toHaveLength(1);

    // The PDF read back (poppler): the figures, the cause, the attestation; not the screens' caution.
    const dir = path.resolve(import.meta.dirname, "..", "..", "test-results", "notice-pages");
    mkdirSync(dir, { recursive: true });
    const file = path.join(dir, "notice.pdf");
    writeFileSync(file, mail.attachments[0].content);
    const text = flat(fileText(file));
    expect(text).toContain(`Overshooting of ${fx.portfolio.code} on ${DATES[29]}`);
    expect(text).toContain("Actual P&L -1,250.50 EUR");
    expect(text).toContain("Value at risk (99%, one day) 1,000.00 EUR");
    expect(text).toContain("Loss beyond VaR 250.50 EUR");
    expect(text).toContain("Sharp move in EUR swap rates");
    expect(text).toContain("Attestation");
    expect(text).toContain("sent by Cora Vance, chief risk officer");
    expect(text).not.toContain(CAUTION.slice(0, 40));
    execFileSync("pdftoppm", ["-png", "-r", "80", file, path.join(dir, "notice")]);
  });

  it("when a restatement leaves an unsent notice's day no overshooting, then the notice is withdrawn with the reason and stays listed", async () => {
    const fx = await euOvershooting();
    const restated = `portfolio,date,actual_pnl,hypothetical_pnl,var_99\n${fx.portfolio.code},${DATES[29]},-500,-400,1000\n`;
    await commit(fx.cookie, restated);
    const [n] = await listOf(fx.entity.code, fx.cookie);
    expect(n.status).toBe("withdrawn");
    expect(n.late).toBe(false);
    expect(n.note).toMatch(/no longer an overshooting/);
    const queue = await request(app).get("/api/queue").set("Cookie", fx.cookie);
    expect(queue.body.filter((i: { href: string }) => i.href.includes(`notice=${n.id}`))).toEqual([]);
  });

  it("when a withdrawn day is restated into an overshooting again, then its notice opens again; a sent notice restated stays sent and says so", async () => {
    const fx = await euOvershooting();
    const line = (pnl: string) =>
      `portfolio,date,actual_pnl,hypothetical_pnl,var_99\n${fx.portfolio.code},${DATES[29]},${pnl},-400,1000\n`;
    await commit(fx.cookie, line("-500"));
    const [withdrawn] = await listOf(fx.entity.code, fx.cookie);
    expect(withdrawn.status).toBe("withdrawn");
    await commit(fx.cookie, line("-1300"));
    const [reopened] = await listOf(fx.entity.code, fx.cookie);
    expect(reopened).toMatchObject({ id: withdrawn.id, status: "open", actualPnl: -1300, excess: 300 });
    expect(reopened.note).toMatch(/^Opened again/);

    const drafted = await request(app)
      .put(`/api/notices/${reopened.id}/draft`)
      .set("Cookie", fx.cookie)
      .send({ cause: "Market move.", version: reopened.version });
    const cro = await createTestUser("cro");
    const sent = await request(app)
      .post(`/api/notices/${reopened.id}/send`)
      .set("Cookie", await sessionCookieFor(cro.id))
      .send({ version: drafted.body.version });
    expect(sent.status).toBe(200);
    await commit(fx.cookie, line("-600"));
    const [after] = await listOf(fx.entity.code, fx.cookie);
    // What was sent stays as sent (amounts included); the note tells of the restatement since.
    expect(after).toMatchObject({ status: "sent", actualPnl: -1300 });
    expect(after.note).toMatch(/after it was sent: no longer an overshooting/);
    const audit = await AuditEventModel.findAll({
      where: { target: `${fx.entity.code} ${fx.portfolio.code}` },
      order: [["id", "ASC"]],
    });
    expect(audit.map((a) => a.action)).toEqual(["notice.open", "notice.withdraw", "notice.reopen", "notice.restated"]);
  });

  it("when a notice is past its due day and not sent, then it is late in the list and in the queue with its due day; sent after the due day it stays late", async () => {
    const fx = await euOvershooting();
    const [n] = await listOf(fx.entity.code, fx.cookie);
    const pastDue = DATES[29]; // any day before today
    await OvershootingNoticeModel.update({ dueOn: pastDue }, { where: { id: n.id } });
    const [late] = await listOf(fx.entity.code, fx.cookie);
    expect(late.late).toBe(true);
    const queue = await request(app).get("/api/queue").set("Cookie", fx.cookie);
    const item = queue.body.find((i: { href: string }) => i.href.includes(`notice=${n.id}`));
    expect(item).toMatchObject({ kind: "notice_to_draft", entity: fx.entity.code, due: pastDue });
    expect(item.title).toMatch(/^Late: /);

    const drafted = await request(app)
      .put(`/api/notices/${n.id}/draft`)
      .set("Cookie", fx.cookie)
      .send({ cause: "Market move.", version: late.version });
    const cro = await createTestUser("cro");
    const croCookie = await sessionCookieFor(cro.id);
    const croQueue = await request(app).get("/api/queue").set("Cookie", croCookie);
    expect(croQueue.body.find((i: { href: string }) => i.href.includes(`notice=${n.id}`))).toMatchObject({
      kind: "notice_to_send",
      due: pastDue,
    });
    const sent = await request(app)
      .post(`/api/notices/${n.id}/send`)
      .set("Cookie", croCookie)
      .send({ version: drafted.body.version });
    expect(sent.body).toMatchObject({ status: "sent", late: true });
  });

  it("when an open notice reaches the working day before its due day, then whoever chose it is told once, whichever process runs the round", async () => {
    const fx = await euOvershooting();
    const cro = await createTestUser("cro", { name: "Rhea Marsh" });
    const put = await request(app)
      .put("/api/notifications/choices")
      .set("Cookie", await sessionCookieFor(cro.id))
      .send({ on: ["notice_due"] });
    expect(put.status).toBe(200);
    const [n] = await listOf(fx.entity.code, fx.cookie);
    // Two business days before the due day: nothing yet for this notice.
    const twoBefore = weekdays(DATES[0], 400, new Set([fx.holiday, FIXTURE_HOLIDAY]))
      .filter((d) => d < n.dueOn)
      .at(-2)!;
    await remindNoticesComingDue(twoBefore);
    expect((await OvershootingNoticeModel.findByPk(n.id))?.remindedAt).toBeNull();
    // The working day before (the holiday, when it falls there, is not one).
    const dayBefore = weekdays(DATES[0], 400, new Set([fx.holiday, FIXTURE_HOLIDAY]))
      .filter((d) => d < n.dueOn)
      .at(-1)!;
    await Promise.all([remindNoticesComingDue(dayBefore), remindNoticesComingDue(dayBefore)]);
    const messages = await messagesTo(cro.email);
    const mine = messages.filter((m) => m.text.includes(fx.entity.code));
    expect(mine).toHaveLength(1);
    expect(mine[0].subject).toBe(`Quartermark: overshooting notice of ${fx.entity.code} due on ${n.dueOn}`);
    expect(mine[0].text).toContain(`/notices?entity=${fx.entity.code}&notice=${n.id}`);
    expect((await OvershootingNoticeModel.findByPk(n.id))?.remindedAt).toBeInstanceOf(Date);
  });
});
