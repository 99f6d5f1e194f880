import { createHash } from "node:crypto";
import request from "supertest";
import { afterAll, describe, expect, it } from "vitest";
import { sequelize } from "../../server/db/sequelize";
import { AuditEventModel } from "../../server/models/audit-event";
import { FilingModel } from "../../server/models/filing";
import { SnapshotModel } from "../../server/models/snapshot";
import { filingListSchema, filingSchema } from "../../shared/schemas/filing";
import { snapshotSchema, type Snapshot } from "../../shared/schemas/snapshot";
import { createAssignedRegulator, sessionCookieFor } from "./helpers";
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
} from "./snapshot-helpers";
import { download, flat, keepPages, pagesText } from "./pdf-helpers";

afterAll(() => sequelize.close());

const sha256 = (bytes: Buffer) => createHash("sha256").update(bytes).digest("hex");
const amend = (book: Book, amends: number, quarterEnd = Q3, cookie = book.cookie) =>
  request(app).post("/api/snapshots").set("Cookie", cookie).send({ entity: book.entity.code, quarterEnd, amends });

/** A book whose Q3 2026 is prepared, approved and filed with the supervisor, and a regulator assigned to it. */
async function filedBook() {
  const book = await signOffBook();
  await book.analyst.update({ name: "Ada Quill" });
  await book.cro.update({ name: "Bram Oduya" });
  await book.entity.update({ supervisorEmails: [`supervisor-${Date.now()}@bank-supervisor.test`] });
  const submitted = await preparedAndSubmitted(book);
  const approved = await approve(submitted.id, book.croCookie, { version: submitted.version });
  expect(approved.status, JSON.stringify(approved.body)).toBe(200);
  const filed = await request(app).post(`/api/snapshots/${submitted.id}/filings`).set("Cookie", book.croCookie);
  expect(filed.status, JSON.stringify(filed.body)).toBe(201);
  const regulator = await createAssignedRegulator(book.entity.id);
  return {
    book,
    originalId: submitted.id as number,
    filing: filingSchema.parse(filed.body),
    regulatorCookie: await sessionCookieFor(regulator.id),
  };
}

/** Restates the book's last exception day (inside Q3) to an ordinary loss of 50: 5 counted exceptions become 4. */
async function restateLastException(book: Book) {
  const day = book.exceptionDays[4];
  const i = book.dates.indexOf(day);
  const committed = await uploadAndCommit(book.cookie, [HEADER, book.row(day, i, 50)].join("\n"));
  expect(committed.restated).toBe(1);
  return day;
}

const getSnapshot = async (id: number, cookie: string): Promise<Snapshot> =>
  snapshotSchema.parse((await request(app).get(`/api/snapshots/${id}`).set("Cookie", cookie).expect(200)).body);

