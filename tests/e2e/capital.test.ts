import { describe, expect, it } from "vitest";
import { createTestUser } from "../server/helpers";
import { approve, type Book, preparedAndSubmitted, signOffBook } from "../server/snapshot-helpers";
import { expectAccessible } from "./axe";
import { browserSuite, keepScreenshot, pageSignedInAs } from "./browser";

let book: Book;
let treasuryEmail = "";

/**
 * The shared EU book up to 30 September 2026 with five exceptions in the last 250 days (yellow), VaR and stressed
 * VaR, and Q3 2026 approved: treasury plans from the latest approved determination only.
 */
async function loadBook() {
  book = await signOffBook();
  const submitted = await preparedAndSubmitted(book);
  const approved = await approve(submitted.id, book.croCookie);
  expect(approved.status, JSON.stringify(approved.body)).toBe(200);
  treasuryEmail = (await createTestUser("treasury")).email;
}

const suite = browserSuite(loadBook);

describe("planning capital in a real browser", () => {
  it("when treasury opens Capital and supposes five more exceptions, then the scenario is red with multiplier 4.00 (ten exceptions: BCBS 1996 Table 2), and there were no console errors", async () => {
    const { page, errors } = await pageSignedInAs(suite, treasuryEmail, `/capital?entity=${book.entity.code}`);
    await page.getByText(/One more exception would raise the capital requirement by/).waitFor({ timeout: 20_000 });
    const form = page.getByRole("form", { name: "What-if scenario" });
    await form.getByLabel(/Extra exceptions/).fill("5");
    await form.getByRole("button").click();
    await page.getByText("Red").first().waitFor({ timeout: 15_000 });
    await page.getByText("4.00").first().waitFor();
    await page.waitForLoadState("networkidle");
    await expectAccessible(page, "capital-treasury-what-if");
    await keepScreenshot(page, "capital-treasury-what-if");
    expect(errors).toEqual([]);
    await page.close();
  });
});
