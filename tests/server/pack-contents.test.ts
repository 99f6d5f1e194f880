import request from "supertest";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { sequelize } from "../../server/db/sequelize";
import { FilingModel } from "../../server/models/filing";
import { SnapshotModel } from "../../server/models/snapshot";
import { CAUTION } from "../../shared/schemas/common";
import { approve, type Book, prepare, signOffBook, snapshotApp as app, submit } from "./snapshot-helpers";
import { download, flat, keepPages, pagesText } from "./pdf-helpers";
import { exclusionDecided, putReview } from "./support/exception-reviews";

/** A page's text without its page number (in -layout it sits beside the footer's lines). */
const footerless = (s: string) => flat(s.replace(/Page \d+ of \d+/, ""));

afterAll(() => sequelize.close());

let book: Book;
let snapshotId: number;
const NARRATIVE = "Rates sold off after the central bank's surprise statement; the VaR window held no such day.";

beforeAll(async () => {
  book = await signOffBook();
  await book.analyst.update({ name: "Ada Quill" });
  await book.cro.update({ name: "Bram Oduya" });
  await book.entity.update({ supervisorEmails: [`supervisor-${Date.now()}@bank-supervisor.test`] });
  // Every exception explained; the second asks for an exclusion that the supervisor refuses.
  for (const [i, day] of book.exceptionDays.entries()) {
    const narrative = `${NARRATIVE} (day ${i + 1})`;
    if (i === 1) {
      await exclusionDecided(book, day, narrative, {
        decision: "rejected",
        reference: "SUP-2026-118",
        decidedOn: "2026-09-25",
      });
    } else {
      const review = await putReview(book.portfolio.code, day, book.cookie, {
        cause: "market_move",
        narrative,
        exclusion: false,
      });
      expect(review.status, JSON.stringify(review.body)).toBe(200);
    }
  }
  const draft = await prepare(book);
  expect(draft.status).toBe(201);
  snapshotId = draft.body.id;
});

