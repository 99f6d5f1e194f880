import { describe, expect, it } from "vitest";
import type { Page } from "playwright-core";
import { SnapshotModel } from "../../server/models/snapshot";
import { TEST_PASSWORD } from "../server/helpers";
import { signOffBook, type Book } from "../server/snapshot-helpers";
import { expectAccessible } from "./axe";
import { browserSuite, keepScreenshot, watchConsole } from "./browser";
import { expectVisibleFocus, focusState, tabTo } from "./keyboard";

let book: Book;

/** The shared EU book up to 30 September 2026 with five exceptions in the last 250 days (tests/server/snapshot-helpers.ts). */
const suite = browserSuite(async () => {
  book = await signOffBook();
});

/** Signs in with the keyboard alone: the e-mail field has the focus on arrival, Tab, Enter. */
async function signInByKeyboard(page: Page, email: string) {
  await page.goto(`${suite.app.baseUrl}/sign-in`);
  await page.getByRole("button", { name: /^sign in$/i }).waitFor();
  expect((await expectVisibleFocus(page, "sign-in opens")).name).toMatch(/E-mail/);
  await page.keyboard.type(email);
  await tabTo(page, /Password/);
  await page.keyboard.type(TEST_PASSWORD);
  await page.keyboard.press("Enter");
  await page.getByRole("heading", { name: /overview/i }).waitFor({ timeout: 15_000 });
}

describe("closing a quarter with the keyboard alone", () => {
  it("when the analyst prepares and submits Q3 2026 and the CRO approves it with Tab, Enter, Space and Escape only, then the focus is visible at every stop, never falls to <body>, and comes back to the control that opened the filing confirmation", async () => {
    const analyst = await suite.context.newPage();
    const errors = watchConsole(analyst);
    await signInByKeyboard(analyst, book.analyst.email);
    // The address bar is the keyboard's too: the entity of this book, among the test database's others.
    await analyst.goto(`${suite.app.baseUrl}/quarters?entity=${book.entity.code}`);
    await analyst.getByRole("button", { name: "Prepare the snapshot" }).waitFor({ timeout: 20_000 });

    await tabTo(analyst, /^Prepare the snapshot$/);
    await analyst.keyboard.press("Enter");
    await analyst.getByRole("button", { name: "Submit for sign-off" }).waitFor({ timeout: 20_000 });
    // The button went busy (and so lost the focus) while the figures were computed: the outcome takes it.
    const prepared = await expectVisibleFocus(analyst, "after preparing");
    expect(prepared.name).toMatch(/Q3 2026 .* is prepared as a draft/);

    await tabTo(analyst, /Comment for the sign-off/);
    await analyst.keyboard.type("Five exceptions, each explained in its review.");
    await tabTo(analyst, /^Submit for sign-off$/);
    await analyst.keyboard.press("Space");
    await analyst
      .getByText(/is submitted for sign-off/)
      .first()
      .waitFor({ timeout: 15_000 });
    // The form is gone with the button that had the focus: the outcome has it now.
    expect((await expectVisibleFocus(analyst, "after submitting")).name).toMatch(/is submitted for sign-off/);
    await expectAccessible(analyst, "Quarter close, submitted by keyboard");
    const row = await SnapshotModel.findOne({ where: { entityId: book.entity.id, quarterEnd: "2026-09-30" } });
    expect(row).toMatchObject({ status: "submitted", counted: 5, zone: "yellow" });
    await analyst.close();

    const cro = await suite.context.newPage();
    errors.push(...watchConsole(cro));
    await signInByKeyboard(cro, book.cro.email);
    await cro.goto(`${suite.app.baseUrl}/quarters?entity=${book.entity.code}&snapshot=${row!.id}`);
    await cro.getByRole("button", { name: "Approve and seal" }).waitFor({ timeout: 20_000 });
    await tabTo(cro, /^Approve and seal$/);
    await cro.keyboard.press("Enter");
    // The confirmation says what sealing does and takes the focus; Enter on it approves.
    expect((await expectVisibleFocus(cro, "approval confirmation open")).name).toBe("Approve and seal Q3 2026");
    await cro.keyboard.press("Enter");
    await cro
      .getByText(/is approved and sealed/)
      .first()
      .waitFor({ timeout: 15_000 });
    expect((await expectVisibleFocus(cro, "after approving")).name).toMatch(/is approved and sealed with hash/);

    // The filing confirmation opens in place of its button, takes the focus, and Escape gives it back.
    await tabTo(cro, /^File with the supervisor$/);
    await cro.keyboard.press("Enter");
    expect((await expectVisibleFocus(cro, "confirmation open")).name).toBe("Send the pack");
    await expectAccessible(cro, "Quarter close, filing confirmation open by keyboard");
    await keepScreenshot(cro, "keyboard-filing-confirmation");
    await cro.keyboard.press("Escape");
    await cro.getByRole("button", { name: "Send the pack" }).waitFor({ state: "detached" });
    expect((await expectVisibleFocus(cro, "confirmation closed with Escape")).name).toBe("File with the supervisor");
    // Shift+Tab walks back from there with the focus still shown.
    await cro.keyboard.press("Shift+Tab");
    const back = await expectVisibleFocus(cro, "Shift+Tab from the filing button");
    expect(back.name).not.toBe("File with the supervisor");
    expect((await focusState(cro)).onBody).toBe(false);

    const sealed = (await SnapshotModel.findByPk(row!.id))!;
    expect(sealed.status).toBe("approved");
    expect(sealed.hash).toMatch(/^[0-9a-f]{64}$/);
    expect(errors).toEqual([]);
    await cro.close();
  });
});
