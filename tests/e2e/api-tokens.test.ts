import { describe, expect, it } from "vitest";
import { ApiTokenModel } from "../../server/models/api-token";
import { createTestEntity, createTestUser } from "../server/helpers";
import { expectAccessible } from "./axe";
import { browserSuite, keepScreenshot, pageSignedInAs } from "./browser";

let treasuryEmail = "";

const suite = browserSuite(async () => {
  await createTestEntity();
  treasuryEmail = (await createTestUser("treasury")).email;
});

describe("a treasurer's API token in a real browser", () => {
  it("when treasury creates a token on the API tokens screen, then the shown secret reads the capital history from a script, and after revoking it on screen the script is refused", async () => {
    const { page, errors } = await pageSignedInAs(suite, treasuryEmail);
    await page.getByRole("navigation", { name: "Main" }).getByRole("link", { name: "API tokens" }).click();
    await page.getByRole("heading", { name: "API tokens" }).waitFor({ timeout: 15_000 });

    await page.getByLabel("Name").fill("Quarter-end capital pull");
    await page.getByLabel("Valid for (days)").fill("30");
    await page.getByRole("button", { name: "Create token" }).click();
    const secret = (await page.getByTestId("new-token-secret").textContent({ timeout: 15_000 }))!.trim();
    expect(secret).toMatch(/^qmk_[A-Za-z0-9_-]{43}$/);
    const command = (await page.getByTestId("new-token-curl").textContent())!;
    const url = /(http:\/\/\S+\/capital\/history)/.exec(command)![1];
    expect(url.startsWith(`${suite.app.baseUrl}/api/entities/`)).toBe(true);
    await page.waitForLoadState("networkidle");
    await expectAccessible(page, "api-tokens-treasury-created");
    await keepScreenshot(page, "api-tokens-treasury-created");

    // What the curl example does, from outside the browser: no cookie, no Origin.
    const read = await fetch(url, { headers: { Authorization: `Bearer ${secret}` } });
    expect(read.status).toBe(200);
    expect(Array.isArray(await read.json())).toBe(true);

    await page.getByRole("button", { name: "I have stored it" }).click();
    await page.getByRole("button", { name: "Revoke Quarter-end capital pull" }).click();
    await page.getByRole("button", { name: "Revoke token" }).click();
    await page.getByText("“Quarter-end capital pull” is revoked").waitFor({ timeout: 15_000 });
    await expectAccessible(page, "api-tokens-treasury-revoked");
    await keepScreenshot(page, "api-tokens-treasury-revoked");

    expect((await fetch(url, { headers: { Authorization: `Bearer ${secret}` } })).status).toBe(401);
    const row = await ApiTokenModel.findOne({ where: { name: "Quarter-end capital pull" }, order: [["id", "DESC"]] });
    expect(row!.revokedAt).not.toBeNull();
    expect(row!.lastUsedAt).not.toBeNull();
    expect(errors).toEqual([]);
    await page.close();
  });
});
