import { describe, expect, it } from "vitest";
import { SnapshotModel } from "../../server/models/snapshot";
import { type Book, signOffBook } from "../server/snapshot-helpers";
import { expectAccessible } from "./axe";
import { browserSuite, keepScreenshot, pageSignedInAs } from "./browser";

let book: Book;

/** The shared EU book up to 30 September 2026 with five exceptions in the last 250 days (tests/server/snapshot-helpers.ts). */
async function loadBook() {
  book = await signOffBook();
}

const suite = browserSuite(loadBook);

describe("closing a quarter in a real browser", () => {
  it("when the analyst prepares and submits Q3 2026 and the CRO approves it, then the snapshot is sealed, its hash verifies, and there were no console errors", async () => {
    const { page: analystPage, errors } = await pageSignedInAs(
      suite,
      book.analyst.email,
      `/quarters?entity=${book.entity.code}`,
    );
    await analystPage.getByRole("button", { name: "Prepare the snapshot" }).click();
    await analystPage.getByRole("button", { name: "Submit for sign-off" }).waitFor({ timeout: 20_000 });
    await analystPage.getByText("Yellow").first().waitFor();
    // The return data of the draft, with the values the product does not hold entered and saved.
    await analystPage.getByLabel(/Incremental default and migration risk: last measure/).fill("1200");
    await analystPage.getByRole("button", { name: "Save return values" }).click();
    await analystPage.getByText("Return values saved.").waitFor();
    await expectAccessible(analystPage, "quarter-close-analyst-return-values-saved");
    await keepScreenshot(analystPage, "quarter-close-analyst-return-values");
    await analystPage.getByRole("button", { name: "Submit for sign-off" }).click();
    await analystPage
      .getByText(/Submitted for sign-off/)
      .first()
      .waitFor({ timeout: 15_000 });
    await analystPage.waitForLoadState("networkidle");
    await expectAccessible(analystPage, "quarter-close-analyst-submitted");
    await keepScreenshot(analystPage, "quarter-close-analyst-submitted");
    const row = await SnapshotModel.findOne({ where: { entityId: book.entity.id, quarterEnd: "2026-09-30" } });
    expect(row).toMatchObject({ status: "submitted", counted: 5, zone: "yellow" });
    expect(JSON.parse(row!.figuresJson).analystInputs).toMatchObject({ ircLatest: 1200 });
    await analystPage.close();

    // The CRO signs out the analyst's work (a fresh context would do as well; sign-in replaces the cookie).
    const { page: croPage } = await pageSignedInAs(
      suite,
      book.cro.email,
      `/quarters?entity=${book.entity.code}&snapshot=${row!.id}`,
      errors,
    );
    await croPage.getByRole("button", { name: "Approve and seal" }).click();
    await croPage.getByRole("button", { name: "Approve and seal Q3 2026" }).click();
    await croPage.getByRole("button", { name: "Verify the hash" }).click({ timeout: 15_000 });
    await croPage.getByText("Valid: the figures are as signed off.").waitFor({ timeout: 15_000 });
    await croPage.waitForLoadState("networkidle");
    await expectAccessible(croPage, "quarter-close-cro-approved");
    await keepScreenshot(croPage, "quarter-close-cro-approved");
    expect((await SnapshotModel.findByPk(row!.id))!.hash).toMatch(/^[0-9a-f]{64}$/);
    expect(errors).toEqual([]);
    await croPage.close();
  });
});
