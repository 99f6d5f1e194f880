import { createHash } from "node:crypto";
import { mkdtempSync, readdirSync, readFileSync } from "node:fs";
import { tmpdir } from "node:os";
import path from "node:path";
import request from "supertest";
import { afterAll, describe, expect, it } from "vitest";
import { sequelize } from "../../server/db/sequelize";
import { AuditEventModel } from "../../server/models/audit-event";
import { FilingModel } from "../../server/models/filing";
import { SnapshotModel } from "../../server/models/snapshot";
import { filingSchema, filingVerifySchema } from "../../shared/schemas/filing";
import { useSmtpPort } from "../../server/mail/mailer";
import { deliverPendingFilings } from "../../server/modules/filings/filings.service";
import { startMailSink } from "../../scripts/lib/mail-sink";
import { createAssignedRegulator, createTestUser, sessionCookieFor } from "./helpers";
import { approvedBookFiledTo, signOffBook, snapshotApp as app, type Book } from "./snapshot-helpers";
import { asBytes, pdfText } from "./pdf-helpers";
import { freePort } from "./support/free-port";

afterAll(() => sequelize.close());

const sha256 = (bytes: Buffer) => createHash("sha256").update(bytes).digest("hex");

/** Every message the run's mail sink (scripts/test.ts) received for this address, raw. */
function mailsTo(address: string): string[] {
  const dir = process.env.MAIL_SINK_DIR!;
  return readdirSync(dir)
    .map((f) => readFileSync(path.join(dir, f), "utf8"))
    .filter((m) => m.includes(address));
}

/** The PDF attached to a raw message (base64, as nodemailer writes it). */
function attachedPdf(raw: string): Buffer {
  const part = raw.split(/\r?\n--/).find((p) => /Content-Type: application\/pdf/i.test(p))!;
  const body = part
    .split(/\r?\n\r?\n/)
    .slice(1)
    .join("\n");
  return Buffer.from(body.replace(/[^A-Za-z0-9+/=]/g, ""), "base64");
}

async function regulatorFor(book: Book) {
  const regulator = await createAssignedRegulator(book.entity.id);
  return { regulator, cookie: await sessionCookieFor(regulator.id) };
}

describe("the quarterly pack", () => {
  it("when the office downloads a snapshot's pack, then it is a real PDF with the frozen figures, the seal and the caution", async () => {
    const { book, snapshotId } = await approvedBookFiledTo([`supervisor-${Date.now()}@bank-supervisor.test`]);
    const res = await asBytes(request(app).get(`/api/snapshots/${snapshotId}/pack.pdf`).set("Cookie", book.cookie));
    expect(res.status).toBe(200);
    expect(res.headers["content-type"]).toBe("application/pdf");
    expect(res.headers["content-disposition"]).toMatch(/attachment; filename="quartermark-.*-2026-09-30-pack\.pdf"/);
    const pdf = res.body as Buffer;
    expect(pdf.subarray(0, 5).toString()).toBe("%PDF-");
    const text = pdfText(pdf);
    expect(text).toMatch(/Q3 2026: 2026-07-01 to 2026-09-30/);
    expect(text).toMatch(/Traffic-light zone\s+Yellow/);
    expect(text).toMatch(/Counted exceptions\s+5/);
    expect(text).toMatch(/Multiplier in force\s+3\.40/);
    const snapshot = (await request(app).get(`/api/snapshots/${snapshotId}`).set("Cookie", book.cookie)).body;
    expect(text.replace(/\s+/g, "")).toContain(snapshot.hash);
    expect(text.replace(/\s+/g, " ")).toContain("Figures are decision support.");
  });

  it("when a draft's pack is read, then it says it is not signed off and must not be filed", async () => {
    const book = await signOffBook();
    const draft = await request(app)
      .post("/api/snapshots")
      .set("Cookie", book.cookie)
      .send({ entity: book.entity.code, quarterEnd: "2026-09-30" });
    const res = await asBytes(request(app).get(`/api/snapshots/${draft.body.id}/pack.pdf`).set("Cookie", book.cookie));
    expect(pdfText(res.body as Buffer)).toMatch(
      /Not signed off \(draft\): these figures are a working copy and must not be filed/,
    );
  });
});

