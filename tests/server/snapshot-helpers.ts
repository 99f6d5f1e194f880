import request from "supertest";
import { expect } from "vitest";
import { createTestUser, sessionCookieFor, testApp } from "./helpers";
import { ingestFixture, uploadCsv } from "./ingest-helpers";

/** What the quarter-close tests share: a book with five exceptions up to Q3 2026, and the sign-off steps. */
export const snapshotApp = testApp();
const app = snapshotApp;

export const Q3 = "2026-09-30";
export const Q2 = "2026-06-30";
export const HEADER = "portfolio,date,actual_pnl,hypothetical_pnl,var_99,svar_99";

/** Business days (weekdays) ending on `end`, oldest first. */
export function weekdaysEndingOn(end: string, count: number): string[] {
  const out: string[] = [];
  const d = new Date(`${end}T00:00:00Z`);
  while (out.length < count) {
    const wd = d.getUTCDay();
    if (wd !== 0 && wd !== 6) out.unshift(d.toISOString().slice(0, 10));
    d.setUTCDate(d.getUTCDate() - 1);
  }
  return out;
}

/**
 * An EU book with 400 business days up to 30 September 2026: a loss of 50 against a VaR of
 * 100 or 101 (alternating, so it is never stale), and five exception days of 150 inside the
 * last 250 days before Q3's end. Sessions for an analyst, a second analyst and a CRO.
 */
export async function signOffBook() {
  const fx = await ingestFixture();
  const dates = weekdaysEndingOn(Q3, 400);
  const exceptionDays = [dates[170], dates[230], dates[300], dates[350], dates[395]];
  const row = (d: string, i: number, loss = exceptionDays.includes(d) ? 150 : 50) =>
    `${fx.portfolio.code},${d},${-loss},${-loss + 10},${100 + (i % 2)},250`;
  await uploadAndCommit(fx.cookie, [HEADER, ...dates.map((d, i) => row(d, i))].join("\n"));
  const cro = await createTestUser("cro");
  const analyst2 = await createTestUser("analyst");
  return {
    ...fx,
    dates,
    exceptionDays,
    row,
    cro,
    croCookie: await sessionCookieFor(cro.id),
    analyst2,
    analyst2Cookie: await sessionCookieFor(analyst2.id),
    treasuryCookie: await sessionCookieFor((await createTestUser("treasury")).id),
  };
}

/** Commits a file; a restatement of a signed-off quarter is confirmed (uploads.test.ts checks the refusal without). */
export async function uploadAndCommit(cookie: string, csv: string) {
  const preview = await uploadCsv(app, cookie, csv, `daily-${Math.random().toString(36).slice(2)}.csv`);
  expect(preview.body.invalid, JSON.stringify(preview.body.errors)).toBe(0);
  const commit = await request(app)
    .post(`/api/uploads/${preview.body.id}/commit`)
    .set("Cookie", cookie)
    .send({ confirmSignedOff: true });
  expect(commit.status).toBe(200);
  return commit.body as { inserted: number; restated: number };
}

export type Book = Awaited<ReturnType<typeof signOffBook>>;

export async function prepare(book: Book, quarterEnd = Q3, cookie = book.cookie) {
  return request(app).post("/api/snapshots").set("Cookie", cookie).send({ entity: book.entity.code, quarterEnd });
}

/** Whoever holds `cookie` submits a draft for approval; the caller checks the answer. */
export function submit(id: number, cookie: string, body: { comment?: string; version?: number } = {}) {
  return request(app).post(`/api/snapshots/${id}/submit`).set("Cookie", cookie).send(body);
}

export async function preparedAndSubmitted(book: Book, quarterEnd = Q3) {
  const draft = await prepare(book, quarterEnd);
  expect(draft.status).toBe(201);
  const submitted = await submit(draft.body.id, book.cookie, {
    comment: "Figures checked",
    version: draft.body.version,
  });
  expect(submitted.status, JSON.stringify(submitted.body)).toBe(200);
  return submitted.body;
}

/** Whoever holds `cookie` approves a submitted snapshot; the caller checks the answer. */
export function approve(id: number, cookie: string, body: { comment?: string; version?: number } = {}) {
  return request(app).post(`/api/snapshots/${id}/approve`).set("Cookie", cookie).send(body);
}

/** A quarter prepared and submitted by the analyst and approved by the CRO; the submitted snapshot. */
export async function approvedQuarter(book: Book, quarterEnd = Q3) {
  const submitted = await preparedAndSubmitted(book, quarterEnd);
  const approved = await approve(submitted.id, book.croCookie);
  expect(approved.status, JSON.stringify(approved.body)).toBe(200);
  return submitted;
}

/** A sign-off book whose entity files with `supervisorEmails`, its Q3 2026 approved and not yet filed. */
export async function approvedBookFiledTo(supervisorEmails: string[]) {
  const book = await signOffBook();
  await book.entity.update({ supervisorEmails, supervisorName: "Ms Rowan Vale" });
  const submitted = await approvedQuarter(book);
  return { book, snapshotId: submitted.id as number };
}

/** Whether a snapshot's seal and chain still verify, as `cookie` reads it. */
export function verify(id: number, cookie: string) {
  return request(app).get(`/api/snapshots/${id}/verify`).set("Cookie", cookie);
}
