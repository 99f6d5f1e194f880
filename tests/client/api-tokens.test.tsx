import { screen, waitFor, within } from "@testing-library/react";
import userEvent from "@testing-library/user-event";
import { fakeApi, signedInAs, type Call, refusal } from "./support/fake-api";
import { renderApp } from "./support/render-app";
import { larkspurEU } from "./support/entities";

const SECRET = `qmk_${"Lk7".repeat(14)}x`;

const active = {
  id: 11,
  name: "Nightly capital pull",
  prefix: "qmk_Q2xX9aPe",
  createdAt: "2026-10-01T08:00:00.000Z",
  lastUsedAt: "2026-10-05T06:30:00.000Z",
  expiresAt: "2026-12-30T08:00:00.000Z",
  revokedAt: null,
  status: "active",
};
const revoked = {
  id: 9,
  name: "Old spreadsheet link",
  prefix: "qmk_b81Rr0Zm",
  createdAt: "2026-07-01T08:00:00.000Z",
  lastUsedAt: null,
  expiresAt: "2026-09-29T08:00:00.000Z",
  revokedAt: "2026-08-14T10:12:00.000Z",
  status: "revoked",
};
const entities = [larkspurEU];

function created(body: { name: string; expiresInDays?: number }) {
  return {
    ...active,
    id: 12,
    name: body.name,
    prefix: SECRET.slice(0, 12),
    lastUsedAt: null,
    createdAt: "2026-10-06T09:00:00.000Z",
    expiresAt: "2026-11-05T09:00:00.000Z",
    secret: SECRET,
  };
}

/** The server as treasury sees it: a list that grows with each creation and marks revocations. */
function treasuryApi() {
  let tokens: object[] = [active, revoked];
  return fakeApi({
    "GET /api/auth/session": signedInAs("treasury", "Tess Treasury"),
    "GET /api/entities": { status: 200, body: entities },
    "GET /api/tokens": () => ({ status: 200, body: tokens }),
    "POST /api/tokens": (call: Call) => {
      const token = created(call.body as { name: string });
      const { secret: _secret, ...listed } = token;
      tokens = [listed, ...tokens];
      return { status: 201, body: token };
    },
    "DELETE /api/tokens/11": () => {
      tokens = tokens.map((t) =>
        (t as { id: number }).id === 11 ? { ...active, status: "revoked", revokedAt: "2026-10-06T09:30:00.000Z" } : t,
      );
      return { status: 204 };
    },
  });
}