describe("filing with the supervisor", () => {
  it("when the CRO files an approved snapshot, then the pack goes by e-mail over SMTP, is kept with its sha256, and the snapshot is filed", async () => {
    const supervisor = `supervisor-${Date.now()}@bank-supervisor.test`;
    const { book, snapshotId } = await approvedBookFiledTo([supervisor]);
    const res = await request(app).post(`/api/snapshots/${snapshotId}/filings`).set("Cookie", book.croCookie).send({});
    expect(res.status, JSON.stringify(res.body)).toBe(201);
    const filing = filingSchema.parse(res.body);
    expect(filing).toMatchObject({
      snapshotId,
      recipients: [supervisor],
      sentBy: book.cro.email,
      acknowledgedAt: null,
      zone: "yellow",
      counted: 5,
    });

    // The e-mail really went out: the sink holds it, with the very PDF that was kept.
    const [mail] = mailsTo(supervisor);
    expect(mail).toMatch(/Subject: .*backtesting pack for Q3 2026/);
    expect(mail).toContain(filing.messageId!.replace(/[<>]/g, ""));
    const attached = attachedPdf(mail);
    expect(sha256(attached)).toBe(filing.sha256);

    const stored = await FilingModel.scope("withPack").findByPk(filing.id);
    expect(sha256(stored!.packPdf)).toBe(filing.sha256);
    expect(await SnapshotModel.findByPk(snapshotId)).toMatchObject({ status: "filed" });
    expect(await AuditEventModel.count({ where: { action: "snapshot.file", target: `snapshot #${snapshotId}` } })).toBe(
      1,
    );
    expect(pdfText(attached).replace(/\s+/g, " ")).toMatch(/filed with the supervisor/);

    const again = await request(app)
      .post(`/api/snapshots/${snapshotId}/filings`)
      .set("Cookie", book.croCookie)
      .send({});
    expect(again.status).toBe(409);
  });

  it("when the mail server is down at filing, then the filing waits as pending (202), and once it is back exactly one e-mail arrives", async () => {
    const supervisor = `waiting-${Date.now()}@bank-supervisor.test`;
    const { book, snapshotId } = await approvedBookFiledTo([supervisor]);
    const port = await freePort(); // nothing listens there: the mail server is down
    useSmtpPort(port);
    try {
      const res = await request(app)
        .post(`/api/snapshots/${snapshotId}/filings`)
        .set("Cookie", book.croCookie)
        .send({});
      expect(res.status).toBe(202);
      expect(res.body).toMatchObject({
        delivery: "pending",
        // Fixed before the first attempt, so that every attempt carries the same one.
        messageId: expect.stringMatching(/^<filing-\d+-[0-9a-f]{24}@quartermark>$/),
        sentAt: null,
        lastError: expect.stringMatching(/ECONNREFUSED|connect/i),
      });
      expect(await SnapshotModel.findByPk(snapshotId)).toMatchObject({ status: "approved" });
      const regulator = await regulatorFor(book);
      expect((await request(app).get("/api/filings").set("Cookie", regulator.cookie)).body).toEqual([]); // nothing reached them yet

      expect((await deliverPendingFilings()).pending).toBeGreaterThanOrEqual(1); // still down: still waiting
      expect(await FilingModel.findByPk(res.body.id)).toMatchObject({ delivery: "pending", attempts: 2 });

      const dir = mkdtempSync(path.join(tmpdir(), "qm-sink-"));
      const sink = await startMailSink(port, dir); // the server is back
      try {
        await deliverPendingFilings();
        await deliverPendingFilings(); // a second round finds nothing left to send
        const arrived = readdirSync(dir)
          .map((f) => readFileSync(path.join(dir, f), "utf8"))
          .filter((m) => m.includes(supervisor));
        expect(arrived).toHaveLength(1);
        expect(sha256(attachedPdf(arrived[0]))).toBe(res.body.sha256);
      } finally {
        await sink.close();
      }
      expect(await FilingModel.findByPk(res.body.id)).toMatchObject({ delivery: "sent", lastError: null });
      expect(await SnapshotModel.findByPk(snapshotId)).toMatchObject({ status: "filed" });
      expect(
        (await request(app).get("/api/filings").set("Cookie", regulator.cookie)).body.map((f: { id: number }) => f.id),
      ).toEqual([res.body.id]);
    } finally {
      useSmtpPort(Number(process.env.SMTP_PORT));
    }
  });

  it("when the mail server refuses the supervisor's address, then 502 says nothing was sent, the filing is withdrawn and the quarter stays approved", async () => {
    const { book, snapshotId } = await approvedBookFiledTo(["nobody@supervisor.invalid"]);
    const res = await request(app).post(`/api/snapshots/${snapshotId}/filings`).set("Cookie", book.croCookie).send({});
    expect(res.status).toBe(502);
    expect(res.body.error).toMatchObject({
      code: "mail_not_sent",
      message: expect.stringMatching(/^Nothing was sent: refused by nobody@supervisor\.invalid: 550 .*withdrawn/),
    });
    expect(await FilingModel.count({ where: { snapshotId } })).toBe(0);
    expect(await SnapshotModel.findByPk(snapshotId)).toMatchObject({ status: "approved" });
  });

  it("when the entity has no supervisor address, or the snapshot is not approved, then filing is refused and nothing is sent", async () => {
    const { book, snapshotId } = await approvedBookFiledTo(["x@bank-supervisor.test"]);
    await book.entity.update({ supervisorEmails: [] });
    const none = await request(app).post(`/api/snapshots/${snapshotId}/filings`).set("Cookie", book.croCookie).send({});
    expect(none.status).toBe(422);
    expect(none.body.error.message).toMatch(/no supervisor e-mail address/);
    const draft = await request(app)
      .post("/api/snapshots")
      .set("Cookie", book.cookie)
      .send({ entity: book.entity.code, quarterEnd: "2026-06-30" });
    const early = await request(app)
      .post(`/api/snapshots/${draft.body.id}/filings`)
      .set("Cookie", book.croCookie)
      .send({});
    expect(early.status).toBe(409);
    expect(await FilingModel.count({ where: { snapshotId: [snapshotId, draft.body.id] } })).toBe(0);
  });
});

