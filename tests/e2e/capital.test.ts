import request from "supertest";
import { describe, expect, it } from "vitest";
import { createApp } from "../../server/app";
import { createTestUser } from "../server/helpers";
import { ingestFixture, uploadCsv } from "../server/ingest-helpers";
import { browserSuite, keepScreenshot, signInAs, watchConsole } from "./browser";

let fixture: Awaited<ReturnType<typeof ingestFixture>>;
let treasuryEmail = "";

/** 300 business days up to 30 September 2026 with five exceptions in the last 250 (yellow), VaR and stressed VaR. */
async function loadBook() {
  fixture = await ingestFixture();
  treasuryEmail = (await createTestUser("treasury")).email;
  const dates: string[] = [];
  for (const d = new Date("2026-09-30T00:00:00Z"); dates.length < 300; d.setUTCDate(d.getUTCDate() - 1)) {
    if (d.getUTCDay() !== 0 && d.getUTCDay() !== 6) dates.unshift(d.toISOString().slice(0, 10));
  }
  const exceptionAt = new Set([80, 140, 200, 250, 290]);
  const lines = dates.map((d, i) => `${fixture.portfolio.code},${d},${exceptionAt.has(i) ? -160 : -40},${exceptionAt.has(i) ? -150 : -30},${100 + (i % 3)},240`);
  const api = createApp();
  const preview = await uploadCsv(api, fixture.cookie, ["portfolio,date,actual_pnl,hypothetical_pnl,var_99,svar_99", ...lines].join("\n"));
  expect(preview.body.invalid).toBe(0);
  await request(api).post(`/api/uploads/${preview.body.id}/commit`).set("Cookie", fixture.cookie).expect(200);
}

const suite = browserSuite(loadBook);

describe("planning capital in a real browser", () => {
  it("when treasury opens Capital and supposes five more exceptions, then the scenario is red with multiplier 4.00, and there were no console errors", async () => {
    const page = await suite.context.newPage();
    const errors = watchConsole(page);
    await signInAs(page, suite.app.baseUrl, treasuryEmail);
    await page.goto(`${suite.app.baseUrl}/capital?entity=${fixture.entity.code}`);
    await page.getByText(/One more exception today would raise the capital requirement by/).waitFor({ timeout: 20_000 });
    const form = page.getByRole("form", { name: "What-if scenario" });
    await form.getByLabel(/Extra exceptions/).fill("5");
    await form.getByRole("button").click();
    await page.getByText("Red").first().waitFor({ timeout: 15_000 });
    await page.getByText("4.00").first().waitFor();
    await page.waitForLoadState("networkidle");
    await keepScreenshot(page, "capital-treasury-what-if");
    expect(errors).toEqual([]);
    await page.close();
  });
});
