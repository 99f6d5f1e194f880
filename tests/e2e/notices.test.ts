import { readdirSync, readFileSync } from "node:fs";
import path from "node:path";
import request from "supertest";
import { simpleParser } from "mailparser";
import { describe, expect, it } from "vitest";
import { OvershootingNoticeModel } from "../../server/models/overshooting-notice";
import { createTestUser, sessionCookieFor, testApp, unique } from "../server/helpers";
import { csvFor, ingestFixture, uploadCsv, weekdays } from "../server/ingest-helpers";
import { expectAccessible } from "./axe";
import { browserSuite, keepScreenshot, pageSignedInAs } from "./browser";

/**
 * An EU book whose committed upload holds an overshooting on its last day: the commit opens the
 * notice (docs/rules.md#overshooting-notice); the analyst drafts it and the CRO sends it in the browser.
 */
let fx: Awaited<ReturnType<typeof ingestFixture>>;
let cro: Awaited<ReturnType<typeof createTestUser>>;
let day = "";
const supervisor = `supervisor-${unique()}@authority.test`;
const suite = browserSuite(async () => {
  fx = await ingestFixture();
  await fx.entity.update({
    name: "Notice Test Bank",
    supervisorName: "Test Authority",
    supervisorEmails: [supervisor],
  });
  cro = await createTestUser("cro", { name: "Cora Vance" });
  const today = new Date().toISOString().slice(0, 10);
  const dates = weekdays(new Date(Date.now() - 50 * 86_400_000).toISOString().slice(0, 10), 60)
    .filter((d) => d < today)
    .slice(-30);
  day = dates[29];
  const app = testApp();
  const preview = await uploadCsv(
    app,
    fx.cookie,
    csvFor(fx.portfolio.code, dates, (i) => (i === 29 ? "-1250.50,-900,1000" : "-100,-90,1000")),
  );
  expect(preview.status).toBe(201);
  const commit = await request(app).post(`/api/uploads/${preview.body.id}/commit`).set("Cookie", fx.cookie);
  expect(commit.status).toBe(200);
  expect(await sessionCookieFor(cro.id)).toBeTruthy();
});

describe("Overshooting notices in a real browser", () => {
  it("when an EU upload reveals an overshooting, then the analyst drafts its notice, the CRO sends it after a confirmation listing the supervisor contacts, and it shows as sent", async () => {
    const notice = await OvershootingNoticeModel.findOne({ where: { portfolioId: fx.portfolio.id } });
    expect(notice?.status).toBe("open");

    // The analyst finds it under Waiting for me and drafts the cause.
    const { page: analystPage, errors: analystErrors } = await pageSignedInAs(suite, fx.analyst.email, `/waiting`);
    const toDraft = analystPage
      .getByRole("region", { name: "Overshooting notices to draft" })
      .getByRole("link", { name: new RegExp(`overshooting notice of ${fx.entity.code} for ${day}`, "i") });
    await toDraft.waitFor();
    await toDraft.click();
    await analystPage.waitForURL(new RegExp(`/notices\\?entity=${fx.entity.code}&notice=${notice!.id}$`));
    await analystPage.getByRole("heading", { name: `Overshooting of ${fx.portfolio.code} on ${day}` }).waitFor();
    await expect.poll(() => analystPage.getByTestId("notice-standing").textContent()).toMatch(/^To draft, due /);
    await analystPage.waitForLoadState("networkidle");
    await expectAccessible(analystPage, "analyst: Notices, to draft");
    await keepScreenshot(analystPage, "notices-analyst-draft");
    await analystPage.getByLabel("Cause so far").fill("A sharp move in EUR swap rates after the rate decision.");
    await analystPage.getByRole("button", { name: "Save the draft" }).click();
    await analystPage.getByText("Draft saved. The chief risk officer can now send it.").waitFor();
    expect((await OvershootingNoticeModel.findByPk(notice!.id))?.draftedBy).toBe(fx.analyst.id);
    expect(analystErrors).toEqual([]);
    await analystPage.close();

    // The CRO opens Notices from the navigation, asks to send, sees the recipients, and confirms.
    const { page, errors } = await pageSignedInAs(suite, cro.email);
    await page.getByRole("navigation", { name: "Main" }).getByRole("link", { name: "Notices" }).click();
    await page.getByLabel("Entity", { exact: true }).selectOption(fx.entity.code);
    await page.getByRole("link", { name: day }).click();
    await page.getByRole("heading", { name: `Overshooting of ${fx.portfolio.code} on ${day}` }).waitFor();
    await page.getByRole("button", { name: "Send to the supervisor…" }).click();
    const confirmation = page.getByRole("group", { name: "Confirm sending the notice" });
    await confirmation.waitFor();
    expect(await confirmation.getByRole("list", { name: "Recipients" }).textContent()).toBe(supervisor);
    // Nothing is sent while the confirmation is open.
    expect((await OvershootingNoticeModel.findByPk(notice!.id))?.status).toBe("open");
    await expectAccessible(page, "cro: Notices, send confirmation open");
    await keepScreenshot(page, "notices-cro-send-confirmation");
    await confirmation.getByRole("button", { name: "Send the notice" }).click();
    await page.getByText(`Sent to ${supervisor}.`).waitFor({ timeout: 15_000 });
    await expect.poll(() => page.getByTestId("notice-standing").textContent()).toMatch(/^Sent .* by Cora Vance/);
    await expect
      .poll(() => page.getByTestId(`notice-standing-${notice!.id}`).textContent())
      .toMatch(/^Sent .* by Cora Vance/);
    const sent = (await OvershootingNoticeModel.findByPk(notice!.id))!;
    expect(sent.status).toBe("sent");
    expect(sent.sentBy).toBe(cro.id);
    await page.getByText("Download the notice as sent (PDF)").waitFor();
    await expectAccessible(page, "cro: Notices, sent");
    await keepScreenshot(page, "notices-cro-sent");

    // The supervisor's copy is in the sink, with the PDF.
    const dir = process.env.MAIL_SINK_DIR!;
    const mails = [];
    for (const f of readdirSync(dir).filter((x) => x.endsWith(".eml"))) {
      const raw = readFileSync(path.join(dir, f));
      if (raw.includes(supervisor)) mails.push(await simpleParser(raw));
    }
    expect(mails).toHaveLength(1);
    expect(mails[0].attachments.map((a) => a.contentType)).toEqual(["application/pdf"]);
    expect(errors).toEqual([]);
    await page.close();
  }, 180_000);
});
