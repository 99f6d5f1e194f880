import request from "supertest";
import { expect } from "vitest";
import { testApp } from "../helpers";

const app = testApp();

/**
 * Whoever holds `cookie` saves the explanation of a portfolio's exception day (an analyst's review,
 * perhaps asking to exclude it); the caller checks the answer.
 */
export function putReview(portfolio: string, day: string, cookie: string, body: Record<string, unknown>) {
  return request(app).put(`/api/portfolios/${portfolio}/exceptions/${day}/review`).set("Cookie", cookie).send(body);
}

/** Whoever holds `cookie` records the supervisor's decision on an exclusion; the caller checks the answer. */
export function putDecision(portfolio: string, day: string, cookie: string, body: Record<string, unknown>) {
  return request(app).put(`/api/portfolios/${portfolio}/exceptions/${day}/decision`).set("Cookie", cookie).send(body);
}

/** A book as the review steps need it: the portfolio, an analyst's session and a CRO's. */
type ReviewedBook = { portfolio: { code: string }; cookie: string; croCookie: string };

/** The analyst explains an exception as a data issue and asks to exclude it; the review as saved. */
export async function exclusionRequested(book: ReviewedBook, day: string, narrative: string) {
  const review = await putReview(book.portfolio.code, day, book.cookie, {
    cause: "data_issue",
    narrative,
    exclusion: true,
  });
  expect(review.status, JSON.stringify(review.body)).toBe(200);
  return review.body as { version: number };
}

/** An exclusion requested by the analyst, then the supervisor's decision on it recorded by the CRO. */
export async function exclusionDecided(
  book: ReviewedBook,
  day: string,
  narrative: string,
  decision: { decision: "approved" | "rejected"; reference: string; decidedOn: string },
) {
  const review = await exclusionRequested(book, day, narrative);
  const decided = await putDecision(book.portfolio.code, day, book.croCookie, { ...decision, version: review.version });
  expect(decided.status, JSON.stringify(decided.body)).toBe(200);
}
