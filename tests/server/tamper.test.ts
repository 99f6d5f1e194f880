/**
 * Someone with write access to the database (and none to the server's key) changes what was
 * signed off, hides a change, or deletes a row; each test makes one attack and checks that the
 * checks anyone can run (snapshot verify, chain verify, filing verify, audit verify) see it.
 */
import { createHash } from "node:crypto";
import stableStringify from "fast-json-stable-stringify";
import request from "supertest";
import { afterAll, describe, expect, it } from "vitest";
import { sequelize } from "../../server/db/sequelize";
import { createAssignedRegulator, createTestUser, sessionCookieFor } from "./helpers";
import {
  approve,
  type Book,
  HEADER,
  preparedAndSubmitted,
  Q2,
  Q3,
  signOffBook,
  snapshotApp as app,
  uploadAndCommit,
  verify,
} from "./snapshot-helpers";

afterAll(() => sequelize.close());

const sha256 = (text: string | Buffer) => createHash("sha256").update(text).digest("hex");

type Row = Record<string, unknown>;
const rows = async (sql: string, replacements: Record<string, unknown> = {}) =>
  (await sequelize.query(sql, { replacements, type: "SELECT" })) as Row[];
const exec = (sql: string, replacements: Record<string, unknown> = {}) => sequelize.query(sql, { replacements });

async function tableExists(name: string): Promise<boolean> {
  const found = await rows(
    "SELECT COUNT(*) AS n FROM information_schema.tables WHERE table_schema = DATABASE() AND table_name = :name",
    { name },
  );
  return Number(found[0].n) > 0;
}

/** A quarter prepared, submitted and approved with a comment: the approved snapshot. */
async function signedOff(book: Book, quarterEnd: string) {
  const submitted = await preparedAndSubmitted(book, quarterEnd);
  const res = await approve(submitted.id, book.croCookie, { comment: "Looks right" });
  expect(res.status, JSON.stringify(res.body)).toBe(200);
  return res.body as { id: number; hash: string; version: number };
}

async function fileIt(book: Book, snapshotId: number) {
  await book.entity.update({ supervisorEmails: [`sup-${Date.now()}@bank-supervisor.test`] });
  const res = await request(app).post(`/api/snapshots/${snapshotId}/filings`).set("Cookie", book.croCookie).send({});
  expect(res.status, JSON.stringify(res.body)).toBe(201);
  return res.body as { id: number; sha256: string };
}

const snapshotVerify = async (book: Book, id: number) => (await verify(id, book.croCookie)).body;
const chainVerify = async (book: Book) =>
  request(app).get(`/api/entities/${book.entity.code}/chain/verify`).set("Cookie", book.croCookie);

/**
 * What today's (unkeyed) seal covers, recomputed the way anyone who reads the code can:
 * sha256 over the canonical content and the previous hash.
 */
function plainSeal(s: Row, entityCode: string): string {
  const iso = (v: unknown) => (v ? new Date(v as string).toISOString() : null);
  return sha256(
    stableStringify({
      entity: entityCode,
      quarterEnd: s.quarter_end,
      figures: s.figures_json,
      zone: s.zone,
      counted: Number(s.counted),
      plusFactor: Number(s.plus_factor),
      multiplier: Number(s.multiplier),
      capital: s.capital === null ? null : Number(s.capital),
      addOn: s.add_on === null ? null : Number(s.add_on),
      windowStart: s.window_start,
      asOf: s.as_of,
      inputsSha256: s.inputs_sha256,
      engineVersion: s.engine_version,
      preparedBy: s.prepared_by,
      preparedAt: iso(s.prepared_at),
      submittedBy: s.submitted_by,
      approvedBy: s.approved_by,
      approvedAt: iso(s.approved_at),
      prevHash: s.prev_hash,
    }),
  );
}

/**
 * The attacker rewrites every hash they can find with plain SHA-256: the snapshot's seal and,
 * where the signed chain keeps a copy of the state, that copy and its "signature".
 */