describe("the supervisor's side", () => {
  it("when an assigned regulator lists, downloads, verifies and acknowledges a filing, then each works once and others' filings stay invisible", async () => {
    const supervisor = `supervisor-${Date.now()}@bank-supervisor.test`;
    const { book, snapshotId } = await approvedBookFiledTo([supervisor]);
    const filing = (
      await request(app).post(`/api/snapshots/${snapshotId}/filings`).set("Cookie", book.croCookie).send({}).expect(201)
    ).body;
    const assigned = await regulatorFor(book);
    const stranger = await sessionCookieFor((await createTestUser("regulator")).id);

    const list = await request(app).get("/api/filings").set("Cookie", assigned.cookie);
    expect(list.body.map((f: { id: number }) => f.id)).toContain(filing.id);
    expect(
      (await request(app).get("/api/filings").set("Cookie", stranger)).body.map((f: { id: number }) => f.id),
    ).not.toContain(filing.id);
    expect((await request(app).get(`/api/filings/${filing.id}/pack.pdf`).set("Cookie", stranger)).status).toBe(404);

    const pack = await asBytes(request(app).get(`/api/filings/${filing.id}/pack.pdf`).set("Cookie", assigned.cookie));
    expect(sha256(pack.body as Buffer)).toBe(filing.sha256);
    expect(pack.headers["x-pack-sha256"]).toBe(filing.sha256);

    const verify = await request(app).get(`/api/filings/${filing.id}/verify`).set("Cookie", assigned.cookie);
    expect(filingVerifySchema.parse(verify.body)).toMatchObject({ valid: true, sha256: filing.sha256 });

    const ack = await request(app)
      .post(`/api/filings/${filing.id}/acknowledge`)
      .set("Cookie", assigned.cookie)
      .send({});
    expect(ack.body).toMatchObject({ acknowledgedBy: assigned.regulator.email, acknowledgedAt: expect.any(String) });
    const twice = await request(app)
      .post(`/api/filings/${filing.id}/acknowledge`)
      .set("Cookie", assigned.cookie)
      .send({});
    expect(twice.body.acknowledgedAt).toBe(ack.body.acknowledgedAt);
    expect(
      await AuditEventModel.count({ where: { action: "filing.acknowledge", target: `filing #${filing.id}` } }),
    ).toBe(1);
  });

  it("when both the kept pack and its sha256 are replaced, then verify still catches it against the signed record", async () => {
    const { book, snapshotId } = await approvedBookFiledTo([`s2-${Date.now()}@bank-supervisor.test`]);
    const filing = (
      await request(app).post(`/api/snapshots/${snapshotId}/filings`).set("Cookie", book.croCookie).send({}).expect(201)
    ).body;
    const forged = Buffer.from("%PDF-1.3 forged");
    await sequelize.query("UPDATE filings SET pack_pdf = :pdf, pack_sha256 = :sha WHERE id = :id", {
      replacements: { id: filing.id, pdf: forged, sha: sha256(forged) },
    });
    const verify = await request(app).get(`/api/filings/${filing.id}/verify`).set("Cookie", book.croCookie);
    expect(verify.body).toMatchObject({
      valid: false,
      detail: expect.stringMatching(/differs from the one the signed record fixed when the pack was sent/),
    });
  });

  it("when an approved snapshot no longer verifies, then it cannot be filed and nothing is sent", async () => {
    const supervisor = `s3-${Date.now()}@bank-supervisor.test`;
    const { book, snapshotId } = await approvedBookFiledTo([supervisor]);
    await sequelize.query("UPDATE snapshots SET multiplier = 3.00 WHERE id = :id", {
      replacements: { id: snapshotId },
    });
    const res = await request(app).post(`/api/snapshots/${snapshotId}/filings`).set("Cookie", book.croCookie).send({});
    expect(res.status).toBe(409);
    expect(res.body.error.message).toMatch(/does not verify, so it cannot be filed/);
    expect(mailsTo(supervisor)).toEqual([]);
    expect(await FilingModel.count({ where: { snapshotId } })).toBe(0);
  });

  it("when a regulator asks for another entity's filing, then 404 and the attempt is audited", async () => {
    const { book, snapshotId } = await approvedBookFiledTo([`s4-${Date.now()}@bank-supervisor.test`]);
    const filing = (
      await request(app).post(`/api/snapshots/${snapshotId}/filings`).set("Cookie", book.croCookie).send({}).expect(201)
    ).body;
    const stranger = await createTestUser("regulator");
    const cookie = await sessionCookieFor(stranger.id);
    for (const call of [
      request(app).get(`/api/filings/${filing.id}/verify`),
      request(app).post(`/api/filings/${filing.id}/acknowledge`).send({}),
    ]) {
      expect((await call.set("Cookie", cookie)).status).toBe(404);
    }
    expect(
      await AuditEventModel.count({
        where: { action: "filing.denied", target: `filing #${filing.id}`, actorUserId: stranger.id },
      }),
    ).toBe(2);
    expect(await FilingModel.findByPk(filing.id)).toMatchObject({ acknowledgedAt: null });
  });

  it("when the kept pack is altered behind the application's back, then verify says it is not the file that was sent", async () => {
    const { book, snapshotId } = await approvedBookFiledTo([`s-${Date.now()}@bank-supervisor.test`]);
    const filing = (
      await request(app).post(`/api/snapshots/${snapshotId}/filings`).set("Cookie", book.croCookie).send({}).expect(201)
    ).body;
    await sequelize.query("UPDATE filings SET pack_pdf = CONCAT(pack_pdf, 'x') WHERE id = :id", {
      replacements: { id: filing.id },
    });
    const verify = await request(app).get(`/api/filings/${filing.id}/verify`).set("Cookie", book.croCookie);
    expect(verify.body).toMatchObject({
      valid: false,
      detail: expect.stringMatching(/no longer has the sha256 that was sent/),
    });
  });
});
