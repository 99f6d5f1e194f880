import { vi } from "vitest";
import { screen, within } from "@testing-library/react";
import userEvent from "@testing-library/user-event";
import { fakeApi, signedInAs, signedOut, refusal } from "./support/fake-api";
import { renderApp } from "./support/render-app";

const TOKEN = "Qm".repeat(21) + "x"; // 43 base64url characters, as the server issues them
const STRONG = "tulip-orbit-mosaic-41";
// The strength estimate loads its dictionaries lazily (several MB): allow for it on a busy machine.
const SLOW = { timeout: 30_000 };

describe("Your account › change your password", () => {
  it("when the new password is weak, then the rule's message shows as one types and nothing is sent; a strong one is sent with the current one", async () => {
    const api = fakeApi({
      "GET /api/auth/session": signedInAs("cro", "Margot Ellsworth"),
      "POST /api/auth/password": {
        status: 200,
        body: { user: { id: 7, email: "cro@larkspur.test", name: "Margot Ellsworth", role: "cro" } },
      },
    });
    const user = userEvent.setup();
    renderApp("/account");

    await user.type(await screen.findByLabelText("Current password", undefined, SLOW), "old password here");
    const field = screen.getByLabelText("New password");
    await user.type(field, "123456789012");
    expect(await screen.findByText(/This is a commonly used password/, undefined, SLOW)).toBeInTheDocument();
    await user.type(screen.getByLabelText("Repeat the new password"), "123456789012");
    await user.click(screen.getByRole("button", { name: "Change password" }));
    expect(field).toHaveAttribute("aria-invalid", "true");
    expect(api.callsTo("POST", "/api/auth/password")).toHaveLength(0);

    await user.clear(field);
    await user.type(field, "margot-orbit-tulip-9");
    expect(await screen.findByText(/Do not use your name/)).toBeInTheDocument();

    await user.clear(field);
    await user.type(field, STRONG);
    expect(await screen.findByText("Strong enough.", undefined, SLOW)).toBeInTheDocument();
    await user.clear(screen.getByLabelText("Repeat the new password"));
    await user.type(screen.getByLabelText("Repeat the new password"), STRONG);
    await user.click(screen.getByRole("button", { name: "Change password" }));

    expect(await screen.findByText(/Your password is changed/)).toBeInTheDocument();
    expect(api.callsTo("POST", "/api/auth/password")[0].body).toEqual({
      currentPassword: "old password here",
      newPassword: STRONG,
    });
  }, 60_000);

  it("when the current password is wrong (422), then the message appears beside it", async () => {
    fakeApi({
      "GET /api/auth/session": signedInAs("analyst"),
      "POST /api/auth/password": refusal(
        422,
        "validation_failed",
        "Your current password is not correct. Nothing was changed.",
        { fields: { currentPassword: "This is not your current password" } },
      ),
    });
    const user = userEvent.setup();
    renderApp("/account");

    await user.type(await screen.findByLabelText("Current password", undefined, SLOW), "a wrong guess");
    await user.type(screen.getByLabelText("New password"), STRONG);
    // The verdict is worked out as one types; the form sends only once it is known, as a person would see it.
    expect(await screen.findByText("Strong enough.", undefined, SLOW)).toBeInTheDocument();
    await user.type(screen.getByLabelText("Repeat the new password"), STRONG);
    await user.click(screen.getByRole("button", { name: "Change password" }));

    const current = screen.getByLabelText("Current password");
    await vi.waitFor(() => expect(current).toHaveAccessibleDescription("This is not your current password"), {
      timeout: 8000,
    });
  }, 60_000);
});

describe("the set-password screen (a link from an e-mail)", () => {
  it("when an invitee opens their link, then it greets them, checks the password as they type, and sets it with the token", async () => {
    const api = fakeApi({
      "GET /api/auth/session": signedOut,
      "POST /api/invitations/lookup": {
        status: 200,
        body: {
          purpose: "invite",
          email: "nadia.fern@larkspur.test",
          name: "Nadia Fern",
          role: "analyst",
          expiresAt: "2026-03-09T09:00:00.000Z",
        },
      },
      "POST /api/invitations/accept": {
        status: 200,
        body: { user: { id: 9, email: "nadia.fern@larkspur.test", name: "Nadia Fern", role: "analyst" } },
      },
    });
    const user = userEvent.setup();
    const { router } = renderApp(`/set-password#${TOKEN}`);

    expect(await screen.findByRole("heading", { name: "Welcome, Nadia Fern" }, SLOW)).toBeInTheDocument();
    expect(screen.getByText(/works once, until 09 Mar 2026, 09:00 UTC/)).toBeInTheDocument();
    expect(api.callsTo("POST", "/api/invitations/lookup")[0].body).toEqual({ token: TOKEN });
    await user.type(screen.getByLabelText("New password"), "aaaaaaaaaaaa");
    expect(await screen.findByText(/Repeated characters like "aaa"/, undefined, SLOW)).toBeInTheDocument();
    await user.clear(screen.getByLabelText("New password"));
    await user.type(screen.getByLabelText("New password"), STRONG);
    await user.type(screen.getByLabelText("Repeat the new password"), STRONG);
    await screen.findByText("Strong enough.", undefined, SLOW);
    await user.click(screen.getByRole("button", { name: "Set password and sign in" }));

    await vi.waitFor(() => expect(api.callsTo("POST", "/api/invitations/accept")).toHaveLength(1), { timeout: 8000 });
    expect(api.callsTo("POST", "/api/invitations/accept")[0].body).toEqual({ token: TOKEN, password: STRONG });
    // Signed in by the server's answer: the app moves on to the Overview.
    await vi.waitFor(() => expect(router.state.location.pathname).toBe("/"), SLOW);
  }, 60_000);

  it("when the link expired, then the screen says so and offers no password form", async () => {
    fakeApi({
      "GET /api/auth/session": signedOut,
      "POST /api/invitations/lookup": refusal(
        410,
        "link_expired",
        "This link expired on 2026-03-04 09:00 UTC. Ask your administrator to send a new one.",
      ),
    });
    renderApp(`/set-password#${TOKEN}`);

    const heading = await screen.findByRole("heading", { name: "This link cannot be used" }, SLOW);
    expect(heading).toBeInTheDocument();
    expect(screen.getByText(/expired on 2026-03-04 09:00 UTC. Ask your administrator/)).toBeInTheDocument();
    expect(screen.queryByLabelText("New password")).toBeNull();
    expect(within(document.body).getByRole("link", { name: "Sign in" })).toBeInTheDocument();
  });

  it("when the link was cut short, then nothing is asked of the server and the screen says how to open it", async () => {
    const api = fakeApi({ "GET /api/auth/session": signedOut });
    renderApp("/set-password#abc");

    expect(await screen.findByText(/This link is not complete/, undefined, SLOW)).toBeInTheDocument();
    expect(api.callsTo("POST", "/api/invitations/lookup")).toHaveLength(0);
  });
});
