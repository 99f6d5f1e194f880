import { screen } from "@testing-library/react";
import { fakeApi, signedInAs, signedOut } from "./support/fake-api";
import { renderApp } from "./support/render-app";

describe("route guard", () => {
  it("when nobody is signed in, then a protected page sends the reader to sign-in and remembers the way back", async () => {
    const api = fakeApi({ "GET /api/auth/session": signedOut });

    const { router } = renderApp("/admin/users?x=1");

    expect(await screen.findByRole("heading", { name: "Sign in" })).toBeInTheDocument();
    expect(router.state.location.pathname).toBe("/sign-in");
    expect(new URLSearchParams(router.state.location.search).get("redirectTo")).toBe("/admin/users?x=1");
    // The protected data was never asked for.
    expect(api.callsTo("GET", "/api/users")).toHaveLength(0);
  });

  it("when the signed-in role may not open a page, then it says so instead of showing it", async () => {
    const api = fakeApi({ "GET /api/auth/session": signedInAs("analyst") });

    renderApp("/admin/audit");

    expect(await screen.findByRole("heading", { name: "Not available for your role" })).toBeInTheDocument();
    expect(screen.getByText(/Signed in as Analyst/)).toBeInTheDocument();
    expect(api.callsTo("GET", "/api/audit-events")).toHaveLength(0);
  });

  it("when the address matches no screen, then a not-found page offers the way back", async () => {
    fakeApi({ "GET /api/auth/session": signedInAs("cro") });

    renderApp("/no/such/page");

    expect(await screen.findByRole("heading", { name: "No page at this address" })).toBeInTheDocument();
    expect(screen.getByRole("link", { name: "Go to the overview" })).toHaveAttribute("href", "/");
  });
});

describe("session ending mid-use", () => {
  it("when the API answers 401 to a screen's data, then the reader is sent to sign-in with the way back", async () => {
    fakeApi({
      "GET /api/auth/session": signedInAs("admin"),
      "GET /api/users": { status: 401, body: { error: { code: "unauthorized", message: "Sign in to continue." } } },
    });

    const { router } = renderApp("/admin/users");

    expect(await screen.findByRole("heading", { name: "Sign in" })).toBeInTheDocument();
    expect(new URLSearchParams(router.state.location.search).get("redirectTo")).toBe("/admin/users");
  });
});
