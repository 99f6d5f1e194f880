import { describe, expect, it } from "vitest";
import { createTestUser } from "../server/helpers";
import { type Book, signOffBook } from "../server/snapshot-helpers";
import { expectAccessible } from "./axe";
import { browserSuite, keepScreenshot, pageSignedInAs } from "./browser";

let book: Book;
let adminEmail = "";

/** The EU book up to 30 September 2026 (no quarter signed off), an admin to propose and the book's CRO to decide. */
async function loadBook() {
  book = await signOffBook();
  adminEmail = (await createTestUser("admin")).email;
}

const suite = browserSuite(loadBook);

describe("governing the supervisory settings in a real browser", () => {
  it("when an admin proposes an addend (after a refused empty form) and a CRO approves it with the consequence stated, each state has no violation and no console error", async () => {
    const { page: admin, errors } = await pageSignedInAs(suite, adminEmail);
    await admin.getByRole("navigation", { name: "Main" }).getByRole("link", { name: "Supervisory settings" }).click();
    await admin.getByRole("heading", { name: /^Supervisory settings/ }).waitFor({ timeout: 15_000 });
    await admin.goto(`${suite.app.baseUrl}/settings?entity=${book.entity.code}`);
    const form = admin.getByRole("form", { name: "Propose a settings change" });
    await form.waitFor({ timeout: 15_000 });
    await expectAccessible(admin, "admin: Supervisory settings");

    await form.getByRole("button", { name: "Propose the change" }).click();
    await form.getByText("A date as YYYY-MM-DD").waitFor();
    await expectAccessible(admin, "admin: Supervisory settings, proposal refused with its errors");

    await form.getByLabel("Effective from").fill("2026-08-03");
    await form.getByLabel("Supervisor's decision reference").fill("SUP-2026-021");
    await form.getByLabel("Qualitative addend").fill("0.5");
    await form.getByRole("button", { name: "Propose the change" }).click();
    await admin.getByText(/Nothing changes until a chief risk officer approves it/).waitFor({ timeout: 15_000 });
    await expectAccessible(admin, "admin: Supervisory settings, a proposal waiting");
    expect(errors).toEqual([]);
    await admin.getByRole("button", { name: "Sign out" }).click();
    await admin.getByRole("button", { name: /^sign in$/i }).waitFor({ timeout: 15_000 });
    await admin.close();

    const { page: cro, errors: croErrors } = await pageSignedInAs(
      suite,
      book.cro.email,
      `/settings?entity=${book.entity.code}`,
    );
    const waiting = cro.getByRole("region", { name: "SUP-2026-021: from 2026-08-03" });
    await waiting.getByRole("button", { name: "Approve…" }).click();
    const confirm = waiting.getByRole("group", { name: "Confirm the approval" });
    await confirm
      .getByText(
        `From 2026-08-03 the multiplier of ${book.entity.code} will include a qualitative addend of 0.50 instead of 0.00.`,
        { exact: false },
      )
      .waitFor();
    await expectAccessible(cro, "cro: Supervisory settings, approval confirmation open");
    await keepScreenshot(cro, "settings-cro-confirmation");
    await confirm.getByRole("button", { name: "Approve the change" }).click();
    await waiting.waitFor({ state: "detached", timeout: 15_000 });
    await cro.getByText("No change waits for a decision.", { exact: false }).waitFor();
    await expectAccessible(cro, "cro: Supervisory settings, approved");
    await keepScreenshot(cro, "settings-cro-approved");
    expect(croErrors).toEqual([]);
    await cro.close();
  });
});
