import { vi } from "vitest";
import { screen, within } from "@testing-library/react";
import userEvent from "@testing-library/user-event";
import { fakeApi, signedInAs, refusal } from "./support/fake-api";
import { renderApp } from "./support/render-app";

const users = [
  {
    id: 1,
    email: "admin@larkspur.test",
    name: "Ada Admin",
    role: "admin",
    disabled: false,
    createdAt: "2026-01-02T09:00:00.000Z",
    lastSignInAt: "2026-03-05T14:07:00.000Z",
    passwordSet: true,
    version: 1,
  },
  {
    id: 2,
    email: "analyst@larkspur.test",
    name: "Ana Lyst",
    role: "analyst",
    disabled: false,
    createdAt: "2026-01-02T09:00:00.000Z",
    lastSignInAt: null,
    passwordSet: true,
    version: 3,
  },
  {
    id: 3,
    email: "old@larkspur.test",
    name: "Olga Old",
    role: "cro",
    disabled: true,
    createdAt: "2026-01-02T09:00:00.000Z",
    lastSignInAt: null,
    passwordSet: true,
    version: 1,
  },
];

const emptyQueues = {
  "GET /api/invitations": { status: 200, body: [] },
  "GET /api/role-requests": { status: 200, body: [] },
};

/** The session of Ada Admin (user #1), the administrator at the keyboard. */
const adaSignedIn = {
  status: 200,
  body: { user: { id: 1, email: "admin@larkspur.test", name: "Ada Admin", role: "admin" } },
};

