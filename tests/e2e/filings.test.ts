import { describe, expect, it } from "vitest";
import { FilingModel } from "../../server/models/filing";
import { createAssignedRegulator } from "../server/helpers";
import { approvedBookFiledTo, type Book } from "../server/snapshot-helpers";
import { expectAccessible } from "./axe";
import { browserSuite, keepScreenshot, pageSignedInAs } from "./browser";

let book: Book;
let snapshotId = 0;
let regulatorEmail = "";

/** An approved Q3 2026 snapshot of an entity with a supervisor contact and an assigned regulator, made through the API. */
async function approvedQuarterWithRegulator() {
  ({ book, snapshotId } = await approvedBookFiledTo([`market-risk-${Date.now()}@bank-supervisor.test`]));
  const regulator = await createAssignedRegulator(book.entity.id);
  regulatorEmail = regulator.email;
}

const suite = browserSuite(approvedQuarterWithRegulator);

describe("filing a quarter in a real browser", () => {
  it("when the CRO files the approved quarter and the regulator acknowledges it, then both see it done, with no console errors", async () => {
    const { page: croPage, errors } = await pageSignedInAs(
      suite,
      book.cro.email,
      `/quarters?entity=${book.entity.code}&snapshot=${snapshotId}`,
    );
    await croPage.getByRole("button", { name: "File with the supervisor" }).click({ timeout: 20_000 });
    await croPage.getByRole("button", { name: "Send the pack" }).click();
    await croPage.getByRole("link", { name: /Open the filing on the Filings screen/ }).waitFor({ timeout: 20_000 });
    await croPage.waitForLoadState("networkidle");
    await expectAccessible(croPage, "quarter-close-cro-filed");
    await keepScreenshot(croPage, "quarter-close-cro-filed");
    const filing = await FilingModel.findOne({ where: { snapshotId } });
    expect(filing).not.toBeNull();
    await croPage.close();

    const { page: regulatorPage } = await pageSignedInAs(
      suite,
      regulatorEmail,
      `/filings?filing=${filing!.id}`,
      errors,
    );
    await regulatorPage.getByRole("button", { name: "Acknowledge receipt" }).click({ timeout: 20_000 });
    await regulatorPage
      .getByText(/Acknowledged by/)
      .first()
      .waitFor({ timeout: 15_000 });
    await regulatorPage.waitForLoadState("networkidle");
    await expectAccessible(regulatorPage, "filings-regulator-acknowledged");
    await keepScreenshot(regulatorPage, "filings-regulator-acknowledged");
    expect((await FilingModel.findByPk(filing!.id))!.acknowledgedAt).not.toBeNull();
    expect(errors).toEqual([]);
    await regulatorPage.close();
  });
});
