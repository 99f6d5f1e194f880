import { vi } from "vitest";
import { screen, within } from "@testing-library/react";
import userEvent from "@testing-library/user-event";
import { fakeApi, signedInAs } from "./support/fake-api";
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
    version: 1,
  },
];

describe("Admin › Users", () => {
  it("lists the users the server returns with role, status and last sign-in", async () => {
    fakeApi({
      "GET /api/auth/session": {
        status: 200,
        body: { user: { id: 1, email: "admin@larkspur.test", name: "Ada Admin", role: "admin" } },
      },
      "GET /api/users": { status: 200, body: users },
    });
    renderApp("/admin/users");

    const table = await screen.findByRole("table", { name: "Users" });
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
    fakeApi({ "GET /api/auth/session": signedInAs("admin"), "GET /api/users": { status: 200, body: [] } });
    renderApp("/admin/users");

    expect(await screen.findByText("No users yet")).toBeInTheDocument();
    expect(screen.getByText(/Add the first user with the form on this page/)).toBeInTheDocument();
    expect(screen.getByRole("heading", { name: "Add a user" })).toBeInTheDocument();
  });

  it("when a new user's e-mail is already taken (409), then the server's message is shown and the list stays", async () => {
    const api = fakeApi({
      "GET /api/auth/session": signedInAs("admin"),
      "GET /api/users": { status: 200, body: users },
      "POST /api/users": {
        status: 409,
        body: { error: { code: "conflict", message: "A user with this e-mail already exists." } },
      },
    });
    const user = userEvent.setup();
    renderApp("/admin/users");

    await user.type(await screen.findByLabelText("Name"), "Second Ana");
    await user.type(screen.getByLabelText("E-mail"), "analyst@larkspur.test");
    await user.type(screen.getByLabelText("Initial password"), "a long enough password");
    await user.click(screen.getByRole("button", { name: "Add user" }));

    expect(await screen.findByText("A user with this e-mail already exists.")).toBeInTheDocument();
    expect(api.callsTo("POST", "/api/users")[0].body).toEqual({
      name: "Second Ana",
      email: "analyst@larkspur.test",
      role: "analyst",
      password: "a long enough password",
    });
  });

  it("when the server rejects a field (422 with details.fields), then the message appears beside that field", async () => {
    fakeApi({
      "GET /api/auth/session": signedInAs("admin"),
      "GET /api/users": { status: 200, body: users },
      "POST /api/users": {
        status: 422,
        body: {
          error: {
            code: "validation",
            message: "Check the highlighted fields.",
            details: { fields: { email: "This domain is not allowed" } },
          },
        },
      },
    });
    const user = userEvent.setup();
    renderApp("/admin/users");

    await user.type(await screen.findByLabelText("Name"), "Someone");
    await user.type(screen.getByLabelText("E-mail"), "someone@elsewhere.test");
    await user.type(screen.getByLabelText("Initial password"), "a long enough password");
    await user.click(screen.getByRole("button", { name: "Add user" }));

    const email = screen.getByLabelText("E-mail");
    expect(await screen.findByText("This domain is not allowed")).toBeInTheDocument();
    expect(email).toHaveAttribute("aria-invalid", "true");
    expect(email).toHaveAccessibleDescription("This domain is not allowed");
  });

  it("when an admin changes a role, then the version shown is sent with the change", async () => {
    const api = fakeApi({
      "GET /api/auth/session": {
        status: 200,
        body: { user: { id: 1, email: "admin@larkspur.test", name: "Ada Admin", role: "admin" } },
      },
      "GET /api/users": { status: 200, body: users },
      "GET /api/regulator-assignments": { status: 200, body: [] },
      "PATCH /api/users/2": { status: 200, body: { ...users[1], role: "cro", version: 4 } },
    });
    const user = userEvent.setup();
    renderApp("/admin/users");

    await user.selectOptions(await screen.findByRole("combobox", { name: "Role of Ana Lyst" }), "cro");

    expect(await screen.findByText(/Ana Lyst is now/)).toBeInTheDocument();
    expect(api.callsTo("PATCH", "/api/users/2")[0].body).toEqual({ role: "cro", version: 3 });
  });

  it("when another admin changed the user first (409 stale), then the screen says so plainly and shows the user as they now stand", async () => {
    const current = { ...users[1], name: "Ana Lyst", role: "treasury", version: 4 };
    let listed = users;
    const api = fakeApi({
      "GET /api/auth/session": {
        status: 200,
        body: { user: { id: 1, email: "admin@larkspur.test", name: "Ada Admin", role: "admin" } },
      },
      "GET /api/users": () => ({ status: 200, body: listed }),
      "PATCH /api/users/2": () => {
        listed = users.map((u) => (u.id === 2 ? current : u));
        return {
          status: 409,
          body: {
            error: {
              code: "stale",
              message:
                "Someone else changed Ana Lyst (analyst@larkspur.test) since you opened the list (now version 4).",
              details: { current },
            },
          },
        };
      },
    });
    const user = userEvent.setup();
    renderApp("/admin/users");

    await user.click(await screen.findByRole("button", { name: "Disable Ana Lyst" }));

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
    await vi.waitFor(() => expect(api.callsTo("PATCH", "/api/users/2")).toHaveLength(2));
    expect(api.callsTo("PATCH", "/api/users/2")[1].body).toEqual({ disabled: true, version: 4 });
  });

  it("when a password reset meets a stale version, then the form says someone else changed the user and nothing is reported as set", async () => {
    const current = { ...users[1], role: "cro", version: 5 };
    const api = fakeApi({
      "GET /api/auth/session": {
        status: 200,
        body: { user: { id: 1, email: "admin@larkspur.test", name: "Ada Admin", role: "admin" } },
      },
      "GET /api/users": { status: 200, body: users },
      "POST /api/users/2/password": {
        status: 409,
        body: {
          error: {
            code: "stale",
            message: "Someone else changed Ana Lyst since you opened the list (now version 5).",
            details: { current },
          },
        },
      },
    });
    const user = userEvent.setup();
    renderApp("/admin/users");

    await user.click(await screen.findByRole("button", { name: "Reset password of Ana Lyst" }));
    await user.type(screen.getByLabelText("New password for Ana Lyst"), "a long enough password");
    await user.click(screen.getByRole("button", { name: "Set password" }));

    expect(await screen.findByText(/Someone else changed Ana Lyst while you had this page open/)).toBeInTheDocument();
    expect(api.callsTo("POST", "/api/users/2/password")[0].body).toEqual({
      password: "a long enough password",
      version: 3,
    });
    expect(screen.queryByText(/New password set/)).not.toBeInTheDocument();
  });
});
