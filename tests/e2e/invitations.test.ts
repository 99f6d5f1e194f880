import { describe, expect, it } from "vitest";
import { UserModel } from "../../server/models/user";
import { createTestEntity, createTestUser, unique } from "../server/helpers";
import { latestLinkTokenFor } from "../server/mail-helpers";
import { browserSuite, keepScreenshot, signInAs, watchConsole } from "./browser";

const STRONG = "lantern-quarry-violet-58"; // zxcvbn-ts score 4
let adminA = "";
let adminB = "";

const suite = browserSuite(async () => {
  await createTestEntity();
  adminA = (await createTestUser("admin", { name: "Ada First" })).email;
  adminB = (await createTestUser("admin", { name: "Bea Second" })).email;
});

describe("separation of duties in a real browser", () => {
  it("when an admin invites an analyst, then the invitee sets a password from the e-mailed link and signs in; a CRO grant then needs a second admin", async () => {
    const page = await suite.context.newPage();
    const errors = watchConsole(page);
    const email = `invitee-${unique()}@larkspur.test`;

    // Admin A invites: name, e-mail and role; no password anywhere.
    await signInAs(page, suite.app.baseUrl, adminA);
    await page.goto(`${suite.app.baseUrl}/admin/users`);
    await page.getByRole("heading", { name: "Invite a user" }).waitFor({ timeout: 15_000 });
    await page.getByLabel("Name").fill("Nadia Fern");
    await page.getByLabel("E-mail").fill(email);
    await page.getByRole("button", { name: "Send invitation" }).click();
    await page.getByText(`Invitation sent to ${email}`).waitFor({ timeout: 15_000 });
    expect(await page.locator("input[type=password]").count()).toBe(0);
    await keepScreenshot(page, "users-invitation-sent");
    await page.getByRole("button", { name: "Sign out" }).click();
    await page.waitForURL(/\/sign-in/);

    // The invitee opens the link from the mail sink (on this server's address) and chooses a password.
    const token = await latestLinkTokenFor(email);
    await page.goto(`${suite.app.baseUrl}/set-password#${token}`);
    await page.getByRole("heading", { name: "Welcome, Nadia Fern" }).waitFor({ timeout: 15_000 });
    await page.getByLabel("New password", { exact: true }).fill("123456789012");
    await page.getByText("This is a commonly used password.", { exact: false }).waitFor({ timeout: 30_000 });
    await page.getByLabel("New password", { exact: true }).fill(STRONG);
    await page.getByLabel("Repeat the new password").fill(STRONG);
    await page.getByText("Strong enough.").waitFor({ timeout: 30_000 });
    await keepScreenshot(page, "set-password-invitee");
    await page.getByRole("button", { name: "Set password and sign in" }).click();
    await page.getByRole("heading", { name: /overview/i }).waitFor({ timeout: 15_000 });
    await page.getByRole("button", { name: "Sign out" }).click();
    await page.waitForURL(/\/sign-in/);
    await signInAs(page, suite.app.baseUrl, email, STRONG);
    await page.getByRole("button", { name: "Sign out" }).click();
    await page.waitForURL(/\/sign-in/);

    // Admin A proposes making her a CRO: nothing changes yet.
    await signInAs(page, suite.app.baseUrl, adminA);
    await page.goto(`${suite.app.baseUrl}/admin/users`);
    await page.getByRole("combobox", { name: "Role of Nadia Fern" }).selectOption("cro");
    await page
      .getByRole("group", { name: "Change the role of Nadia Fern" })
      .getByText(/another administrator approves/)
      .waitFor();
    await page.getByRole("button", { name: "Propose change" }).click();
    await page.getByText("Proposed: Nadia Fern as Chief risk officer").waitFor({ timeout: 15_000 });
    expect((await UserModel.findOne({ where: { email } }))!.role).toBe("analyst");
    const waiting = page.getByRole("table", { name: "Role changes waiting for approval" });
    await waiting.getByText("Another administrator approves").waitFor();
    expect(await waiting.getByRole("button", { name: /^Approve/ }).count()).toBe(0);
    await page.getByRole("button", { name: "Sign out" }).click();
    await page.waitForURL(/\/sign-in/);

    // Admin B approves after the confirmation.
    await signInAs(page, suite.app.baseUrl, adminB);
    await page.goto(`${suite.app.baseUrl}/admin/users`);
    await page.getByRole("button", { name: "Approve Analyst → Chief risk officer for Nadia Fern" }).click();
    await page.getByRole("button", { name: "Approve change" }).click();
    await page.getByText("Approved: Nadia Fern is now Chief risk officer.").waitFor({ timeout: 15_000 });
    await keepScreenshot(page, "users-role-approved");
    expect((await UserModel.findOne({ where: { email } }))!.role).toBe("cro");
    expect(errors).toEqual([]);
    await page.close();
  }, 240_000); // five sign-ins and a lazily loaded dictionary on a shared machine
});