describe("API tokens screen", () => {
  it("when treasury opens it, then each token shows its name, prefix, dates and status, and the header counts the active ones", async () => {
    treasuryApi();
    renderApp("/tokens");

    const table = await screen.findByRole("table", { name: "Your API tokens" });
    const row = within(table).getByTestId("token-11");
    expect(within(row).getByText("Nightly capital pull")).toBeInTheDocument();
    expect(within(row).getByText("qmk_Q2xX9aPe…")).toBeInTheDocument();
    expect(within(row).getByText("01 Oct 2026, 08:00 UTC")).toBeInTheDocument();
    expect(within(row).getByText("05 Oct 2026, 06:30 UTC")).toBeInTheDocument();
    expect(within(row).getByText("30 Dec 2026, 08:00 UTC")).toBeInTheDocument();
    expect(within(row).getByText("Active")).toBeInTheDocument();
    const old = within(table).getByTestId("token-9");
    expect(within(old).getByText("Never")).toBeInTheDocument();
    expect(within(old).getByText("Revoked 14 Aug 2026, 10:12 UTC")).toBeInTheDocument();
    expect(within(old).queryByRole("button", { name: /Revoke/ })).not.toBeInTheDocument();
    expect(screen.getByTestId("tokens-standing")).toHaveTextContent("1 active token · 1 expired or revoked");
    expect(
      within(screen.getByRole("navigation", { name: "Main" })).getByRole("link", { name: "API tokens" }),
    ).toHaveAttribute("href", "/tokens");
    expect(screen.getByText(/Figures are decision support\./)).toBeInTheDocument();
  });

  it("when treasury creates a token, then its secret is shown once with a Copy button and a curl example, and is gone after 'I have stored it'", async () => {
    const api = treasuryApi();
    const user = userEvent.setup();
    renderApp("/tokens");

    await user.type(await screen.findByLabelText("Name"), "Quarter-end pull");
    await user.clear(screen.getByLabelText("Valid for (days)"));
    await user.type(screen.getByLabelText("Valid for (days)"), "30");
    await user.click(screen.getByRole("button", { name: "Create token" }));

    const panel = await screen.findByTestId("new-token");
    expect(api.callsTo("POST", "/api/tokens")[0].body).toEqual({ name: "Quarter-end pull", expiresInDays: 30 });
    expect(within(panel).getByRole("heading", { name: /Copy the token “Quarter-end pull” now/ })).toHaveFocus();
    expect(within(panel).getByText(/only time it is shown/)).toBeInTheDocument();
    expect(within(panel).getByTestId("new-token-secret")).toHaveTextContent(SECRET);
    expect(within(panel).getByTestId("new-token-curl")).toHaveTextContent(
      `curl -H "Authorization: Bearer ${SECRET}" ${window.location.origin}/api/entities/LKS-EU/capital/history`,
    );

    await user.click(within(panel).getByRole("button", { name: "Copy the token" }));
    expect(await navigator.clipboard.readText()).toBe(SECRET);
    expect(within(panel).getByText("The token is copied.")).toBeInTheDocument();

    // The new token joins the list (read again from the server), without its secret.
    const table = screen.getByRole("table", { name: "Your API tokens" });
    await waitFor(() => expect(within(table).getByText("Quarter-end pull")).toBeInTheDocument());
    expect(table).not.toHaveTextContent(SECRET);
    expect(api.callsTo("GET", "/api/tokens")).toHaveLength(2);

    await user.click(within(panel).getByRole("button", { name: "I have stored it" }));
    expect(screen.queryByTestId("new-token")).not.toBeInTheDocument();
    expect(document.body).not.toHaveTextContent(SECRET);
  });

  it("when the name is empty or the expiry is 0 days, then the fields say why and nothing is sent", async () => {
    const api = treasuryApi();
    const user = userEvent.setup();
    renderApp("/tokens");

    await user.clear(await screen.findByLabelText("Valid for (days)"));
    await user.type(screen.getByLabelText("Valid for (days)"), "0");
    await user.click(screen.getByRole("button", { name: "Create token" }));

    expect(await screen.findByText("At least 1 day")).toBeInTheDocument();
    expect(screen.getByLabelText("Name")).toHaveAttribute("aria-invalid", "true");
    expect(api.callsTo("POST", "/api/tokens")).toHaveLength(0);
  });

  it("when the server refuses a further token (409), then its message is shown above the form", async () => {
    fakeApi({
      "GET /api/auth/session": signedInAs("treasury"),
      "GET /api/entities": { status: 200, body: entities },
      "GET /api/tokens": { status: 200, body: [active] },
      "POST /api/tokens": refusal(
        409,
        "conflict",
        "You already hold 10 active API tokens, the most allowed. Revoke one you no longer use first.",
      ),
    });
    const user = userEvent.setup();
    renderApp("/tokens");

    await user.type(await screen.findByLabelText("Name"), "Eleventh");
    await user.click(screen.getByRole("button", { name: "Create token" }));

    expect(await screen.findByRole("alert")).toHaveTextContent("Revoke one you no longer use first.");
    expect(screen.queryByTestId("new-token")).not.toBeInTheDocument();
  });

  it("when treasury revokes a token, then it asks first; Cancel sends nothing, and confirming revokes it and says so", async () => {
    const api = treasuryApi();
    const user = userEvent.setup();
    renderApp("/tokens");

    await user.click(await screen.findByRole("button", { name: "Revoke Nightly capital pull" }));
    const confirmation = screen.getByRole("group", { name: "Revoke Nightly capital pull" });
    expect(confirmation).toHaveTextContent(
      "Scripts using “Nightly capital pull” (qmk_Q2xX9aPe…) are refused from now on.",
    );
    expect(within(confirmation).getByRole("button", { name: "Revoke token" })).toHaveFocus();
    await user.click(within(confirmation).getByRole("button", { name: "Cancel" }));
    expect(screen.queryByRole("group", { name: "Revoke Nightly capital pull" })).not.toBeInTheDocument();
    expect(screen.getByRole("button", { name: "Revoke Nightly capital pull" })).toHaveFocus();
    expect(api.callsTo("DELETE", "/api/tokens/11")).toHaveLength(0);

    await user.click(screen.getByRole("button", { name: "Revoke Nightly capital pull" }));
    await user.click(screen.getByRole("button", { name: "Revoke token" }));

    expect(await screen.findByRole("status")).toHaveTextContent(
      "“Nightly capital pull” is revoked; scripts using it are refused.",
    );
    expect(api.callsTo("DELETE", "/api/tokens/11")).toHaveLength(1);
    const row = screen.getByTestId("token-11");
    expect(within(row).getByText("Revoked 06 Oct 2026, 09:30 UTC")).toBeInTheDocument();
    expect(within(row).queryByRole("button", { name: /Revoke/ })).not.toBeInTheDocument();
    expect(screen.getByTestId("tokens-standing")).toHaveTextContent("No active token · 2 expired or revoked");
  });

  it("when there are no tokens, then the empty state says to create one per script", async () => {
    fakeApi({
      "GET /api/auth/session": signedInAs("treasury"),
      "GET /api/entities": { status: 200, body: entities },
      "GET /api/tokens": { status: 200, body: [] },
    });
    renderApp("/tokens");
    expect(await screen.findByText("No API tokens yet")).toBeInTheDocument();
    expect(screen.getByText(/for each script/)).toBeInTheDocument();
  });

  it.each(["analyst", "cro", "regulator", "admin"] as const)(
    "when %s opens the address, then the page is not available for their role, no tokens are asked for, and the navigation has no link",
    async (role) => {
      const api = fakeApi({
        "GET /api/auth/session": signedInAs(role),
        "GET /api/entities": { status: 200, body: entities },
      });
      renderApp("/tokens");

      expect(await screen.findByRole("heading", { name: "Not available for your role" })).toBeInTheDocument();
      expect(api.callsTo("GET", "/api/tokens")).toHaveLength(0);
      expect(
        within(screen.getByRole("navigation", { name: "Main" })).queryByRole("link", { name: "API tokens" }),
      ).not.toBeInTheDocument();
    },
  );
});
