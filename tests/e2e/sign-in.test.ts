import { describe, expect, it } from "vitest";
import { existsSync, statSync } from "node:fs";
import { createTestUser, TEST_PASSWORD } from "../server/helpers";
import { expectAccessible } from "./axe";
import { browserSuite, keepScreenshot, watchConsole } from "./browser";

const suite = browserSuite();

describe("signing in through the real page", () => {
  it("when an analyst signs in, then the Overview appears with no console errors, and a screenshot is kept", async () => {
    const user = await createTestUser("analyst", { name: "Edda Journey" });
    const page = await suite.context.newPage();
    const errors = watchConsole(page);

    await page.goto(`${suite.app.baseUrl}/`);
    await page.waitForURL(/\/sign-in/);
    await page.getByLabel(/e-mail/i).fill(user.email);
    await page.getByLabel(/password/i).fill(TEST_PASSWORD);
    await page.getByRole("button", { name: /sign in/i }).click();

    await page.getByRole("heading", { name: /overview/i }).waitFor({ timeout: 15_000 });
    expect(page.url()).toBe(`${suite.app.baseUrl}/`);
    await expect(page.getByText("Edda Journey").first().isVisible()).resolves.toBe(true);
    // Cookies only: nothing of the session in browser storage.
    const stored = await page.evaluate(
      () => JSON.stringify({ ...localStorage }) + JSON.stringify({ ...sessionStorage }),
    );
    expect(stored).not.toMatch(/eyJ/);

    await expectAccessible(page, "overview-analyst");
    const shot = await keepScreenshot(page, "overview-analyst");
    expect(existsSync(shot) && statSync(shot).size > 10_000).toBe(true);
    expect(errors).toEqual([]);
    await page.close();
  });

  it("when the password is wrong, then the page says so and stays on sign-in", async () => {
    const user = await createTestUser("cro");
    const page = await suite.context.newPage();
    const errors = watchConsole(page);
    await page.goto(`${suite.app.baseUrl}/sign-in`);
    await page.getByLabel(/e-mail/i).fill(user.email);
    await page.getByLabel(/password/i).fill("not the password");
    await page.getByRole("button", { name: /sign in/i }).click();
    await page.getByText(/not correct/i).waitFor({ timeout: 10_000 });
    expect(page.url()).toContain("/sign-in");
    await expectAccessible(page, "sign-in-wrong-password");
    await keepScreenshot(page, "sign-in-wrong-password");
    // The browser logs the 401 response itself; nothing else may fail.
    expect(errors.filter((e) => !/401/.test(e))).toEqual([]);
    await page.close();
  });
});