describe("the quarterly pack, read back page by page", () => {
  it("when the snapshot is a draft, then every page says DRAFT and carries the caution, and every exception is there with its amounts and explanation", async () => {
    const pdf = await download(app, `/api/snapshots/${snapshotId}/pack.pdf`, book.cookie);
    const pages = pagesText(pdf);
    expect(keepPages(pdf, "draft")).toBe(pages.length);
    expect(pages.length).toBeGreaterThanOrEqual(3);
    pages.forEach((p, i) => {
      expect(p, `page ${i + 1}`).toContain("DRAFT");
      expect(flat(p), `page ${i + 1}`).toContain(`Page ${i + 1} of ${pages.length}`);
      expect(footerless(p), `page ${i + 1}`).toContain(CAUTION);
    });
    const text = flat(pages.join("\n"));
    expect(text).toContain("Not signed off (draft): these figures are a working copy and must not be filed.");
    // signOffBook: losses of 150 (actual) and 140 (hypothetical) against a VaR of 100 or 101.
    for (const [i, day] of book.exceptionDays.entries()) {
      const var99 = 100 + (book.dates.indexOf(day) % 2);
      expect(text).toMatch(new RegExp(`${day} -150 -140 ${var99} ${150 - var99} ${140 - var99} actual, hyp\\.`));
      expect(text).toContain(`Explanation: ${NARRATIVE} (day ${i + 1})`);
    }
    expect(text).toContain("Supervisor: Exclusion rejected by the supervisor (reference SUP-2026-118, 2026-09-25).");
    expect(text).toMatch(/Supervisor: No exclusion requested\./);
  });

  it("when read, then the determination's formula is filled in with its numbers and the tests are in words", async () => {
    const text = flat(pagesText(await download(app, `/api/snapshots/${snapshotId}/pack.pdf`, book.cookie)).join("\n"));
    // EU CRR Art. 366 Table 1 (docs/rules.md#rule-sets, from memory): 5 overshootings → addend 0.40; base 3 (Art. 364).
    expect(text).toContain("Multiplier m_c = base 3.00 + plus factor 0.40 + qualitative addend 0.00 = 3.40");
    expect(text).toMatch(/Multiplier in force 3\.40 from 2026-10-01 until the next determination/);
    expect(text).toMatch(/Counted exceptions 5; actual 5, hypothetical 5/);
    // Kupiec (1995) with 5 in 250 at 1% (docs/rules.md#statistics): the verdict the engine words.
    expect(text).toContain("5 exceptions in 250 days (2.5 expected) are consistent with 99% coverage");
    expect(text).toMatch(/Clustering \(Christoffersen\)/);
    expect(text).toMatch(/Number and timing together/);
    // The capital formula with the numbers: √10 × VaR 100/101 and √10 × sVaR 250 (CRR Art. 364(1), 365(1)).
    expect(text).toMatch(
      /Requirement = max\(VaR_t−1, m_c × VaR_avg\) \+ max\(sVaR_t−1, m_s × sVaR_avg\) = max\(3\d\d, 3\.40 × 3\d\d\)/,
    );
    // The return data table (docs/rules.md#return-data): C 24.00 rows with their values, inputs not entered said so.
    expect(text).toMatch(/C 24\.00 r010 c150 VaR multiplication factor \(m_c\) 3\.40/);
    expect(text).toMatch(/C 24\.00 r010 c140 Number of overshootings during previous 250 (working days )?5 Engine/);
    expect(text).toMatch(/C 24\.00 r010 c080 Incremental default and migration risk: last (measure )?not entered/);
    expect(text).toContain("Daily P&L against VaR over the window");
    expect(text).toMatch(/250 business days from \d{4}-\d\d-\d\d to 2026-09-30/);
  });

  it("when approved, then DRAFT is gone, the caution stays, the signatories are named with titles, and the hash is printed whole in groups", async () => {
    const row = (await SnapshotModel.findByPk(snapshotId))!;
    const submitted = await submit(snapshotId, book.cookie, { version: row.version });
    expect(submitted.status, JSON.stringify(submitted.body)).toBe(200);
    const approved = await approve(snapshotId, book.croCookie, { version: submitted.body.version });
    expect(approved.status, JSON.stringify(approved.body)).toBe(200);
    const pdf = await download(app, `/api/snapshots/${snapshotId}/pack.pdf`, book.cookie);
    const pages = pagesText(pdf);
    keepPages(pdf, "approved");
    for (const p of pages) {
      expect(p).not.toContain("DRAFT");
      expect(footerless(p)).toContain(CAUTION);
    }
    const raw = pages.join("\n");
    const hash = approved.body.hash as string;
    // Each line holds whole groups of eight: the grouped hash is on one line, never split inside a group.
    expect(raw.split("\n").some((line) => line.includes(hash.match(/.{8}/g)!.join(" ")))).toBe(true);
    const text = flat(raw);
    expect(text).toMatch(/Prepared by Ada Quill Market risk analyst \d{4}-\d\d-\d\d \d\d:\d\d UTC/);
    expect(text).toMatch(/Submitted by Ada Quill Market risk analyst/);
    expect(text).toMatch(/Approved by Bram Oduya Chief Risk Officer \d{4}-\d\d-\d\d \d\d:\d\d UTC/);
    expect(text).not.toContain("Attestation");
  });

  it("when filed, then the pack the supervisor receives carries the attestation instead of the caution, and no DRAFT", async () => {
    const filed = await request(app)
      .post(`/api/snapshots/${snapshotId}/filings`)
      .set("Cookie", book.croCookie)
      .send({});
    expect(filed.status, JSON.stringify(filed.body)).toBe(201);
    const pdf = (await FilingModel.scope("withPack").findByPk(filed.body.id))!.packPdf;
    const pages = pagesText(pdf);
    keepPages(pdf, "filed");
    for (const [i, p] of pages.entries()) {
      expect(p).not.toContain("DRAFT");
      expect(footerless(p)).not.toContain("decision support");
      expect(footerless(p)).toContain(`Filed record of ${book.entity.name}`);
      expect(flat(p)).toContain(`Page ${i + 1} of ${pages.length}`);
    }
    const text = flat(pages.join("\n"));
    expect(text).toContain("Attestation");
    expect(text).toMatch(/Prepared by Ada Quill, Market risk analyst/);
    expect(text).toMatch(/Approved by Bram Oduya, Chief Risk Officer/);
    expect(text).toMatch(/Engine version \d+\.\d+\.\d+/);
    expect(text).toMatch(/Rules applied EU CRR/);
  });
});