describe("amended filings", () => {
  it("when a day of a filed quarter is restated, then an amendment is prepared, signed off by four eyes and filed, and the original stays as filed", async () => {
    const { book, originalId, filing, regulatorCookie } = await filedBook();
    const originalPack = await download(app, `/api/filings/${filing.id}/pack.pdf`, regulatorCookie);
    expect(sha256(originalPack)).toBe(filing.sha256);

    // Nothing restated yet: nothing to amend.
    const early = await amend(book, originalId);
    expect(early.status).toBe(409);
    expect(early.body.error.code).toBe("not_restated");

    const day = await restateLastException(book);
    const flagged = await getSnapshot(originalId, book.cookie);
    expect(flagged.restatedAfterSignOff?.detail).toContain(day);
    expect(flagged.restatedAfterSignOff?.resolvedBy).toBeNull();
    const originalRow = (await SnapshotModel.findByPk(originalId))!.toJSON();

    // The analysts are waited for: the filed quarter needs an amendment.
    const waiting = async () =>
      (await request(app).get("/api/queue").set("Cookie", book.cookie).expect(200)).body.filter(
        (i: { kind: string; entity: string }) => i.kind === "amendment_to_prepare" && i.entity === book.entity.code,
      );
    expect(await waiting()).toEqual([
      expect.objectContaining({
        title: `Q3 2026 of ${book.entity.code} is filed and a day inside it was restated: prepare an amendment`,
        href: `/quarters?entity=${book.entity.code}&snapshot=${originalId}`,
      }),
    ]);

    // Prepare: the figures recomputed on today's data, the before/after frozen with them.
    const prepared = await amend(book, originalId);
    expect(prepared.status, JSON.stringify(prepared.body)).toBe(201);
    const draft = snapshotSchema.parse(prepared.body);
    expect(draft).toMatchObject({ status: "draft", amends: originalId, amendedBy: null, quarterEnd: Q3 });
    // docs/rules.md#zones (CRR Art. 366, table 1): 5 exceptions are yellow with plus factor 0.40,
    // 4 are green with none; the multiplier falls from 3 + 0.40 to 3.
    expect(draft.counted).toBe(4);
    const a = draft.amendment!;
    const change = (key: string) => a.changes.find((c) => c.key === key);
    expect(change("counted")).toMatchObject({ before: 5, after: 4, group: "headline" });
    expect(change("zone")).toMatchObject({ before: "yellow", after: "green" });
    expect(change("plusFactor")).toMatchObject({ before: 0.4, after: 0 });
    expect(change("multiplier")).toMatchObject({ before: 3.4, after: 3 });
    expect(a.changes.some((c) => c.group === "return")).toBe(true);
    expect(a.exceptions).toEqual([expect.objectContaining({ date: day, change: "removed" })]);
    // Worked by hand (docs/rules.md#capital): the binding side is m × 60-day average on both terms;
    // the VaR (100/101 alternating → 100.5) and stressed VaR (250) are 10-day by × √10, and both
    // multipliers fall by 0.40: impact = −0.40 × √10 × (100.5 + 250) ≈ −443.35.
    expect(a.capitalImpact.before).toBe(flagged.capital);
    expect(a.capitalImpact.after).toBe(draft.capital);
    expect(a.capitalImpact.change).toBeCloseTo(draft.capital! - flagged.capital!, 2);
    expect(a.capitalImpact.change).toBeCloseTo(-0.4 * Math.sqrt(10) * (100.5 + 250), 0);
    expect(a.original).toMatchObject({ snapshotId: originalId, hash: flagged.hash, filingId: filing.id });
    expect(a.original.filedBy).toBe("Bram Oduya");

    // The draft's pack: DRAFT and AMENDMENT on every page, never to be filed as it is.
    const draftPack = await download(app, `/api/snapshots/${draft.id}/pack.pdf`, book.cookie);
    keepPages(draftPack, "amendment_draft");
    for (const p of pagesText(draftPack)) expect(p).toContain(`DRAFT · AMENDMENT of snapshot #${originalId}`);

    expect(await waiting()).toEqual([]);

    // Prepared again while a draft: the same amendment, recomputed — not a second one.
    const again = await amend(book, originalId);
    expect(again.status).toBe(200);
    expect(again.body.id).toBe(draft.id);
    expect((await getSnapshot(originalId, book.cookie)).amendedBy).toBe(draft.id);

    // Four eyes, as for any snapshot.
    const submitted = await submit(draft.id, book.cookie, { version: again.body.version });
    expect(submitted.status, JSON.stringify(submitted.body)).toBe(200);
    const second = await amend(book, originalId, Q3, book.analyst2Cookie);
    expect(second.status).toBe(409);
    expect(second.body.error.code).toBe("amendment_open");
    const approved = await approve(draft.id, book.croCookie, { version: submitted.body.version });
    expect(approved.status, JSON.stringify(approved.body)).toBe(200);
    expect(approved.body.hash).toMatch(/^[0-9a-f]{64}$/);
    expect(approved.body.hash).not.toBe(flagged.hash);

    const filedAmendment = await request(app).post(`/api/snapshots/${draft.id}/filings`).set("Cookie", book.croCookie);
    expect(filedAmendment.status, JSON.stringify(filedAmendment.body)).toBe(201);
    const amendmentFiling = filingSchema.parse(filedAmendment.body);
    expect(amendmentFiling.fileName).toMatch(/-amendment-\d+-pack\.pdf$/);

    // The supervisor sees the two filings linked, each with its snapshot's hash.
    const listed = filingListSchema.parse(
      (await request(app).get("/api/filings").set("Cookie", regulatorCookie).expect(200)).body,
    );
    const mine = listed.filter((f) => f.entity === book.entity.code);
    expect(mine.find((f) => f.id === filing.id)).toMatchObject({
      amends: null,
      amendedBy: draft.id,
      snapshotHash: flagged.hash,
      sha256: filing.sha256,
    });
    expect(mine.find((f) => f.id === amendmentFiling.id)).toMatchObject({
      amends: originalId,
      amendedBy: null,
      snapshotHash: approved.body.hash,
    });

    // The original: same pack bytes, same hash, same row; its flag is now resolved.
    const originalAgain = await download(app, `/api/filings/${filing.id}/pack.pdf`, regulatorCookie);
    expect(Buffer.compare(originalAgain, originalPack)).toBe(0);
    expect(sha256(originalAgain)).toBe(filing.sha256);
    expect((await FilingModel.scope("withPack").findByPk(filing.id))!.packSha256).toBe(filing.sha256);
    expect((await SnapshotModel.findByPk(originalId))!.toJSON()).toEqual(originalRow);
    const resolved = await getSnapshot(originalId, book.cookie);
    expect(resolved.hash).toBe(flagged.hash);
    expect(resolved.restatedAfterSignOff?.resolvedBy).toMatchObject({ snapshotId: draft.id });
    const verify = await request(app)
      .get(`/api/entities/${book.entity.code}/chain/verify`)
      .set("Cookie", book.croCookie);
    expect(verify.body, JSON.stringify(verify.body)).toMatchObject({ valid: true, problems: [] });
    expect((await request(app).get(`/api/filings/${filing.id}/verify`).set("Cookie", regulatorCookie)).body.valid).toBe(
      true,
    );
    expect(
      (await request(app).get(`/api/filings/${amendmentFiling.id}/verify`).set("Cookie", regulatorCookie)).body.valid,
    ).toBe(true);

    // The amendment's pack, as the supervisor downloads it.
    const pack = await download(app, `/api/filings/${amendmentFiling.id}/pack.pdf`, regulatorCookie);
    keepPages(pack, "amendment");
    const pages = pagesText(pack);
    for (const p of pages) expect(p).toContain(`AMENDMENT of snapshot #${originalId}`);
    const raw = pages.join("\n");
    // The original's hash printed whole: its groups of eight on one line, never split inside a group.
    expect(raw.split("\n").some((line) => line.includes(flagged.hash!.match(/.{8}/g)!.join(" ")))).toBe(true);
    const text = flat(raw);
    expect(text).toContain(`Amendment of snapshot #${originalId}, filed ${filing.sentAt!.slice(0, 10)}`);
    expect(text).toContain("by Bram Oduya");
    expect(text).toMatch(/Before \(as filed\) After \(amended\)/);
    expect(text).toMatch(/Counted exceptions — 5 4/);
    expect(text).toMatch(/Traffic-light zone — Yellow Green/);
    expect(text).toMatch(/Multiplier m_c — 3\.40 3\.00/);
    expect(text).toMatch(new RegExp(`${day} Removed No longer an exception`));
    expect(text).toContain(`Capital impact ${a.capitalImpact.change!.toFixed(2)} EUR (a decrease)`);
    expect(text).toMatch(/Amends Snapshot #\d+, filed \d{4}-\d\d-\d\d \d\d:\d\d UTC by Bram Oduya/);
  });

  it("when the snapshot named is not filed, or of another quarter, or an amendment is in sign-off, then it is refused and nothing is written", async () => {
    const book = await signOffBook();
    const draft = await prepare(book, Q2);
    expect(draft.status).toBe(201);
    const before = await SnapshotModel.count({ where: { entityId: book.entity.id } });

    const unfiled = await amend(book, draft.body.id, Q2);
    expect(unfiled.status).toBe(409);
    expect(unfiled.body.error.code).toBe("not_filed");
    expect(unfiled.body.error.message).toMatch(/only a filed snapshot is amended/);

    const otherQuarter = await amend(book, draft.body.id, Q3);
    expect(otherQuarter.status).toBe(422);
    expect(otherQuarter.body.error.details.fields.amends).toBeDefined();

    const missing = await amend(book, 2_000_000_000, Q3);
    expect(missing.status).toBe(422);
    expect(await SnapshotModel.count({ where: { entityId: book.entity.id } })).toBe(before);
    expect(await AuditEventModel.count({ where: { target: `snapshot #${draft.body.id}` } })).toBe(1);
  });

  it("when an amendment is filed and a day of the quarter is restated again, then the amendment is flagged and the original is not touched", async () => {
    const { book, originalId } = await filedBook();
    await restateLastException(book);
    const draft = await amend(book, originalId);
    const submitted = await submit(draft.body.id, book.cookie, { version: draft.body.version });
    await approve(draft.body.id, book.croCookie, { version: submitted.body.version }).expect(200);
    await request(app).post(`/api/snapshots/${draft.body.id}/filings`).set("Cookie", book.croCookie).expect(201);
    const originalRow = (await SnapshotModel.findByPk(originalId))!.toJSON();

    const day = book.exceptionDays[3];
    await uploadAndCommit(book.cookie, [HEADER, book.row(day, book.dates.indexOf(day), 60)].join("\n"));
    expect((await SnapshotModel.findByPk(originalId))!.toJSON()).toEqual(originalRow);
    const amendment = await getSnapshot(draft.body.id, book.cookie);
    expect(amendment.restatedAfterSignOff?.detail).toContain(day);
    // The original's line goes on through its amendment.
    const refused = await amend(book, originalId);
    expect(refused.status).toBe(409);
    expect(refused.body.error.code).toBe("already_amended");
    const next = await amend(book, draft.body.id);
    expect(next.status, JSON.stringify(next.body)).toBe(201);
    expect(next.body.amends).toBe(draft.body.id);
    const verify = await request(app)
      .get(`/api/entities/${book.entity.code}/chain/verify`)
      .set("Cookie", book.croCookie);
    expect(verify.body.valid, JSON.stringify(verify.body)).toBe(true);

    // The filed amendment's before/after is signed with it: edited behind the application's back, it shows.
    await sequelize.query(
      "UPDATE snapshots SET amendment_json = REPLACE(amendment_json, '\"before\":5', '\"before\":3') WHERE id = :id",
      { replacements: { id: draft.body.id } },
    );
    const tampered = await request(app)
      .get(`/api/entities/${book.entity.code}/chain/verify`)
      .set("Cookie", book.croCookie);
    expect(tampered.body.valid).toBe(false);
    expect(JSON.stringify(tampered.body.problems)).toContain("before/after of the amendment (sha256)");
  });
});
