import { screen, within } from "@testing-library/react";
import userEvent from "@testing-library/user-event";
import { fakeApi, signedInAs, signedOut } from "./support/fake-api";
import { renderApp } from "./support/render-app";

const adminLinks = ["Users", "Entities", "Regulator access", "Audit log", "Outbox"];

describe("navigation by role", () => {
  it("shows the administration links to an administrator", async () => {
    fakeApi({
      "GET /api/auth/session": signedInAs("admin", "Ada Admin"),
      "GET /api/entities": { status: 200, body: [] },
    });
    renderApp("/");

    const nav = await screen.findByRole("navigation", { name: "Main" });
    for (const name of ["Overview", ...adminLinks]) expect(within(nav).getByRole("link", { name })).toBeInTheDocument();
    expect(screen.getByText("Ada Admin")).toBeInTheDocument();
    expect(screen.getByText(/Administrator/)).toBeInTheDocument();
  });

  it.each(["analyst", "cro", "treasury", "regulator"] as const)(
    "hides the administration links from %s",
    async (role) => {
      fakeApi({ "GET /api/auth/session": signedInAs(role), "GET /api/entities": { status: 200, body: [] } });
      renderApp("/");

      const nav = await screen.findByRole("navigation", { name: "Main" });
      expect(within(nav).getByRole("link", { name: "Overview" })).toBeInTheDocument();
      for (const name of adminLinks) expect(within(nav).queryByRole("link", { name })).not.toBeInTheDocument();
    },
  );

  it("signing out ends the session on the server and returns to sign-in", async () => {
    let session = true;
    const api = fakeApi({
      "GET /api/auth/session": () => (session ? signedInAs("analyst") : signedOut),
      "POST /api/auth/logout": () => {
        session = false;
        return { status: 204 };
      },
      "GET /api/entities": { status: 200, body: [] },
    });
    const user = userEvent.setup();
    const { router } = renderApp("/");

    await user.click(await screen.findByRole("button", { name: "Sign out" }));

    expect(await screen.findByRole("heading", { name: "Sign in" })).toBeInTheDocument();
    expect(router.state.location.pathname).toBe("/sign-in");
    expect(api.callsTo("POST", "/api/auth/logout")).toHaveLength(1);
  });

  it("every screen carries the caution that figures are decision support", async () => {
    fakeApi({ "GET /api/auth/session": signedInAs("cro"), "GET /api/entities": { status: 200, body: [] } });
    renderApp("/");
    expect(await screen.findByText(/Figures are decision support\./)).toBeInTheDocument();
  });
});
