import request from "supertest";
import { describe, expect, it } from "vitest";
import type { Page } from "playwright-core";
import { createApp } from "../../server/app";
import { ObservationModel } from "../../server/models/observation";
import { createTestUser, sessionCookieFor } from "../server/helpers";
import { HEADER, ingestFixture, uploadCsv, weekdays } from "../server/ingest-helpers";
import { expectAccessible } from "./axe";
import { browserSuite, keepScreenshot, pageSignedInAs, signInAs } from "./browser";

let fixture: Awaited<ReturnType<typeof ingestFixture>>;
let bookDates: string[] = [];

/** 300 business days with six exceptions, brought in through the API like an analyst would. */
async function loadBook() {
  fixture = await ingestFixture();
  const api = createApp();
  const dates = weekdays("2025-09-01", 300, new Set(["2025-12-25", "2026-12-25"]));
  bookDates = dates;
  const exceptionAt = new Set([70, 130, 210, 260, 280, 295]);
  const lines = dates.map((d, i) =>
    exceptionAt.has(i)
      ? `${fixture.portfolio.code},${d},-180,-170,100`
      : `${fixture.portfolio.code},${d},${(i % 7) * 9 - 30},${(i % 5) * 8 - 25},${95 + (i % 11)}`,
  );
  const preview = await uploadCsv(api, fixture.cookie, [HEADER, ...lines].join("\n"));
  expect(preview.body.invalid).toBe(0);
  await request(api).post(`/api/uploads/${preview.body.id}/commit`).set("Cookie", fixture.cookie).expect(200);
}

const suite = browserSuite(loadBook);

describe("the analyst's screens in a real browser", () => {
  it.each([
    {
      screen: "the Backtest screen of a portfolio with six exceptions",
      then: "it shows the yellow zone by name",
      path: () => `/backtest/${fixture.portfolio.code}`,
      drawn: (page: Page) =>
        page
          .getByText(/yellow/i)
          .first()
          .waitFor({ timeout: 20_000 }),
      shot: "backtest-analyst",
    },
    {
      screen: "the Data screen",
      then: "the upload panel and the history are there",
      path: () => "/data",
      drawn: (page: Page) => page.getByRole("heading", { name: /upload history/i }).waitFor({ timeout: 15_000 }),
      shot: "data-analyst",
    },
  ])("when the analyst opens $screen, then $then, with no console errors", async ({ path, drawn, shot }) => {
    const { page, errors } = await pageSignedInAs(suite, fixture.analyst.email, path());
    await drawn(page);
    await page.waitForLoadState("networkidle");
    await expectAccessible(page, shot);
    await keepScreenshot(page, shot);
    expect(errors).toEqual([]);
    await page.close();
  });

  it("when the analyst uploads a file with a weekend day through the Data screen, then the error stands beside its cell and nothing can be committed; the corrected file commits, and the restated day keeps its earlier version", async () => {
    const { page, errors } = await pageSignedInAs(suite, fixture.analyst.email, `/data`);
    await page.getByRole("heading", { name: /upload history/i }).waitFor({ timeout: 15_000 });
    const code = fixture.portfolio.code;
    const next = weekdays(bookDates[bookDates.length - 1], 2)[1]; // the weekday after the book's last day
    const saturday = new Date(
      Date.parse(`${next}T00:00:00Z`) + ((6 - new Date(`${next}T00:00:00Z`).getUTCDay() + 7) % 7) * 86_400_000,
    )
      .toISOString()
      .slice(0, 10);
    const restated = `${code},${bookDates[10]},-77.5,-70.25,101`;
    const added = `${code},${next},-12,-11,99`;
    const file = (lines: string[], name: string) => ({
      name,
      mimeType: "text/csv",
      buffer: Buffer.from([HEADER, ...lines].join("\r\n") + "\r\n"),
    });

    await page
      .locator('input[type="file"]')
      .setInputFiles(file([restated, `${code},${saturday},-5,-4,99`, added], "with-weekend.csv"));
    await page
      .getByText(new RegExp(`${saturday} is a Saturday, not a business day`))
      .first()
      .waitFor({ timeout: 20_000 });
    expect(await page.getByRole("button", { name: /^Commit/ }).isDisabled()).toBe(true);
    await expectAccessible(page, "data-upload-refused");
    await keepScreenshot(page, "data-upload-refused");

    await page.locator('input[type="file"]').setInputFiles(file([restated, added], "corrected.csv"));
    const commit = page.getByRole("button", { name: "Commit 2 rows" });
    await commit.waitFor({ timeout: 20_000 });
    await commit.click();
    await page.getByText(/is committed: 1 new day written, 1 day restated/).waitFor({ timeout: 20_000 });
    await expectAccessible(page, "data-upload-committed");
    await keepScreenshot(page, "data-upload-committed");

    const versions = await ObservationModel.findAll({
      where: { portfolioId: fixture.portfolio.id, businessDate: bookDates[10] },
      order: [["version", "ASC"]],
    });
    expect(versions.map((v) => [v.version, v.isCurrent, v.actualPnl])).toEqual([
      [1, false, expect.any(Number)],
      [2, true, -77.5],
    ]);
    expect(await ObservationModel.count({ where: { portfolioId: fixture.portfolio.id, businessDate: next } })).toBe(1);
    expect(errors).toEqual([]);
    await page.close();
  });

  it("when treasury opens the Backtest address, then the page says it is not for their role and no figures are fetched", async () => {
    const treasury = await createTestUser("treasury");
    await sessionCookieFor(treasury.id);
    const page = await suite.context.newPage();
    const backtestCalls: string[] = [];
    page.on("request", (r) => {
      if (r.url().includes("/backtest")) backtestCalls.push(r.url());
    });
    await signInAs(page, suite.app.baseUrl, treasury.email);
    await page.goto(`${suite.app.baseUrl}/backtest/${fixture.portfolio.code}`);
    await page.getByText(/not available for your role/i).waitFor({ timeout: 15_000 });
    await expectAccessible(page, "backtest-treasury-refused");
    await keepScreenshot(page, "backtest-treasury-refused");
    expect(backtestCalls.filter((u) => u.includes("/api/"))).toEqual([]);
    await page.close();
  });
});
