import request from "supertest";
import { describe, expect, it } from "vitest";
import type { Page } from "playwright-core";
import {
  createAssignedRegulator,
  createTestEntity,
  createTestPortfolio,
  createTestUser,
  sessionCookieFor,
  unique,
} from "../server/helpers";
import { HEADER } from "../server/ingest-helpers";
import { approve, type Book, prepare, signOffBook, snapshotApp, submit } from "../server/snapshot-helpers";
import { latestLinkTokenFor } from "../server/mail-helpers";
import { expectAccessible } from "./axe";
import { browserSuite, keepScreenshot, pageSignedInAs, signInAs, watchConsole } from "./browser";

/**
 * Every screen each role can open, checked with axe-core (WCAG 2.0/2.1 A and AA) in each state a
 * reader meets: the screen as it opens, a confirmation open, a form with its errors shown, an empty
 * state. Any violation fails the journey with the rule, the element and the help text.
 */
let book: Book;
let emptyEntity = "";
let emptyPortfolio = "";
let q1Filing = 0;
let q2Approved = 0;
let q3Submitted = 0;
const emails = { treasury: "", regulator: "", admin: "", invitee: "" };

async function signedOff(quarterEnd: string, file: boolean) {
  const draft = await prepare(book, quarterEnd);
  expect(draft.status, JSON.stringify(draft.body)).toBe(201);
  await submit(draft.body.id, book.cookie, { comment: "Figures checked", version: draft.body.version }).expect(200);
  await approve(draft.body.id, book.croCookie).expect(200);
  if (!file) return draft.body.id as number;
  const filed = await request(snapshotApp)
    .post(`/api/snapshots/${draft.body.id}/filings`)
    .set("Cookie", book.croCookie)
    .send({});
  expect(filed.status, JSON.stringify(filed.body)).toBeLessThan(300);
  return filed.body.id as number;
}

/** The EU book: Q1 2026 filed, Q2 approved, Q3 submitted; an entity with a portfolio and no data; every role. */
async function loadBooks() {
  book = await signOffBook();
  await book.entity.update({ supervisorEmails: [`market-risk-${Date.now()}@bank-supervisor.test`] });
  q1Filing = await signedOff("2026-03-31", true);
  q2Approved = await signedOff("2026-06-30", false);
  const q3 = await prepare(book);
  expect(q3.status).toBe(201);
  const submitted = await submit(q3.body.id, book.cookie, { version: q3.body.version });
  expect(submitted.status, JSON.stringify(submitted.body)).toBe(200);
  q3Submitted = q3.body.id;

  const empty = await createTestEntity();
  await empty.update({ country: "GB" }); // its calendar offers the import of public holidays
  emptyEntity = empty.code;
  emptyPortfolio = (await createTestPortfolio(empty, "BOOK", "Empty book")).code;
  emails.treasury = (await createTestUser("treasury")).email;
  const regulator = await createAssignedRegulator(book.entity.id);
  emails.regulator = regulator.email;
  const admin = await createTestUser("admin");
  emails.admin = admin.email;
  // An invitation waiting to be used: its set-password screen is checked below.
  emails.invitee = `invitee-${unique()}@larkspur.test`;
  await request(snapshotApp)
    .post("/api/users")
    .set("Cookie", await sessionCookieFor(admin.id))
    .send({ email: emails.invitee, name: "Iris Vale", role: "analyst" })
    .expect(201);
}

const suite = browserSuite(loadBooks);

/** Opens a path and waits until it has drawn: the text or role given, then no request in flight. */
async function open(page: Page, path: string, ready: Parameters<Page["getByRole"]>) {
  await page.goto(`${suite.app.baseUrl}${path}`);
  await page
    .getByRole(...ready)
    .first()
    .waitFor({ timeout: 20_000 });
  await settled(page);
}

async function settled(page: Page) {
  await page.waitForLoadState("networkidle");
  await page.waitForFunction(() => !/Loading…|Drawing the chart…|Opening Quartermark/.test(document.body.innerText));
}

/** The screens several roles open as they stand, each by its address and what shows it has drawn. */
const screens = () =>
  ({
    Backtest: [`/backtest/${book.portfolio.code}`, ["heading", { name: /Where we stand/ }]],
    Data: ["/data", ["heading", { name: /upload history/i }]],
    "Quarter close": [`/quarters?entity=${book.entity.code}`, ["heading", { name: /Quarter close/ }]],
    Capital: [`/capital?entity=${book.entity.code}`, ["form", { name: "What-if scenario" }]],
    Filings: [`/filings?filing=${q1Filing}`, ["heading", { name: /Filings/ }]],
    "Waiting for me": ["/waiting", ["heading", { name: "Waiting for me" }]],
  }) satisfies Record<string, [string, Parameters<Page["getByRole"]>]>;

