import request from "supertest";
import { describe, expect, it } from "vitest";
import { createApp } from "../../server/app";
import { SnapshotModel } from "../../server/models/snapshot";
import { createTestUser } from "../server/helpers";
import { ingestFixture, uploadCsv } from "../server/ingest-helpers";
import { browserSuite, keepScreenshot, signInAs, watchConsole } from "./browser";

let fixture: Awaited<ReturnType<typeof ingestFixture>>;
let croEmail = "";

/** 300 business days up to 30 September 2026 with five exceptions in the last 250, brought in through the API. */
async function loadBook() {
  fixture = await ingestFixture();
  croEmail = (await createTestUser("cro")).email;
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


describe("closing a quarter in a real browser", () => {
  it("when the analyst prepares and submits Q3 2026 and the CRO approves it, then the snapshot is sealed, its hash verifies, and there were no console errors", async () => {
    const analystPage = await suite.context.newPage();
    const errors = watchConsole(analystPage);
    await signInAs(analystPage, suite.app.baseUrl, fixture.analyst.email);
    await analystPage.goto(`${suite.app.baseUrl}/quarters?entity=${fixture.entity.code}`);
    await analystPage.getByRole("button", { name: "Prepare the snapshot" }).click();
    await analystPage.getByRole("button", { name: "Submit for sign-off" }).waitFor({ timeout: 20_000 });
    await analystPage.getByText("Yellow").first().waitFor();
    await analystPage.getByRole("button", { name: "Submit for sign-off" }).click();
    await analystPage.getByText(/Submitted for sign-off/).first().waitFor({ timeout: 15_000 });
    await analystPage.waitForLoadState("networkidle");
    await keepScreenshot(analystPage, "quarter-close-analyst-submitted");
    const row = await SnapshotModel.findOne({ where: { entityId: fixture.entity.id, quarterEnd: "2026-09-30" } });
    expect(row).toMatchObject({ status: "submitted", counted: 5, zone: "yellow" });
    await analystPage.close();

    // The CRO signs out the analyst's work (a fresh context would do as well; sign-in replaces the cookie).
    const croPage = await suite.context.newPage();
    errors.push(...watchConsole(croPage));
    await signInAs(croPage, suite.app.baseUrl, croEmail);
    await croPage.goto(`${suite.app.baseUrl}/quarters?entity=${fixture.entity.code}&snapshot=${row!.id}`);
    await croPage.getByRole("button", { name: "Approve and seal" }).click();
    await croPage.getByRole("button", { name: "Verify the hash" }).click({ timeout: 15_000 });
    await croPage.getByText("Valid: the figures are as signed off.").waitFor({ timeout: 15_000 });
    await croPage.waitForLoadState("networkidle");
    await keepScreenshot(croPage, "quarter-close-cro-approved");
    expect((await SnapshotModel.findByPk(row!.id))!.hash).toMatch(/^[0-9a-f]{64}$/);
    expect(errors).toEqual([]);
    await croPage.close();
  });
});
