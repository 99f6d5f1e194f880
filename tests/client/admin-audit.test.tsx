import { screen, within } from "@testing-library/react";
import userEvent from "@testing-library/user-event";
import { fakeApi, signedInAs, type Call } from "./support/fake-api";
import { renderApp } from "./support/render-app";

function event(id: number, action: string) {
  return {
    id,
    at: "2026-03-31T17:45:00.000Z",
    actorEmail: "admin@larkspur.test",
    action,
    target: "LKS-EU",
    ip: "10.1.2.3",
    before: { qualitativeAddend: 0 },
    after: { qualitativeAddend: 0.25 },
  };
}

describe("Admin › Audit log", () => {
  it("shows who did what, when, from where, with before and after in a details element", async () => {
    fakeApi({
      "GET /api/auth/session": signedInAs("admin"),
      "GET /api/audit-events": { status: 200, body: { items: [event(1, "entity.update")], total: 1 } },
    });
    renderApp("/admin/audit");

    const table = await screen.findByRole("table", { name: "Audit events, newest first" });
    const row = within(table).getAllByRole("row")[1];
    expect(within(row).getByText("31 Mar 2026, 17:45 UTC")).toBeInTheDocument();
    expect(within(row).getByText("admin@larkspur.test")).toBeInTheDocument();
    expect(within(row).getByText("entity.update")).toBeInTheDocument();
    expect(within(row).getByText("10.1.2.3")).toBeInTheDocument();
    expect(within(row).getByText('{"qualitativeAddend":0.25}').closest("details")).not.toBeNull();
  });

  it("names the person and the target in words, with the recorded e-mail and reference on hover", async () => {
    fakeApi({
      "GET /api/auth/session": signedInAs("admin"),
      "GET /api/audit-events": {
        status: 200,
        body: {
          items: [
            {
              ...event(2, "snapshot.approve"),
              actorName: "Margot Ellsworth",
              actorEmail: "cro@larkspur.test",
              target: "snapshot #17",
              targetWords: "LKS-EU Q3 2026 snapshot",
            },
          ],
          total: 1,
        },
      },
    });
    renderApp("/admin/audit");
    const table = await screen.findByRole("table", { name: "Audit events, newest first" });
    const row = within(table).getAllByRole("row")[1];
    expect(within(row).getByText("Margot Ellsworth")).toHaveAttribute("title", "cro@larkspur.test");
    expect(within(row).getByText("LKS-EU Q3 2026 snapshot")).toHaveAttribute("title", "snapshot #17");
    expect(within(row).queryByText("snapshot #17")).not.toBeInTheDocument();
  });

  it("pages through the log and filters by action, asking the server for that slice", async () => {
    const asked: Call[] = [];
    fakeApi({
      "GET /api/auth/session": signedInAs("admin"),
      "GET /api/audit-events": (call) => {
        asked.push(call);
        const q = new URLSearchParams(call.search);
        if (q.get("action") === "auth.sign_in_failed") return { status: 200, body: { items: [], total: 0 } };
        const offset = Number(q.get("offset"));
        return {
          status: 200,
          body: { items: [event(offset + 1, offset ? "user.update" : "user.create")], total: 120 },
        };
      },
    });
    const user = userEvent.setup();
    renderApp("/admin/audit");

    expect(await screen.findByText("1–50 of 120")).toBeInTheDocument();
    await user.click(screen.getByRole("link", { name: "Older" }));
    expect(await screen.findByText("user.update")).toBeInTheDocument();
    expect(screen.getByText("Page 2 of 3")).toBeInTheDocument();
    expect(new URLSearchParams(asked.at(-1)!.search).get("offset")).toBe("50");

    await user.type(screen.getByLabelText("Action"), "auth.sign_in_failed");
    await user.click(screen.getByRole("button", { name: "Filter" }));
    expect(await screen.findByText("No events match this filter")).toBeInTheDocument();
    const last = new URLSearchParams(asked.at(-1)!.search);
    expect(last.get("action")).toBe("auth.sign_in_failed");
    expect(last.get("offset")).toBe("0");
  });

  it("filters by person and days, and downloads exactly that slice as CSV under the server's file name", async () => {
    const asked: Call[] = [];
    fakeApi({
      "GET /api/auth/session": signedInAs("admin"),
      "GET /api/audit-events": (call) => {
        asked.push(call);
        return { status: 200, body: { items: [event(7, "snapshot.approve")], total: 1 } };
      },
      "GET /api/audit-events.csv": (call) => {
        asked.push(call);
        return {
          status: 200,
          raw: "\ufeffEvent,At\r\n7,2026-03-31T17:45:00.000Z\r\n",
          headers: { "Content-Type": "text/csv", "Content-Disposition": 'attachment; filename="Audit-log.csv"' },
        };
      },
    });
    const saved: string[] = [];
    URL.createObjectURL = vi.fn(() => "blob:quartermark.test/1");
    URL.revokeObjectURL = vi.fn();
    vi.spyOn(HTMLAnchorElement.prototype, "click").mockImplementation(function (this: HTMLAnchorElement) {
      saved.push(this.download);
    });
    const user = userEvent.setup();
    renderApp("/admin/audit");
    await screen.findByText("snapshot.approve");

    await user.type(screen.getByLabelText("Person (e-mail)"), "a.moreau");
    await user.type(screen.getByLabelText("From"), "2026-03-01");
    await user.type(screen.getByLabelText("To"), "2026-02-01");
    expect(screen.getByText("The last day comes before the first")).toBeInTheDocument();
    await user.clear(screen.getByLabelText("To"));
    await user.type(screen.getByLabelText("To"), "2026-03-31");
    await user.click(screen.getByRole("button", { name: "Filter" }));
    await vi.waitFor(() => expect(new URLSearchParams(asked.at(-1)!.search).get("actor")).toBe("a.moreau"));
    const filtered = new URLSearchParams(asked.at(-1)!.search);
    expect([filtered.get("from"), filtered.get("to")]).toEqual(["2026-03-01", "2026-03-31"]);

    await screen.findByRole("link", { name: "Clear filter" }); // the screen now stands on the filter
    await user.click(await screen.findByRole("button", { name: "Download these events as CSV" }));
    await vi.waitFor(() => expect(saved).toEqual(["Audit-log.csv"]));
    const download = asked.at(-1)!;
    expect(download.path).toBe("/api/audit-events.csv");
    expect(Object.fromEntries(new URLSearchParams(download.search))).toEqual({
      actor: "a.moreau",
      from: "2026-03-01",
      to: "2026-03-31",
    });
    vi.restoreAllMocks();
  });

  it("when nothing has been recorded, then the empty state says what will appear", async () => {
    fakeApi({
      "GET /api/auth/session": signedInAs("admin"),
      "GET /api/audit-events": { status: 200, body: { items: [], total: 0 } },
    });
    renderApp("/admin/audit");
    expect(await screen.findByText("No events recorded yet")).toBeInTheDocument();
  });
});