async function rehashWithPlainSha256(snapshotId: number, entityCode: string) {
  const [s] = await rows("SELECT * FROM snapshots WHERE id = :id", { id: snapshotId });
  await exec("UPDATE snapshots SET hash = :hash WHERE id = :id", { id: snapshotId, hash: plainSeal(s, entityCode) });
  if (await tableExists("snapshot_chain_links")) {
    for (const link of await rows("SELECT id, body FROM snapshot_chain_links WHERE snapshot_id = :id", {
      id: snapshotId,
    })) {
      const body = JSON.parse(link.body as string);
      Object.assign(body.state, {
        zone: s.zone,
        counted: Number(s.counted),
        plusFactor: Number(s.plus_factor),
        multiplier: Number(s.multiplier),
        figuresSha256: sha256(s.figures_json as string),
      });
      const text = stableStringify(body);
      await exec("UPDATE snapshot_chain_links SET body = :text, mac = :mac WHERE id = :id", {
        id: link.id,
        text,
        mac: sha256(text),
      });
    }
  }
}

describe("attacks on signed-off quarters", () => {
  it("attack: a sealed, filed quarter changed from yellow/3.40 to green/3.00 and rehashed with plain SHA-256 → snapshot verify, chain verify and filing verify all see it", async () => {
    const book = await signOffBook();
    const approved = await signedOff(book, Q3);
    const filing = await fileIt(book, approved.id);
    expect((await snapshotVerify(book, approved.id)).valid).toBe(true);

    // Yellow 5 exceptions, plus factor 0.40, multiplier 3.40 (CRR Art. 366 table, from memory) becomes green, 4, 0, 3.00.
    const [s] = await rows("SELECT figures_json FROM snapshots WHERE id = :id", { id: approved.id });
    const figures = JSON.parse(s.figures_json as string);
    Object.assign(figures, { zone: "green", plusFactor: 0, multiplier: 3 });
    figures.exceptions.counted = 4;
    await exec(
      `UPDATE snapshots SET zone = 'green', counted = 4, plus_factor = 0, multiplier = 3.00, figures_json = :f
       WHERE id = :id`,
      { id: approved.id, f: JSON.stringify(figures) },
    );
    await rehashWithPlainSha256(approved.id, book.entity.code);

    const verify = await snapshotVerify(book, approved.id);
    expect(verify.valid).toBe(false);
    expect(verify.detail).toMatch(/zone|multiplier|signature/i);

    const chain = await chainVerify(book);
    expect(chain.status).toBe(200);
    expect(chain.body.valid).toBe(false);
    expect(chain.body.detail).toMatch(new RegExp(`${book.entity.code}`));
    expect(JSON.stringify(chain.body.problems)).toMatch(/Q3 2026/);

    const filingVerify = (await request(app).get(`/api/filings/${filing.id}/verify`).set("Cookie", book.croCookie))
      .body;
    expect(filingVerify.valid).toBe(false);
    expect(filingVerify.detail).toMatch(/snapshot does not verify/);
    expect(filingVerify.detail).toMatch(/Q3 2026/);
  });

  it("attack: fields the old seal did not cover edited — status put back from filed to approved, the restatement flag cleared, an event removed from the history → each is detected", async () => {
    const book = await signOffBook();
    const approved = await signedOff(book, Q3);
    await fileIt(book, approved.id);
    // A day inside the window restated after sign-off: the snapshot is flagged (its figures stay).
    const day = book.dates.indexOf("2026-09-15");
    await uploadAndCommit(book.cookie, [HEADER, book.row(book.dates[day], day, 150)].join("\n"));
    const [before] = await rows(
      "SELECT status, restated_at, restatement_detail, history_json FROM snapshots WHERE id = :id",
      {
        id: approved.id,
      },
    );
    expect(before.status).toBe("filed");
    expect(before.restated_at).not.toBeNull();
    expect((await snapshotVerify(book, approved.id)).valid).toBe(true);
    expect((await chainVerify(book)).body.valid).toBe(true);

    const attacks: [string, string, Record<string, unknown>, RegExp][] = [
      ["status back to approved", "UPDATE snapshots SET status = 'approved' WHERE id = :id", {}, /status/],
      [
        "restatement flag cleared",
        "UPDATE snapshots SET restated_at = NULL, restatement_detail = NULL WHERE id = :id",
        {},
        /restat/,
      ],
      [
        "the approval's comment rewritten and the restated event dropped from the history",
        "UPDATE snapshots SET history_json = :h WHERE id = :id",
        {
          h: JSON.stringify(
            (JSON.parse(before.history_json as string) as { action: string; comment: string | null }[])
              .filter((e) => e.action !== "restated")
              .map((e) => (e.action === "approved" ? { ...e, comment: "Approved without remarks" } : e)),
          ),
        },
        /history/,
      ],
    ];
    for (const [what, sql, extra, words] of attacks) {
      await exec(sql, { id: approved.id, ...extra });
      const verify = await snapshotVerify(book, approved.id);
      expect(verify.valid, what).toBe(false);
      expect(verify.detail, what).toMatch(words);
      const chain = (await chainVerify(book)).body;
      expect(chain.valid, what).toBe(false);
      // Put the row back as it was: the next attack starts from an intact snapshot.
      await exec(
        `UPDATE snapshots SET status = :status, restated_at = :restated_at, restatement_detail = :restatement_detail,
         history_json = :history_json WHERE id = :id`,
        { id: approved.id, ...before },
      );
      expect((await snapshotVerify(book, approved.id)).valid, `${what} restored`).toBe(true);
    }
  });

  it("attack: the newest signed-off snapshot deleted (with every row that points to it) → chain verify says the chain is shorter than its signed head", async () => {
    const book = await signOffBook();
    const older = await signedOff(book, Q2);
    const newest = await signedOff(book, Q3);
    expect((await chainVerify(book)).body).toMatchObject({ valid: true });

    // Every row of every table that points to the snapshot goes first, as a careful attacker would.
    const pointing = await rows(
      `SELECT table_name AS t, column_name AS c FROM information_schema.key_column_usage
       WHERE table_schema = DATABASE() AND referenced_table_name = 'snapshots'`,
    );
    for (const { t, c } of pointing) await exec(`DELETE FROM \`${t}\` WHERE \`${c}\` = :id`, { id: newest.id });
    await exec("DELETE FROM snapshots WHERE id = :id", { id: newest.id });

    const chain = await chainVerify(book);
    expect(chain.status).toBe(200);
    expect(chain.body.valid).toBe(false);
    expect(chain.body.detail).toMatch(/missing|deleted|head/i);
    const verifyOlder = await snapshotVerify(book, older.id);
    expect(verifyOlder.valid).toBe(false);
    expect(verifyOlder.detail).toMatch(/chain/i);
  });

  it("attack: the kept pack, its sha256 and the audit log's record of it all replaced → filing verify still catches it against the signed record and the acknowledged sha256", async () => {
    const book = await signOffBook();
    const approved = await signedOff(book, Q3);
    const filing = await fileIt(book, approved.id);
    const regulator = await createAssignedRegulator(book.entity.id);
    const regulatorCookie = await sessionCookieFor(regulator.id);
    await request(app)
      .post(`/api/filings/${filing.id}/acknowledge`)
      .set("Cookie", regulatorCookie)
      .send({})
      .expect(200);

    const forged = Buffer.from("%PDF-1.3 forged pack with green/3.00");
    await exec("UPDATE filings SET pack_pdf = :pdf, pack_sha256 = :sha WHERE id = :id", {
      id: filing.id,
      pdf: forged,
      sha: sha256(forged),
    });
    // The audit table's witness edited to match (what the old filing check compared with).
    const editWitness = (from: string, to: string) =>
      exec(
        `UPDATE audit_events SET after_json = REPLACE(after_json, :from, :to)
         WHERE action = 'snapshot.file' AND target = :target`,
        { from, to, target: `snapshot #${approved.id}` },
      );
    await editWitness(filing.sha256, sha256(forged));
    if (
      (
        await rows(
          "SELECT COUNT(*) AS n FROM information_schema.columns WHERE table_schema = DATABASE() AND table_name = 'filings' AND column_name = 'acknowledged_sha256'",
        )
      )[0].n
    )
      await exec("UPDATE filings SET acknowledged_sha256 = :sha WHERE id = :id", {
        id: filing.id,
        sha: sha256(forged),
      });

    const verify = (await request(app).get(`/api/filings/${filing.id}/verify`).set("Cookie", regulatorCookie)).body;
    await editWitness(sha256(forged), filing.sha256); // the shared test database's audit log stays whole
    expect(verify.valid).toBe(false);
    expect(verify.detail).toMatch(/signed record|acknowledged/);
  });
});