describe("Admin › Users", () => {
  it("lists the users the server returns with role, status and last sign-in", async () => {
    fakeApi({
      "GET /api/auth/session": adaSignedIn,
      "GET /api/users": { status: 200, body: users },
      ...emptyQueues,
    });
    renderApp("/admin/users");

    // The first render of the file also loads the lazy route: give it time on a busy machine.
    const table = await screen.findByRole("table", { name: "Users" }, { timeout: 10_000 });
    const rows = within(table).getAllByRole("row");
    expect(rows).toHaveLength(4); // header + three users
    const rowOf = (name: string) => rows.find((r) => (r as HTMLTableRowElement).cells[0].textContent === name)!;
    const ana = rowOf("Ana Lyst");
    expect(within(ana).getByText("analyst@larkspur.test")).toBeInTheDocument();
    expect(within(ana).getByRole("combobox", { name: "Role of Ana Lyst" })).toHaveValue("analyst");
    expect(within(ana).getByText("Active")).toBeInTheDocument();
    expect(within(ana).getByText("Never")).toBeInTheDocument();
    const olga = rowOf("Olga Old");
    expect(within(olga).getByText("Disabled")).toBeInTheDocument();
    expect(within(olga).getByRole("button", { name: "Enable Olga Old" })).toBeInTheDocument();
    expect(screen.getByText("05 Mar 2026, 14:07 UTC")).toBeInTheDocument();
    expect(screen.getByText("2 active of 3")).toBeInTheDocument();
  });

  it("when there are no users, then the empty state says to add the first one", async () => {
    fakeApi({
      "GET /api/auth/session": signedInAs("admin"),
      "GET /api/users": { status: 200, body: [] },
      ...emptyQueues,
    });
    renderApp("/admin/users");

    expect(await screen.findByText("No users yet")).toBeInTheDocument();
    expect(screen.getByText(/Invite the first user with the form on this page/)).toBeInTheDocument();
    expect(screen.getByRole("heading", { name: "Invite a user" })).toBeInTheDocument();
  });

  it("when a new user's e-mail is already taken (409), then the server's message is shown and the list stays", async () => {
    const api = fakeApi({
      "GET /api/auth/session": signedInAs("admin"),
      "GET /api/users": { status: 200, body: users },
      ...emptyQueues,
      "POST /api/users": {
        status: 409,
        body: { error: { code: "conflict", message: "A user with this e-mail already exists." } },
      },
    });
    const user = userEvent.setup();
    renderApp("/admin/users");

    await user.type(await screen.findByLabelText("Name"), "Second Ana");
    await user.type(screen.getByLabelText("E-mail"), "analyst@larkspur.test");
    await user.click(screen.getByRole("button", { name: "Send invitation" }));

    expect(await screen.findByText("A user with this e-mail already exists.")).toBeInTheDocument();
    expect(api.callsTo("POST", "/api/users")[0].body).toEqual({
      name: "Second Ana",
      email: "analyst@larkspur.test",
      role: "analyst",
    });
  });

  it("when the server rejects a field (422 with details.fields), then the message appears beside that field", async () => {
    fakeApi({
      "GET /api/auth/session": signedInAs("admin"),
      "GET /api/users": { status: 200, body: users },
      ...emptyQueues,
      "POST /api/users": refusal(422, "validation", "Check the highlighted fields.", {
        fields: { email: "This domain is not allowed" },
      }),
    });
    const user = userEvent.setup();
    renderApp("/admin/users");

    await user.type(await screen.findByLabelText("Name"), "Someone");
    await user.type(screen.getByLabelText("E-mail"), "someone@elsewhere.test");
    await user.click(screen.getByRole("button", { name: "Send invitation" }));

    const email = screen.getByLabelText("E-mail");
    expect(await screen.findByText("This domain is not allowed")).toBeInTheDocument();
    expect(email).toHaveAttribute("aria-invalid", "true");
    expect(email).toHaveAccessibleDescription("This domain is not allowed");
  });

  it("when an account is locked out, then the list says until when; Unlock asks first, Cancel sends nothing, and the confirmation unlocks it", async () => {
    const locked = [{ ...users[0] }, { ...users[1], lockedUntil: "2026-03-05T14:22:00.000Z" }, users[2]];
    const api = fakeApi({
      "GET /api/auth/session": adaSignedIn,
      "GET /api/users": { status: 200, body: locked },
      ...emptyQueues,
      "POST /api/users/2/unlock": { status: 200, body: { ...users[1], lockedUntil: null } },
    });
    const user = userEvent.setup();
    renderApp("/admin/users");

    expect(
      await screen.findByText("Locked out until 05 Mar 2026, 14:22 UTC", {}, { timeout: 10_000 }),
    ).toBeInTheDocument();
    await user.click(screen.getByRole("button", { name: "Unlock Ana Lyst" }));
    const ask = screen.getByRole("group", { name: "Unlock Ana Lyst" });
    expect(ask).toHaveTextContent(
      "Unlock Ana Lyst? Their failed sign-ins are forgotten and they can try again at once.",
    );
    await user.click(within(ask).getByRole("button", { name: "Cancel" }));
    expect(api.callsTo("POST", "/api/users/2/unlock")).toHaveLength(0);

    await user.click(screen.getByRole("button", { name: "Unlock Ana Lyst" }));
    await user.click(screen.getByRole("button", { name: "Unlock the account" }));
    expect(await screen.findByText("Ana Lyst is unlocked and can sign in again now.")).toBeInTheDocument();
    expect(api.callsTo("POST", "/api/users/2/unlock")).toHaveLength(1);
    expect(screen.queryByRole("button", { name: "Unlock Ada Admin" })).not.toBeInTheDocument();
  });

  it("when an admin changes a role, then the consequence is stated first and the version shown is sent with the change", async () => {
    const api = fakeApi({
      "GET /api/auth/session": adaSignedIn,
      "GET /api/users": { status: 200, body: users },
      ...emptyQueues,
      "GET /api/regulator-assignments": { status: 200, body: [] },
      "PATCH /api/users/2": { status: 200, body: { ...users[1], role: "treasury", version: 4 } },
    });
    const user = userEvent.setup();
    renderApp("/admin/users");

    await user.selectOptions(await screen.findByRole("combobox", { name: "Role of Ana Lyst" }), "treasury");
    const ask = screen.getByRole("group", { name: "Change the role of Ana Lyst" });
    expect(ask).toHaveTextContent("Make Ana Lyst Treasury? Their open sessions end at once.");
    expect(api.callsTo("PATCH", "/api/users/2")).toHaveLength(0); // nothing before the confirmation
    await user.click(within(ask).getByRole("button", { name: "Change role" }));

    expect(await screen.findByText(/Ana Lyst is now/)).toBeInTheDocument();
    expect(api.callsTo("PATCH", "/api/users/2")[0].body).toEqual({ role: "treasury", version: 3 });
  });

  it("when another admin changed the user first (409 stale), then the screen says so plainly and shows the user as they now stand", async () => {
    const current = { ...users[1], name: "Ana Lyst", role: "treasury", version: 4 };
    let listed = users;
    const api = fakeApi({
      "GET /api/auth/session": adaSignedIn,
      "GET /api/users": () => ({ status: 200, body: listed }),
      ...emptyQueues,
      "PATCH /api/users/2": () => {
        listed = users.map((u) => (u.id === 2 ? current : u));
        return refusal(
          409,
          "stale",
          "Someone else changed Ana Lyst (analyst@larkspur.test) since you opened the list (now version 4).",
          { current },
        );
      },
    });
    const user = userEvent.setup();
    renderApp("/admin/users");

    await user.click(await screen.findByRole("button", { name: "Disable Ana Lyst" }));
    // Disabling asks first and says what it does; nothing is sent before the confirmation.
    expect(screen.getByRole("group", { name: "Disable Ana Lyst" })).toHaveTextContent(
      "Disable Ana Lyst? They can no longer sign in, their open sessions end at once.",
    );
    expect(api.callsTo("PATCH", "/api/users/2")).toHaveLength(0);
    await user.click(screen.getByRole("button", { name: "Disable the account" }));

    expect(
      await screen.findByText(
        /Someone else changed Ana Lyst while you had this page open, so your change was not saved/,
      ),
    ).toBeInTheDocument();
    expect(api.callsTo("PATCH", "/api/users/2")[0].body).toEqual({ disabled: true, version: 3 });
    // The row shows what the other admin saved, and is still enabled.
    expect(await screen.findByRole("combobox", { name: "Role of Ana Lyst" })).toHaveValue("treasury");
    expect(screen.getByRole("button", { name: "Disable Ana Lyst" })).toBeInTheDocument();
    expect(screen.queryByText(/can no longer sign in/)).not.toBeInTheDocument();
    // The next change is built on the version now shown.
    await user.click(screen.getByRole("button", { name: "Disable Ana Lyst" }));
    await user.click(screen.getByRole("button", { name: "Disable the account" }));
    await vi.waitFor(() => expect(api.callsTo("PATCH", "/api/users/2")).toHaveLength(2), { timeout: 8000 });
    expect(api.callsTo("PATCH", "/api/users/2")[1].body).toEqual({ disabled: true, version: 4 });
  });

  it("when a reset link meets a stale version, then the screen says someone else changed the user and nothing is reported as sent", async () => {
    const current = { ...users[1], role: "treasury", version: 5 };
    const api = fakeApi({
      "GET /api/auth/session": adaSignedIn,
      "GET /api/users": { status: 200, body: users },
      ...emptyQueues,
      "POST /api/users/2/password-link": refusal(
        409,
        "stale",
        "Someone else changed Ana Lyst since you opened the list (now version 5).",
        { current },
      ),
    });
    const user = userEvent.setup();
    renderApp("/admin/users");

    await user.click(await screen.findByRole("button", { name: "Send reset link to Ana Lyst" }));
    const ask = screen.getByRole("group", { name: "Send a link to Ana Lyst" });
    expect(ask).toHaveTextContent(/their current password keeps working until they use it/);
    await user.click(within(ask).getByRole("button", { name: "Send link" }));

    expect(await screen.findByText(/Someone else changed Ana Lyst while you had this page open/)).toBeInTheDocument();
    expect(api.callsTo("POST", "/api/users/2/password-link")[0].body).toEqual({ version: 3 });
    expect(screen.queryByText(/went to analyst@larkspur.test/)).not.toBeInTheDocument();
    // No password field anywhere: the admin never sets one.
    expect(document.querySelector("input[type=password]")).toBeNull();
  });

  it("when an admin picks the CRO role, then the confirmation says a second admin must approve, and a proposal is sent instead of a change", async () => {
    const api = fakeApi({
      "GET /api/auth/session": adaSignedIn,
      "GET /api/users": { status: 200, body: users },
      ...emptyQueues,
      "POST /api/role-requests": { status: 201, body: request({ proposedBy: ada }) },
    });
    const user = userEvent.setup();
    renderApp("/admin/users");

    await user.selectOptions(await screen.findByRole("combobox", { name: "Role of Ana Lyst" }), "cro");
    const ask = screen.getByRole("group", { name: "Change the role of Ana Lyst" });
    expect(ask).toHaveTextContent(
      "Propose making Ana Lyst Chief risk officer? Nothing changes until another administrator approves; until then Ana Lyst stays Analyst.",
    );
    await user.click(within(ask).getByRole("button", { name: "Propose change" }));

    expect(await screen.findByText(/Proposed: Ana Lyst as Chief risk officer/)).toBeInTheDocument();
    expect(api.callsTo("POST", "/api/role-requests")[0].body).toEqual({ userId: 2, role: "cro", version: 3 });
    expect(api.callsTo("PATCH", "/api/users/2")).toHaveLength(0);
  });

  it("when a request waits, then its proposer sees no Approve button, and another admin approves it after confirming", async () => {
    const waiting = request({ proposedBy: bea });
    let approved = false;
    const api = fakeApi({
      "GET /api/auth/session": adaSignedIn,
      "GET /api/users": () => ({
        status: 200,
        body: users.map((u) => (u.id === 2 && approved ? { ...u, role: "cro", version: 4 } : u)),
      }),
      "GET /api/invitations": { status: 200, body: [] },
      "GET /api/role-requests": () => ({
        status: 200,
        body: approved ? [] : [waiting, request({ id: 12, proposedBy: ada })],
      }),
      "GET /api/regulator-assignments": { status: 200, body: [] },
      "POST /api/role-requests/11/approve": () => {
        approved = true;
        return {
          status: 200,
          body: { ...waiting, status: "approved", decidedBy: ada, decidedAt: "2026-03-06T10:00:00.000Z" },
        };
      },
    });
    const user = userEvent.setup();
    renderApp("/admin/users");

    const table = await screen.findByRole("table", { name: "Role changes waiting for approval" });
    const mine = within(table).getByTestId("role-request-12");
    expect(within(mine).queryByRole("button", { name: /Approve/ })).toBeNull();
    expect(within(mine).getByText("Another administrator approves")).toBeInTheDocument();
    // While it waits, the user's role cannot be changed another way.
    expect(screen.getByRole("combobox", { name: "Role of Ana Lyst" })).toBeDisabled();

    await user.click(within(table).getByRole("button", { name: "Approve Analyst → Chief risk officer for Ana Lyst" }));
    const ask = screen.getByRole("group", { name: "Approve the request for Ana Lyst" });
    expect(ask).toHaveTextContent("Ana Lyst becomes Chief risk officer at once and their open sessions end.");
    await user.click(within(ask).getByRole("button", { name: "Approve change" }));

    expect(await screen.findByText("Approved: Ana Lyst is now Chief risk officer.")).toBeInTheDocument();
    expect(api.callsTo("POST", "/api/role-requests/11/approve")).toHaveLength(1);
    await vi.waitFor(() => expect(screen.getByRole("combobox", { name: "Role of Ana Lyst" })).toHaveValue("cro"), {
      timeout: 8000,
    });
  });

  it("when a new user is invited as an administrator, then the form says it waits for approval and the list of links shows open and expired ones", async () => {
    const api = fakeApi({
      "GET /api/auth/session": signedInAs("admin"),
      "GET /api/users": { status: 200, body: users },
      "GET /api/role-requests": { status: 200, body: [] },
      "GET /api/invitations": {
        status: 200,
        body: [
          {
            id: 5,
            userId: 9,
            email: "new@larkspur.test",
            name: "Nia New",
            role: "treasury",
            purpose: "invite",
            createdBy: "Ada Admin",
            createdAt: "2026-03-01T09:00:00.000Z",
            expiresAt: "2026-03-04T09:00:00.000Z",
            expired: true,
          },
        ],
      },
      "POST /api/users": {
        status: 202,
        body: {
          outcome: "awaiting_approval",
          request: request({
            id: 13,
            kind: "invite",
            userId: null,
            fromRole: null,
            toRole: "admin",
            name: "Ola Other",
            email: "ola@larkspur.test",
            proposedBy: ada,
          }),
        },
      },
    });
    const user = userEvent.setup();
    renderApp("/admin/users");

    const links = await screen.findByRole("table", { name: "Links not used yet" });
    expect(within(links).getByText("Nia New")).toBeInTheDocument();
    expect(within(links).getByText(/Expired .*: send a new one/)).toBeInTheDocument();

    await user.type(screen.getByLabelText("Name"), "Ola Other");
    await user.type(screen.getByLabelText("E-mail"), "ola@larkspur.test");
    await user.selectOptions(screen.getByLabelText("Role"), "admin");
    expect(screen.getByTestId("invite-needs-approval")).toHaveTextContent(
      /sent only once another administrator approves/,
    );
    await user.click(screen.getByRole("button", { name: "Send invitation" }));

    expect(await screen.findByText(/waits for a second administrator's approval/)).toBeInTheDocument();
    expect(api.callsTo("POST", "/api/users")[0].body).toEqual({
      name: "Ola Other",
      email: "ola@larkspur.test",
      role: "admin",
    });
  });
});

const ada = { id: 1, name: "Ada Admin", email: "admin@larkspur.test" };
const bea = { id: 4, name: "Bea Second", email: "admin2@larkspur.test" };
function request(over: Record<string, unknown> = {}) {
  return {
    id: 11,
    kind: "change",
    userId: 2,
    email: "analyst@larkspur.test",
    name: "Ana Lyst",
    fromRole: "analyst",
    toRole: "cro",
    status: "pending",
    proposedBy: bea,
    proposedAt: "2026-03-06T09:00:00.000Z",
    decidedBy: null,
    decidedAt: null,
    ...over,
  };
}
