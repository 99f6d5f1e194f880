import request from "supertest";
import { describe, expect, it } from "vitest";
import { FilingModel } from "../../server/models/filing";
import { SnapshotModel } from "../../server/models/snapshot";
import { createAssignedRegulator } from "../server/helpers";
import {
  approve,
  approvedQuarter,
  type Book,
  HEADER,
  signOffBook,
  snapshotApp,
  submit,
  uploadAndCommit,
} from "../server/snapshot-helpers";
import { expectAccessible } from "./axe";
import { browserSuite, keepScreenshot, pageSignedInAs } from "./browser";

let book: Book;
let originalId = 0;
let regulatorEmail = "";

/**
 * A Q3 2026 filed with the supervisor, then a day inside it restated (an upload commit): the
 * restatement flag that asks for an amendment. Made through the API.
 */
async function restatedFiledQuarter() {
  book = await signOffBook();
  await book.entity.update({ supervisorEmails: [`market-risk-${Date.now()}@bank-supervisor.test`] });
  const submitted = await approvedQuarter(book);
  await request(snapshotApp).post(`/api/snapshots/${submitted.id}/filings`).set("Cookie", book.croCookie).expect(201);
  originalId = submitted.id;
  const day = book.exceptionDays[4];
  await uploadAndCommit(book.cookie, [HEADER, book.row(day, book.dates.indexOf(day), 50)].join("\n"));
  const regulator = await createAssignedRegulator(book.entity.id);
  regulatorEmail = regulator.email;
}

const suite = browserSuite(restatedFiledQuarter);

describe("amending a filed quarter in a real browser", () => {
  it("when the analyst prepares the amendment and it is filed, then Quarter close and Filings show it linked, with no console errors", async () => {
    const { page, errors } = await pageSignedInAs(
      suite,
      book.analyst.email,
      `/quarters?entity=${book.entity.code}&snapshot=${originalId}`,
    );
    await page.getByRole("button", { name: "Prepare amendment" }).click({ timeout: 20_000 });
    await page.getByRole("button", { name: "Prepare the amendment" }).waitFor();
    await expectAccessible(page, "quarter-close-amendment-confirmation");
    await keepScreenshot(page, "quarter-close-amendment-confirmation");
    await page.getByRole("button", { name: "Prepare the amendment" }).click();
    await page.getByRole("table", { name: /Before and after: \d+ figures changed/ }).waitFor({ timeout: 20_000 });
    await page.getByText(`Amends #${originalId}`).first().waitFor();
    await page.waitForLoadState("networkidle");
    await expectAccessible(page, "quarter-close-amendment-draft");
    await keepScreenshot(page, "quarter-close-amendment-draft");
    const amendment = (await SnapshotModel.findOne({ where: { amendsId: originalId } }))!;
    expect(amendment.status).toBe("draft");
    await page.close();

    // Submitted, approved by the CRO and filed through the API, as the sign-off journeys do in the browser.
    await submit(amendment.id, book.cookie).expect(200);
    await approve(amendment.id, book.croCookie).expect(200);
    await request(snapshotApp).post(`/api/snapshots/${amendment.id}/filings`).set("Cookie", book.croCookie).expect(201);
    const filing = (await FilingModel.findOne({ where: { snapshotId: amendment.id } }))!;

    const { page: analyst } = await pageSignedInAs(
      suite,
      book.analyst.email,
      `/quarters?entity=${book.entity.code}&snapshot=${originalId}`,
      errors,
    );
    await analyst.getByRole("note", { name: "Restatement resolved" }).waitFor({ timeout: 20_000 });
    await analyst.waitForLoadState("networkidle");
    await expectAccessible(analyst, "quarter-close-restatement-resolved");
    await keepScreenshot(analyst, "quarter-close-restatement-resolved");
    await analyst.close();

    const { page: regulator } = await pageSignedInAs(suite, regulatorEmail, `/filings?filing=${filing.id}`, errors);
    await regulator.getByRole("region", { name: "Amendment of an earlier filing" }).waitFor({ timeout: 20_000 });
    await regulator.waitForLoadState("networkidle");
    await expectAccessible(regulator, "filings-amendment-regulator");
    await keepScreenshot(regulator, "filings-amendment-regulator");
    await regulator.close();
    expect(errors).toEqual([]);
  });
});