describe("attacks on the audit log", () => {
  const auditVerify = async (cookie: string) => request(app).get("/api/audit-events/verify").set("Cookie", cookie);

  async function approvalEvent() {
    const book = await signOffBook();
    const approved = await signedOff(book, Q3);
    const [event] = await rows(
      "SELECT * FROM audit_events WHERE action = 'snapshot.approve' AND target = :t ORDER BY id DESC LIMIT 1",
      { t: `snapshot #${approved.id}` },
    );
    return { book, event, approved };
  }

  /** Puts a deleted event back exactly as it was (the shared test database stays whole for the next test). */
  async function reinsert(event: Row) {
    const columns = Object.keys(event);
    await exec(
      `INSERT INTO audit_events (${columns.map((c) => `\`${c}\``).join(", ")}) VALUES (${columns.map((c) => `:${c}`).join(", ")})`,
      event,
    );
  }

  it("attack: an approval's audit event edited (another approver, another comment) → audit verify names the event", async () => {
    const { book, event } = await approvalEvent();
    const croCookie = book.croCookie;
    expect((await auditVerify(croCookie)).body).toMatchObject({ valid: true });
    const otherApprover = await createTestUser("cro");
    try {
      await exec(
        "UPDATE audit_events SET actor_email = :email, actor_user_id = :uid, after_json = :after WHERE id = :id",
        {
          id: event.id,
          email: otherApprover.email,
          uid: otherApprover.id,
          after: String(event.after_json).replace("Looks right", "Approved as discussed"),
        },
      );
      const res = await auditVerify(croCookie);
      expect(res.status).toBe(200);
      expect(res.body.valid).toBe(false);
      expect(res.body.detail).toMatch(new RegExp(`#${event.id}\\b`));
      expect(res.body.detail).toMatch(/altered|changed/);
    } finally {
      await exec(
        "UPDATE audit_events SET actor_email = :email, actor_user_id = :uid, after_json = :after WHERE id = :id",
        {
          id: event.id,
          email: event.actor_email,
          uid: event.actor_user_id,
          after: event.after_json,
        },
      );
    }
    expect((await auditVerify(croCookie)).body).toMatchObject({ valid: true });
  });

  it("attack: an approval's audit event deleted → audit verify says an event is missing from the sequence", async () => {
    const { book, event } = await approvalEvent();
    // A later event, so that the deleted one is not the newest.
    await request(app).get(`/api/entities/${book.entity.code}/chain/verify`).set("Cookie", book.croCookie);
    await approvalEvent();
    try {
      await exec("DELETE FROM audit_events WHERE id = :id", { id: event.id });
      const res = await auditVerify(book.croCookie);
      expect(res.body.valid).toBe(false);
      expect(res.body.detail).toMatch(/missing|deleted/);
    } finally {
      await reinsert(event);
    }
    expect((await auditVerify(book.croCookie)).body).toMatchObject({ valid: true });
  });

  it("attack: the newest audit event deleted → audit verify says the log is shorter than its signed head", async () => {
    const { book } = await approvalEvent();
    const [newest] = await rows("SELECT * FROM audit_events ORDER BY id DESC LIMIT 1");
    try {
      await exec("DELETE FROM audit_events WHERE id = :id", { id: newest.id });
      const res = await auditVerify(book.croCookie);
      expect(res.body.valid).toBe(false);
      expect(res.body.detail).toMatch(/head|missing|deleted/);
    } finally {
      await reinsert(newest);
    }
    expect((await auditVerify(book.croCookie)).body).toMatchObject({ valid: true });
  });
});
