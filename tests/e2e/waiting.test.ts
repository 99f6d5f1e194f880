import { describe, expect, it } from "vitest";
import { SnapshotModel } from "../../server/models/snapshot";
import { type Book, prepare, preparedAndSubmitted, Q2, signOffBook } from "../server/snapshot-helpers";
import { expectAccessible } from "./axe";
import { browserSuite, keepScreenshot, pageSignedInAs } from "./browser";

/**
 * The EU book up to 30 September 2026 (tests/server/snapshot-helpers.ts): Q3 2026 is a draft with the
 * analysts, the OLDER Q2 2026 is submitted. The Overview shows the newest quarter only, so the CRO
 * finds Q2 through "Waiting for me".
 */
let book: Book;
let q2 = 0;
const suite = browserSuite(async () => {
  book = await signOffBook();
  q2 = (await preparedAndSubmitted(book, Q2)).id;
  expect((await prepare(book)).status).toBe(201);
});

describe("Waiting for me in a real browser", () => {
  it("when an older quarter is submitted, then the CRO finds it under Waiting for me, approves it after the confirmation, and it leaves the list", async () => {
    const { page, errors } = await pageSignedInAs(suite, book.cro.email);
    const nav = page.getByRole("navigation", { name: "Main" });
    // The count beside the link: at least this entity's submitted quarter (other journeys' items may be there too).
    await nav.getByRole("link", { name: /Waiting for me\s*\d+\s*items?/ }).click();
    await page.getByRole("heading", { name: "Waiting for me", level: 1 }).waitFor();
    const signOff = page.getByRole("region", { name: "Quarters to sign off" });
    const item = signOff.getByRole("link", {
      name: new RegExp(`^Q2 2026 of ${book.entity.code} submitted for sign-off`),
    });
    await item.waitFor();
    await page.waitForLoadState("networkidle");
    await expectAccessible(page, "cro: Waiting for me");
    await keepScreenshot(page, "waiting-cro-list");

    await item.click();
    await page.waitForURL(new RegExp(`/quarters\\?entity=${book.entity.code}&snapshot=${q2}$`));
    await page.getByRole("button", { name: "Approve and seal" }).click();
    const confirmation = page.getByRole("group", { name: "Approve and seal Q2 2026" });
    await confirmation.waitFor();
    expect(await confirmation.textContent()).toMatch(/never change again\. This cannot be undone/);
    // Nothing is written while the confirmation is open.
    expect((await SnapshotModel.findByPk(q2))!.status).toBe("submitted");
    await expectAccessible(page, "cro: Quarter close, approval confirmation open");
    await keepScreenshot(page, "waiting-cro-approve-confirmation");
    await confirmation.getByRole("button", { name: "Approve and seal Q2 2026" }).click();
    await page
      .getByText(/Q2 2026 is approved and sealed/)
      .first()
      .waitFor({ timeout: 15_000 });
    const sealed = (await SnapshotModel.findByPk(q2))!;
    expect(sealed.status).toBe("approved");
    expect(sealed.hash).toMatch(/^[0-9a-f]{64}$/);

    // Back on the list it now waits to be filed, not signed off.
    await nav.getByRole("link", { name: /Waiting for me/ }).click();
    await page
      .getByRole("region", { name: "Approved quarters to file" })
      .getByRole("link", { name: `Q2 2026 of ${book.entity.code} approved, not yet filed with the supervisor` })
      .waitFor();
    expect(await signOff.getByRole("link", { name: new RegExp(`^Q2 2026 of ${book.entity.code}`) }).count()).toBe(0);
    await keepScreenshot(page, "waiting-cro-after-approval");
    expect(errors).toEqual([]);
    await page.close();
  }, 180_000);

  it("when the analyst opens Waiting for me, then the exceptions to explain and the ended quarters show, and the screen passes axe", async () => {
    const { page, errors } = await pageSignedInAs(suite, book.analyst.email, `/waiting`);
    const exceptions = page.getByRole("region", { name: "Exceptions to explain" });
    await exceptions
      .getByRole("link", {
        name: `Exception on ${book.exceptionDays[0]} in ${book.portfolio.code} has no explanation yet`,
      })
      .waitFor();
    // Q2 and Q3 have snapshots; Q4 2025 and Q1 2026 ended inside the data without one.
    await page
      .getByRole("region", { name: "Ended quarters without a snapshot" })
      .getByRole("link", { name: `Q1 2026 of ${book.entity.code} has ended and has no snapshot yet` })
      .waitFor();
    await page.waitForLoadState("networkidle");
    await expectAccessible(page, "analyst: Waiting for me");
    await keepScreenshot(page, "waiting-analyst-list");
    expect(errors).toEqual([]);
    await page.close();
  }, 120_000);
});