/** Opens each of these screens in turn and checks it, named "<role>: <screen>" in the report. */
async function checkScreens(page: Page, role: string, names: Array<keyof ReturnType<typeof screens>>) {
  for (const name of names) {
    const [path, ready] = screens()[name];
    await open(page, path, ready);
    await expectAccessible(page, `${role}: ${name}`);
  }
}

/** A new page signed in as `email`, its console watched, its Overview drawn and checked. */
async function overviewOf(email: string, role: string) {
  const signedIn = await pageSignedInAs(suite, email);
  await settled(signedIn.page);
  await expectAccessible(signedIn.page, `${role}: Overview`);
  return signedIn;
}

describe("every screen meets WCAG 2.1 A and AA, checked with axe-core in a real browser", () => {
  it("when signed out, the sign-in screen, with the wrong password's message shown, has no violation", async () => {
    const page = await suite.context.newPage();
    await page.goto(`${suite.app.baseUrl}/sign-in`);
    await page.getByRole("button", { name: /^sign in$/i }).waitFor();
    await expectAccessible(page, "Sign in");
    await page.getByRole("button", { name: /^sign in$/i }).click();
    await page.locator("[aria-invalid='true']").first().waitFor();
    await expectAccessible(page, "Sign in, empty form refused");
    await page.getByLabel(/e-mail/i).fill(book.analyst.email);
    await page.getByLabel(/password/i).fill("not the password");
    await page.getByRole("button", { name: /^sign in$/i }).click();
    await page.getByText(/not correct/i).waitFor({ timeout: 10_000 });
    await expectAccessible(page, "Sign in, wrong password");
    await page.close();
  });

  it("when the analyst opens the Overview and the Backtest, with the charts' tables open, a review form with its errors and a portfolio without data, there is no violation", async () => {
    const { page, errors } = await overviewOf(book.analyst.email, "analyst");

    await open(page, `/backtest/${book.portfolio.code}`, ["heading", { name: /Where we stand/ }]);
    await page.getByText("Counted exceptions in the trailing window").first().waitFor({ timeout: 20_000 });
    await settled(page);
    await expectAccessible(page, "analyst: Backtest");
    // Each disclosure, once open, says "Hide the figures": open the first closed one until none is left.
    const closed = page.getByText("Show the figures as a table");
    while ((await closed.count()) > 0) await closed.first().click();
    await page.getByRole("region", { name: /Counted exceptions on each date/ }).waitFor();
    await expectAccessible(page, "analyst: Backtest, the charts' figures as tables");
    await keepScreenshot(page, "a11y-backtest-analyst");
    await page.getByRole("button", { name: `Review the exception of ${book.exceptionDays[4]}` }).click();
    const review = page.getByRole("form", { name: `Review of the exception of ${book.exceptionDays[4]}` });
    await review.getByRole("button", { name: /Save/ }).click();
    await review.locator("[aria-invalid='true']").first().waitFor();
    await expectAccessible(page, "analyst: Backtest, review form with its errors");

    await open(page, `/backtest/${emptyPortfolio}`, ["heading", { level: 1 }]);
    await expectAccessible(page, "analyst: Backtest, portfolio without data");

    // A portfolio without data answers 404 to the figures it has not got, and the browser logs that.
    expect(errors.filter((e) => !/status of 404/.test(e))).toEqual([]);
    await page.close();
  }, 240_000);

  it("when the analyst opens Data, Quarter close, Capital and Filings, with a refused upload, a refused what-if and an entity without data, there is no violation", async () => {
    const { page, errors } = await pageSignedInAs(suite, book.analyst.email);
    await checkScreens(page, "analyst", ["Data"]);
    const code = book.portfolio.code;
    await page.locator('input[type="file"]').setInputFiles({
      name: "with-weekend.csv",
      mimeType: "text/csv",
      buffer: Buffer.from(`${HEADER}\r\n${code},2026-10-03,-5,-4,99\r\n`),
    });
    await page
      .getByText(/2026-10-03 is a Saturday/)
      .first()
      .waitFor({ timeout: 20_000 });
    await settled(page);
    await expectAccessible(page, "analyst: Data, upload refused with its errors");

    await checkScreens(page, "analyst", ["Quarter close"]);
    await open(page, `/quarters?entity=${book.entity.code}&snapshot=${q3Submitted}`, [
      "heading",
      { name: "What next" },
    ]);
    await expectAccessible(page, "analyst: Quarter close, a submitted snapshot");
    await open(page, `/quarters?entity=${emptyEntity}`, ["heading", { name: /Quarter close/ }]);
    await expectAccessible(page, "analyst: Quarter close, entity without snapshots");

    await checkScreens(page, "analyst", ["Capital"]);
    const whatIf = page.getByRole("form", { name: "What-if scenario" });
    await whatIf.getByLabel(/Extra exceptions/).fill("-3");
    await whatIf.getByRole("button").click();
    await whatIf.locator("[aria-invalid='true']").first().waitFor();
    await expectAccessible(page, "analyst: Capital, what-if refused with its errors");
    await open(page, `/capital?entity=${emptyEntity}`, ["heading", { level: 1 }]);
    await expectAccessible(page, "analyst: Capital, entity without data");

    await checkScreens(page, "analyst", ["Filings"]);
    // The entity without data answers 404 to the figures it has not got, and the browser logs that.
    expect(errors.filter((e) => !/status of 404/.test(e))).toEqual([]);
    await page.close();
  }, 240_000);

  it("when the CRO returns a quarter without a comment, opens the filing confirmation and reads the filings, there is no violation", async () => {
    const { page, errors } = await overviewOf(book.cro.email, "cro");
    await open(page, `/quarters?entity=${book.entity.code}&snapshot=${q3Submitted}`, [
      "button",
      { name: "Approve and seal" },
    ]);
    await expectAccessible(page, "cro: Quarter close, sign-off form");
    await page.getByRole("button", { name: "Return to the analysts" }).click();
    await page.getByRole("form", { name: "Sign-off" }).locator("[aria-invalid='true']").waitFor();
    await expectAccessible(page, "cro: Quarter close, return refused without a comment");

    await open(page, `/quarters?entity=${book.entity.code}&snapshot=${q2Approved}`, [
      "button",
      { name: "File with the supervisor" },
    ]);
    await page.getByRole("button", { name: "File with the supervisor" }).click();
    await page.getByRole("button", { name: "Send the pack" }).waitFor();
    await expectAccessible(page, "cro: Quarter close, filing confirmation open");
    await page.getByRole("button", { name: "Cancel" }).click();

    await checkScreens(page, "cro", ["Backtest", "Data", "Capital", "Filings"]);
    expect(errors).toEqual([]);
    await page.close();
  }, 240_000);

  it("when treasury reads its screens, creates a token with an error first and opens the revoke confirmation, there is no violation", async () => {
    const { page, errors } = await overviewOf(emails.treasury, "treasury");
    await checkScreens(page, "treasury", ["Quarter close", "Capital"]);
    await open(page, `/settings?entity=${book.entity.code}`, ["heading", { level: 1 }]);
    await expectAccessible(page, "treasury: Supervisory settings, read only");

    await open(page, "/tokens", ["heading", { name: "API tokens" }]);
    await expectAccessible(page, "treasury: API tokens, none yet");
    await page.getByRole("button", { name: "Create token" }).click();
    await page
      .getByRole("form", { name: /Create a token/ })
      .locator("[aria-invalid='true']")
      .first()
      .waitFor();
    await expectAccessible(page, "treasury: API tokens, create refused without a name");
    await page.getByLabel("Name").fill("Capital pull");
    await page.getByRole("button", { name: "Create token" }).click();
    await page.getByTestId("new-token-secret").waitFor({ timeout: 15_000 });
    await expectAccessible(page, "treasury: API tokens, the new secret shown");
    await page.getByRole("button", { name: "I have stored it" }).click();
    await page.getByRole("button", { name: "Revoke Capital pull" }).click();
    await page.getByRole("button", { name: "Revoke token" }).waitFor();
    await expectAccessible(page, "treasury: API tokens, revoke confirmation open");
    await page.getByRole("button", { name: "Cancel" }).click();
    expect(errors).toEqual([]);
    await page.close();
  }, 240_000);

  it("when the regulator reads and acknowledges a filing, there is no violation", async () => {
    const { page, errors } = await overviewOf(emails.regulator, "regulator");
    await open(page, `/filings?filing=${q1Filing}`, ["button", { name: "Acknowledge receipt" }]);
    await expectAccessible(page, "regulator: Filings");
    await page.getByRole("button", { name: "Acknowledge receipt" }).click();
    await page
      .getByText(/Acknowledged by/)
      .first()
      .waitFor({ timeout: 15_000 });
    await settled(page);
    await expectAccessible(page, "regulator: Filings, acknowledged");
    await checkScreens(page, "regulator", ["Waiting for me"]);
    expect(errors).toEqual([]);
    await page.close();
  }, 240_000);

  it("when the administrator opens every admin screen and sends each form empty, there is no violation", async () => {
    const { page, errors } = await overviewOf(emails.admin, "admin");

    await open(page, "/admin/users", ["heading", { name: "Invite a user" }]);
    await expectAccessible(page, "admin: Users");
    await page.getByRole("button", { name: "Send invitation" }).click();
    await page.locator("form [aria-invalid='true']").first().waitFor();
    await expectAccessible(page, "admin: Users, add refused with its errors");
    await page
      .getByRole("button", { name: /^Send reset link to / })
      .first()
      .click();
    await settled(page);
    await expectAccessible(page, "admin: Users, the reset link's confirmation open");
    await keepScreenshot(page, "a11y-admin-users");

    await open(page, "/admin/entities", ["heading", { name: "Add an entity" }]);
    await expectAccessible(page, "admin: Entities");
    await page.getByRole("button", { name: "Add entity" }).click();
    await page.locator("form [aria-invalid='true']").first().waitFor();
    await expectAccessible(page, "admin: Entities, add refused with its errors");

    await open(page, `/admin/entities/${emptyEntity}`, ["heading", { name: "Holiday calendar" }]);
    await expectAccessible(page, "admin: Entity");
    await page.getByRole("button", { name: "Add holiday" }).click();
    await page.locator("form [aria-invalid='true']").first().waitFor();
    await expectAccessible(page, "admin: Entity, holiday refused with its errors");
    await page.getByRole("button", { name: "Check what changes" }).click();
    await page.getByRole("group", { name: /^Import the \d{4} public holidays$/ }).waitFor();
    await expectAccessible(page, "admin: Entity, the holiday import's confirmation open");
    await page.getByRole("button", { name: "Cancel" }).click();

    for (const [path, name] of [
      ["/admin/assignments", "Regulator access"],
      ["/admin/audit", "Audit log"],
      ["/admin/outbox", "Outbox"],
    ]) {
      await open(page, path, ["heading", { level: 1 }]);
      await expectAccessible(page, `admin: ${name}`);
    }
    await checkScreens(page, "admin", ["Waiting for me"]);
    expect(errors).toEqual([]);
    await page.close();
  }, 240_000);

  it("when someone opens their account and an invitee their set-password link, with a weak password and an empty form refused and an unusable link, there is no violation", async () => {
    const page = await suite.context.newPage();
    const errors = watchConsole(page);
    const token = await latestLinkTokenFor(emails.invitee);
    await page.goto(`${suite.app.baseUrl}/set-password#${token}`);
    await page.getByRole("heading", { name: "Welcome, Iris Vale" }).waitFor({ timeout: 20_000 });
    await settled(page);
    await expectAccessible(page, "invitee: Set password");
    await page.getByLabel("New password", { exact: true }).fill("123456789012");
    await page.getByText("This is a commonly used password.", { exact: false }).waitFor({ timeout: 30_000 });
    await page.getByRole("button", { name: "Set password and sign in" }).click();
    await page.locator("form [aria-invalid='true']").first().waitFor();
    await expectAccessible(page, "invitee: Set password, weak password refused");
    await keepScreenshot(page, "a11y-set-password-refused");
    await page.goto(`${suite.app.baseUrl}/set-password#${"x".repeat(43)}`);
    await page.getByRole("heading", { name: "This link cannot be used" }).waitFor({ timeout: 20_000 });
    await expectAccessible(page, "invitee: Set password, unknown link");

    await signInAs(page, suite.app.baseUrl, book.analyst.email);
    await open(page, "/account", ["heading", { name: "Your account" }]);
    await expectAccessible(page, "analyst: Your account");
    await page.getByRole("button", { name: "Change password" }).click();
    await page.locator("form [aria-invalid='true']").first().waitFor();
    await expectAccessible(page, "analyst: Your account, change refused with its errors");
    await keepScreenshot(page, "a11y-account-refused");
    // The unknown link's lookup is refused on purpose (the browser logs that answer); nothing else may be.
    expect(errors.filter((e) => !/^Failed to load resource: .* status of 404/.test(e))).toEqual([]);
    await page.close();
  }, 240_000);
});
