/**
 * Filing exactly once: each test runs its own SMTP sink (scripts/lib/mail-sink.ts) that refuses a
 * recipient or faults the database right after it took a message, and counts what each
 * recipient really received (the sink's Delivered-To lines).
 */
import { mkdtempSync, readdirSync, readFileSync } from "node:fs";
import { tmpdir } from "node:os";
import path from "node:path";
import request from "supertest";
import { afterAll, describe, expect, it } from "vitest";
import { sequelize } from "../../server/db/sequelize";
import { FilingModel } from "../../server/models/filing";
import { SnapshotModel } from "../../server/models/snapshot";
import { useSmtpPort } from "../../server/mail/mailer";
import { deliverPendingFilings } from "../../server/modules/filings/filings.service";
import { startMailSink, type MailSinkOptions } from "../../scripts/lib/mail-sink";
import { approvedBookFiledTo, snapshotApp as app } from "./snapshot-helpers";
import { freePort } from "./support/free-port";
import { otherConnectionRunning, outsideSession } from "./support/outside-session";

afterAll(() => sequelize.close());

/** A sink of the test's own, with the mailer pointed at it until `close`. */
async function ownSink(options: MailSinkOptions) {
  const dir = mkdtempSync(path.join(tmpdir(), "qm-outbox-"));
  const sink = await startMailSink(await freePort(), dir, options);
  useSmtpPort(sink.port);
  return {
    /** How many messages this recipient received (one Delivered-To line each). */
    received(address: string) {
      return readdirSync(dir)
        .map((f) => readFileSync(path.join(dir, f), "utf8"))
        .filter((m) => m.split(/\r?\n/).includes(`Delivered-To: ${address}`)).length;
    },
    async close() {
      await sink.close();
      useSmtpPort(Number(process.env.SMTP_PORT));
    },
  };
}

describe("a filing reaches some recipients and not others", () => {
  it("fault: one supervisor address accepted and one refused (550) → the filing is kept as partially delivered, the quarter is filed, the accepted recipient got exactly one message, and the CRO finishes by retrying only the refused one", async () => {
    const stamp = Date.now();
    const good = `desk-${stamp}@bank-supervisor.test`;
    const bad = `archive-${stamp}@bank-supervisor.test`;
    let mailboxExists = false; // the supervisor's archive mailbox is created later
    const sink = await ownSink({ refuse: (a) => (a === bad && !mailboxExists ? `No such mailbox: ${a}` : null) });
    try {
      const { book, snapshotId } = await approvedBookFiledTo([good, bad]);
      const res = await request(app)
        .post(`/api/snapshots/${snapshotId}/filings`)
        .set("Cookie", book.croCookie)
        .send({});
      expect(res.status, JSON.stringify(res.body)).toBe(201);
      expect(res.body.delivery).toBe("partial");
      expect(res.body.summary).toMatch(new RegExp(`Sent to ${good}; refused by ${bad}: 550 No such mailbox`));
      expect(res.body.deliveries).toEqual([
        expect.objectContaining({ recipient: good, status: "accepted" }),
        expect.objectContaining({ recipient: bad, status: "refused", detail: expect.stringMatching(/550/) }),
      ]);
      // It reached the supervisor: the filing is kept and the quarter is filed.
      expect(await FilingModel.count({ where: { snapshotId } })).toBe(1);
      expect(await SnapshotModel.findByPk(snapshotId)).toMatchObject({ status: "filed" });
      expect(sink.received(good)).toBe(1);
      expect(sink.received(bad)).toBe(0);

      // The CRO sees it on Filings, with what is left to do.
      const listed = (await request(app).get("/api/filings").set("Cookie", book.croCookie)).body.find(
        (f: { id: number }) => f.id === res.body.id,
      );
      expect(listed).toMatchObject({ delivery: "partial", summary: res.body.summary });

      // The delivery loop does not retry a refusal by itself, and never sends to the accepted one again.
      await deliverPendingFilings({ reconcileAfterMs: 0 });
      expect(sink.received(good)).toBe(1);

      mailboxExists = true;
      const finish = await request(app)
        .post(`/api/filings/${res.body.id}/deliver`)
        .set("Cookie", book.croCookie)
        .send({});
      expect(finish.status, JSON.stringify(finish.body)).toBe(200);
      expect(finish.body).toMatchObject({ delivery: "sent", summary: `Sent to ${good}, ${bad}.` });
      expect(sink.received(good)).toBe(1);
      expect(sink.received(bad)).toBe(1);
      // Finished: nothing is left to retry.
      const again = await request(app)
        .post(`/api/filings/${res.body.id}/deliver`)
        .set("Cookie", book.croCookie)
        .send({});
      expect(again.status).toBe(409);
    } finally {
      await sink.close();
    }
  });

  it("fault: every supervisor address refused → 502 says what each refusal was, nothing reached anyone, so the filing is withdrawn and the quarter stays approved", async () => {
    const sink = await ownSink({});
    try {
      const { book, snapshotId } = await approvedBookFiledTo(["nobody@supervisor.invalid"]);
      const res = await request(app)
        .post(`/api/snapshots/${snapshotId}/filings`)
        .set("Cookie", book.croCookie)
        .send({});
      expect(res.status).toBe(502);
      expect(res.body.error.message).toMatch(
        /Nothing was sent: refused by nobody@supervisor\.invalid: 550 No such mailbox/,
      );
      expect(await FilingModel.count({ where: { snapshotId } })).toBe(0);
      expect(await SnapshotModel.findByPk(snapshotId)).toMatchObject({ status: "approved" });
    } finally {
      await sink.close();
    }
  });
});

