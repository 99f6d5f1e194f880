import request from "supertest";
import { afterAll, describe, expect, it } from "vitest";
import { sequelize } from "../../server/db/sequelize";
import { AuditEventModel } from "../../server/models/audit-event";
import { SnapshotModel } from "../../server/models/snapshot";
import { uploadCsv } from "./ingest-helpers";
import { approve, HEADER, preparedAndSubmitted, signOffBook, snapshotApp as app, verify } from "./snapshot-helpers";
import { otherConnectionRunning, sessionHolding } from "./support/outside-session";

afterAll(() => sequelize.close());

describe("the database goes away in the middle of an approval", () => {
  it("when the approval's connection is killed while it waits for the entity, then 503 says nothing changed, the snapshot is still submitted without a seal, and it approves whole afterwards", async () => {
    const book = await signOffBook();
    const submitted = await preparedAndSubmitted(book);

    // Another session holds the entity row, so the approval stops at its entity lock; then its connection is killed.
    const admin = await sessionHolding("SELECT id FROM entities WHERE id = ? FOR UPDATE", [book.entity.id]);
    const approving = approve(submitted.id, book.croCookie).then((r) => r);
    const victim = await otherConnectionRunning(
      admin,
      (q) => /FROM `entities`/.test(q) && /FOR UPDATE/.test(q),
      20_000,
    );
    if (victim !== undefined) await admin.query(`KILL CONNECTION ${victim}`);
    const killed = victim !== undefined;
    const res = await approving;
    await admin.rollback();
    await admin.end();

    expect(killed).toBe(true);
    expect(res.status).toBe(503);
    expect(res.body.error).toMatchObject({
      code: "database_unavailable",
      message: expect.stringMatching(/Nothing was changed/),
    });
    expect(await SnapshotModel.findByPk(submitted.id)).toMatchObject({
      status: "submitted",
      hash: null,
      approvedBy: null,
    });
    expect(
      await AuditEventModel.count({ where: { action: "snapshot.approve", target: `snapshot #${submitted.id}` } }),
    ).toBe(0);

    const again = await approve(submitted.id, book.croCookie);
    expect(again.status).toBe(200);
    expect((await verify(submitted.id, book.croCookie)).body.valid).toBe(true);
  });
});

describe("an approval and an upload commit take turns on the entity's portfolios", () => {
  it("when a commit holds a portfolio of the entity, then the approval waits for it at the portfolios, before it locks anything the commit needs", async () => {
    const book = await signOffBook();
    const submitted = await preparedAndSubmitted(book);

    // Another session locks the portfolio row exactly as an upload commit does.
    const commitLike = await sessionHolding("SELECT id FROM portfolios WHERE id IN (?) ORDER BY id FOR UPDATE", [
      [book.portfolio.id],
    ]);
    let finished = false;
    const approving = approve(submitted.id, book.croCookie).then((r) => {
      finished = true;
      return r;
    });
    const waiter = await otherConnectionRunning(
      commitLike,
      (q) => /FROM portfolios/.test(q) && /LOCK IN SHARE MODE/.test(q),
      10_000,
      () => !finished,
    );
    const waitingAtPortfolios = waiter !== undefined;
    const snapshotWhileWaiting = await SnapshotModel.findByPk(submitted.id);
    await commitLike.rollback();
    await commitLike.end();

    expect(waitingAtPortfolios).toBe(true);
    expect(snapshotWhileWaiting).toMatchObject({ status: "submitted", hash: null });
    const res = await approving;
    expect(res.status).toBe(200);
    expect(await SnapshotModel.findByPk(submitted.id)).toMatchObject({ status: "approved" });
  });
});

describe("an approval races an upload that restates a day in the quarter", () => {
  it("when both arrive at once, then either the approval is refused as stale or the snapshot is flagged — and approved figures always equal what was reviewed", async () => {
    const book = await signOffBook();
    const submitted = await preparedAndSubmitted(book);
    const day = book.dates.indexOf("2026-09-15");
    const preview = await uploadCsv(
      app,
      book.cookie,
      [HEADER, book.row(book.dates[day], day, 150)].join("\n"),
      "race.csv",
    );
    const [commit, approval] = await Promise.all([
      // Confirmed in advance: if the approval lands first, the day lies in a signed-off quarter (a 409 otherwise).
      request(app)
        .post(`/api/uploads/${preview.body.id}/commit`)
        .set("Cookie", book.cookie)
        .send({ confirmSignedOff: true }),
      approve(submitted.id, book.croCookie),
    ]);
    expect(commit.status).toBe(200); // the data always gets in
    const row = (await SnapshotModel.findByPk(submitted.id))!;
    if (approval.status === 200) {
      // The approval went first: it sealed what was reviewed, and the restatement flagged it afterwards.
      expect(row).toMatchObject({
        status: "approved",
        counted: submitted.counted,
        inputsSha256: submitted.inputsSha256,
      });
      expect(row.restatedAt).not.toBeNull();
    } else {
      // The upload went first: the approval saw the inputs move and refused.
      expect(approval.status).toBe(409);
      expect(approval.body.error.code).toBe("inputs_changed");
      expect(row).toMatchObject({ status: "submitted", hash: null });
    }
    expect(JSON.parse(row.figuresJson).exceptions.counted).toBe(submitted.counted);
  });
});
