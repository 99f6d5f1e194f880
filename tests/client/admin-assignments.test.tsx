import { screen, within } from "@testing-library/react";
import userEvent from "@testing-library/user-event";
import { fakeApi, signedInAs } from "./support/fake-api";
import { renderApp } from "./support/render-app";
import { larkspurEU, larkspurUS } from "./support/entities";

const regulator = {
  id: 5,
  email: "regulator@larkspur.test",
  name: "Rita Reg",
  role: "regulator",
  disabled: false,
  createdAt: "2026-01-01T00:00:00Z",
  lastSignInAt: null,
  passwordSet: true,
  version: 1,
};
const analyst = { ...regulator, id: 6, email: "analyst@larkspur.test", name: "Ana Lyst", role: "analyst" };
const entities = [
  { ...larkspurEU, passwordSet: true },
  { ...larkspurUS, passwordSet: true },
];

describe("Admin › Regulator access", () => {
  it("grants a regulator access to an entity and removes it again", async () => {
    let assignments = [{ userId: 5, email: regulator.email, name: regulator.name, entityCode: "LKS-EU" }];
    const api = fakeApi({
      "GET /api/auth/session": signedInAs("admin"),
      "GET /api/users": { status: 200, body: [regulator, analyst] },
      "GET /api/entities": { status: 200, body: entities },
      "GET /api/regulator-assignments": () => ({ status: 200, body: assignments }),
      "POST /api/regulator-assignments": ({ body }) => {
        const { userId, entityCode } = body as { userId: number; entityCode: string };
        assignments = [...assignments, { userId, email: regulator.email, name: regulator.name, entityCode }];
        return { status: 201, body: { userId, entityCode } };
      },
      "DELETE /api/regulator-assignments/5/LKS-EU": () => {
        assignments = assignments.filter((a) => a.entityCode !== "LKS-EU");
        return { status: 204 };
      },
    });
    const user = userEvent.setup();
    renderApp("/admin/assignments");

    const regulatorSelect = await screen.findByLabelText("Regulator");
    // Only active regulator users can be granted access.
    expect(within(regulatorSelect).queryByText(/Ana Lyst/)).not.toBeInTheDocument();
    await user.selectOptions(regulatorSelect, "5");
    await user.selectOptions(screen.getByLabelText("Entity"), "LKS-US");
    await user.click(screen.getByRole("button", { name: "Grant access" }));

    expect(await screen.findByText("Rita Reg can now see filings of LKS-US.")).toBeInTheDocument();
    expect(api.callsTo("POST", "/api/regulator-assignments")[0].body).toEqual({ userId: 5, entityCode: "LKS-US" });
    expect(
      await screen.findByText("Larkspur Securities LLC", { exact: false, selector: "td span" }),
    ).toBeInTheDocument();

    await user.click(screen.getByRole("button", { name: "Remove access of Rita Reg to LKS-EU" }));
    expect(api.callsTo("DELETE", "/api/regulator-assignments/5/LKS-EU")).toHaveLength(1);
    await screen.findByRole("button", { name: "Remove access of Rita Reg to LKS-US" });
    expect(screen.queryByRole("button", { name: "Remove access of Rita Reg to LKS-EU" })).not.toBeInTheDocument();
  });

  it("when no regulator has access, then the empty state says how to grant it", async () => {
    fakeApi({
      "GET /api/auth/session": signedInAs("admin"),
      "GET /api/users": { status: 200, body: [regulator] },
      "GET /api/entities": { status: 200, body: entities },
      "GET /api/regulator-assignments": { status: 200, body: [] },
    });
    renderApp("/admin/assignments");
    expect(await screen.findByText("No regulator has access yet")).toBeInTheDocument();
  });
});
