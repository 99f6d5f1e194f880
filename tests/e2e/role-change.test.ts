import { describe, expect, it } from "vitest";
import { UserModel } from "../../server/models/user";
import { RoleRequestModel } from "../../server/models/role-request";
import { createTestUser } from "../server/helpers";
import { expectAccessible } from "./axe";
import { browserSuite, keepScreenshot, pageSignedInAs } from "./browser";

let adminEmail = "";
let regulator: UserModel;
const suite = browserSuite(async () => {
  adminEmail = (await createTestUser("admin")).email;
  regulator = await createTestUser("regulator", { name: `Rita Regulator ${Date.now()}` });
});

describe("a role change in a real browser", () => {
  it("when an administrator picks another role by mistake, then the confirmation says what it would do, and Cancel leaves the person, their sessions and the list as they were", async () => {
    const { page, errors } = await pageSignedInAs(suite, adminEmail, `/admin/users`);
    const role = page.getByRole("combobox", { name: `Role of ${regulator.name}` });
    await role.selectOption("treasury");
    const confirmation = page.getByRole("group", { name: `Change the role of ${regulator.name}` });
    await confirmation.waitFor();
    expect(await confirmation.textContent()).toContain(
      `Make ${regulator.name} Treasury? Their open sessions end at once.`,
    );
    await page.waitForLoadState("networkidle");
    await expectAccessible(page, "admin: Users, role change confirmation open");
    await keepScreenshot(page, "role-change-confirmation");

    await confirmation.getByRole("button", { name: "Cancel" }).click();
    await confirmation.waitFor({ state: "detached" });
    expect(await role.inputValue()).toBe("regulator");
    const after = await UserModel.findByPk(regulator.id, { rejectOnEmpty: true });
    expect({ role: after.role, version: after.version, tokenVersion: after.tokenVersion }).toEqual({
      role: "regulator",
      version: regulator.version,
      tokenVersion: regulator.tokenVersion,
    });
    expect(await RoleRequestModel.count({ where: { userId: regulator.id } })).toBe(0);
    await keepScreenshot(page, "role-change-cancelled");
    expect(errors).toEqual([]);
    await page.close();
  }, 120_000);
});