describe("the database dies right after the mail server took the pack", () => {
  it("fault: the post-send database write is cut off → the CRO is told the pack went out, and after restart reconciliation records it from the journal and sends nothing twice", async () => {
    const supervisor = `journal-${Date.now()}@bank-supervisor.test`;
    const admin = await outsideSession();
    const snapshotIdRef = { id: 0 };
    let filingRowHeld = false;
    let holdFailed: string | null = null;
    const sink = await ownSink({
      // Once the whole message is in, and before the server says 250: hold the filing row, so that the
      // write that records the send waits there; the watcher below then kills that connection.
      async beforeAccept() {
        if (filingRowHeld) return;
        try {
          await admin.query("SET SESSION innodb_lock_wait_timeout = 3");
          await admin.beginTransaction();
          await admin.query("SELECT id FROM filings WHERE snapshot_id = ? FOR UPDATE", [snapshotIdRef.id]);
          filingRowHeld = true;
        } catch (err) {
          holdFailed = (err as Error).message;
        }
      },
    });
    try {
      const { book, snapshotId } = await approvedBookFiledTo([supervisor]);
      snapshotIdRef.id = snapshotId;
      const filing = request(app)
        .post(`/api/snapshots/${snapshotId}/filings`)
        .set("Cookie", book.croCookie)
        .send({})
        .then((r) => r);
      // Only once the filing row is held is the write waiting there the one that records the send.
      const victim = await otherConnectionRunning(
        admin,
        (q) => filingRowHeld && /FROM `filings`/.test(q) && /FOR UPDATE/.test(q),
        20_000,
      );
      if (victim !== undefined) await admin.query(`KILL CONNECTION ${victim}`);
      const killed = victim !== undefined;
      const res = await filing;
      if (filingRowHeld) await admin.rollback();
      expect(holdFailed).toBeNull();
      expect(killed).toBe(true);

      // What really happened, in words: it went out, the record of it did not.
      expect(res.status).toBe(503);
      expect(res.body.error.message).toMatch(new RegExp(`mail server took the pack for ${supervisor}`));
      expect(res.body.error.message).not.toMatch(/Nothing was (changed|sent)/);
      expect(sink.received(supervisor)).toBe(1);

      // "Restart": the delivery loop's reconciliation reads the journal instead of sending again.
      await deliverPendingFilings({ reconcileAfterMs: 0 });
      await deliverPendingFilings({ reconcileAfterMs: 0 });
      expect(sink.received(supervisor)).toBe(1);
      const row = await FilingModel.findOne({ where: { snapshotId } });
      expect(row).toMatchObject({ delivery: "sent" });
      expect(await SnapshotModel.findByPk(snapshotId)).toMatchObject({ status: "filed" });
      const listed = (await request(app).get("/api/filings").set("Cookie", book.croCookie)).body.find(
        (f: { id: number }) => f.id === row!.id,
      );
      expect(listed.summary).toBe(`Sent to ${supervisor}.`);
    } finally {
      await sink.close();
      await admin.end();
    }
  });
});
