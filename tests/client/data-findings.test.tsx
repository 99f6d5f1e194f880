import { screen, within } from "@testing-library/react";
import userEvent from "@testing-library/user-event";
import { fakeApi, signedInAs, type Call, refusal } from "./support/fake-api";
import { renderApp } from "./support/render-app";
import { larkspurEU, larkspurUS } from "./support/entities";

const entities = [larkspurEU, larkspurUS];

function finding(id: number, over: Record<string, unknown> = {}) {
  return {
    id,
    entity: "LKS-EU",
    portfolio: "LKS-EU-TOTAL",
    kind: "missing_day",
    from: "2026-03-09",
    to: "2026-03-10",
    detail: "2 business days without a row",
    status: "open",
    note: null,
    closedBy: null,
    closedAt: null,
    version: 3,
    ...over,
  };
}

const findings = [
  finding(1),
  finding(2, {
    kind: "stale_var",
    entity: "LKS-US",
    portfolio: "LKS-US-TOTAL",
    detail: "VaR 3,100,000.00 on 6 days",
    version: 1,
  }),
  finding(3, { kind: "pnl_without_var", from: "2026-03-12", to: "2026-03-12" }),
  finding(4, { kind: "var_without_pnl" }),
  finding(5, { kind: "outlier", detail: "Actual P&L -24,000,000.00 is 5.7 × VaR" }),
];

function routes(handler: (call: Call) => { status: number; body?: unknown }, role: "analyst" | "cro" = "analyst") {
  return {
    "GET /api/auth/session": signedInAs(role),
    "GET /api/entities": { status: 200, body: entities },
    "GET /api/uploads": { status: 200, body: [] },
    "GET /api/findings": handler,
  };
}

const query = (c: Call) => Object.fromEntries(new URLSearchParams(c.search));

describe("Data › data-quality findings", () => {
  it("lists open findings by default, each kind in plain words, and filters by entity and status through the server", async () => {
    const api = fakeApi(
      routes((c) => {
        const q = query(c);
        if (q.status === "resolved") return { status: 200, body: [] };
        return { status: 200, body: findings.filter((f) => !q.entity || f.entity === q.entity) };
      }),
    );
    const user = userEvent.setup();
    renderApp("/data");

    const table = await screen.findByRole("table", { name: "Data-quality findings" });
    for (const words of ["Missing business days", "Stale VaR", "P&L without VaR", "VaR without P&L", "Outlier"]) {
      expect(within(table).getByText(words)).toBeInTheDocument();
    }
    expect(within(table).getByText("2026-03-12")).toBeInTheDocument();
    expect(query(api.callsTo("GET", "/api/findings")[0])).toEqual({ status: "open" });

    await user.selectOptions(screen.getByLabelText("Entity"), "LKS-US");
    expect(await screen.findByText("1 open for LKS-US")).toBeInTheDocument();
    expect(query(api.calls.at(-1)!)).toEqual({ entity: "LKS-US", status: "open" });
    expect(within(screen.getByRole("table", { name: "Data-quality findings" })).getAllByRole("row")).toHaveLength(2);

    await user.selectOptions(screen.getByLabelText("Status"), "resolved");
    expect(await screen.findByText("No resolved findings for LKS-US")).toBeInTheDocument();
    expect(query(api.calls.at(-1)!)).toEqual({ entity: "LKS-US", status: "resolved" });

    await user.selectOptions(screen.getByLabelText("Status"), "all");
    expect(await screen.findByText("1 in all for LKS-US")).toBeInTheDocument();
    expect(query(api.calls.at(-1)!)).toEqual({ entity: "LKS-US" });
  });

  it("explaining a finding sends the note with the row's version; a 409 shows the server's message and reloads the list", async () => {
    let version = 3;
    const api = fakeApi({
      ...routes(() => ({ status: 200, body: [finding(1, { version })] })),
      "PUT /api/findings/1": () => {
        version = 4;
        return refusal(409, "stale", "Finding #1 was changed by someone else (now version 4); reload and try again.");
      },
    });
    const user = userEvent.setup();
    renderApp("/data");

    await user.click(
      await screen.findByRole("button", { name: "Explain finding #1: Missing business days on LKS-EU-TOTAL" }),
    );
    await user.type(screen.getByLabelText("Why is it acceptable?"), "Desk closed for the move; no positions held.");
    const before = api.callsTo("GET", "/api/findings").length;
    await user.click(screen.getByRole("button", { name: "Record explanation" }));

    expect(
      await screen.findByText("Finding #1 was changed by someone else (now version 4); reload and try again."),
    ).toBeInTheDocument();
    expect(api.callsTo("PUT", "/api/findings/1")[0].body).toEqual({
      status: "explained",
      note: "Desk closed for the move; no positions held.",
      version: 3,
    });
    await vi.waitFor(() => expect(api.callsTo("GET", "/api/findings").length).toBeGreaterThan(before), {
      timeout: 8000,
    });
  });

  it("resolving with a note closes the finding and says so; too short a note is refused beside the field", async () => {
    let closed = false;
    const api = fakeApi({
      ...routes(() => ({ status: 200, body: closed ? [] : [finding(1)] })),
      "PUT /api/findings/1": (c) => {
        closed = true;
        const body = c.body as { note: string };
        return {
          status: 200,
          body: finding(1, {
            status: "resolved",
            note: body.note,
            closedBy: "analyst@larkspur.test",
            closedAt: "2026-03-31T18:30:00.000Z",
            version: 4,
          }),
        };
      },
    });
    const user = userEvent.setup();
    renderApp("/data");

    await user.click(await screen.findByRole("button", { name: /^Resolve finding #1/ }));
    const note = screen.getByLabelText("How was it resolved?");
    await user.type(note, "ok");
    await user.click(screen.getByRole("button", { name: "Mark resolved" }));
    expect(note).toHaveAttribute("aria-invalid", "true");
    expect(note).toHaveAccessibleDescription("Say in a few words how it was resolved or why it is acceptable");
    expect(api.callsTo("PUT", "/api/findings/1")).toHaveLength(0);

    await user.type(note, " — both days uploaded in #42");
    await user.click(screen.getByRole("button", { name: "Mark resolved" }));
    expect(
      await screen.findByText("Missing business days on LKS-EU-TOTAL (2026-03-09 – 2026-03-10) is now resolved."),
    ).toBeInTheDocument();
    expect(await screen.findByText("No open findings")).toBeInTheDocument();
  });

  it("a long list is read fifty at a time and narrowed to one kind on the page", async () => {
    const many = Array.from({ length: 60 }, (_, i) => finding(i + 1, { kind: i < 55 ? "stale_var" : "outlier" }));
    fakeApi(routes(() => ({ status: 200, body: many })));
    const user = userEvent.setup();
    renderApp("/data");

    const rows = () =>
      within(screen.getByRole("table", { name: "Data-quality findings" })).getAllByRole("row").length - 1;
    expect(await screen.findByText("1–50 of 60")).toBeInTheDocument();
    expect(rows()).toBe(50);
    await user.click(screen.getByRole("button", { name: "Next 50" }));
    expect(screen.getByText("51–60 of 60")).toBeInTheDocument();
    expect(rows()).toBe(10);

    await user.selectOptions(screen.getByLabelText("What"), "outlier");
    expect(screen.getByText("60 open · 5 outlier", { exact: false })).toBeInTheDocument();
    expect(rows()).toBe(5);
    expect(screen.queryByRole("navigation", { name: "Pages of findings" })).not.toBeInTheDocument();
  });

  it("the chief risk officer reads the findings with their notes but cannot close them", async () => {
    fakeApi(
      routes(
        () => ({
          status: 200,
          body: [
            finding(1, {
              status: "explained",
              note: "Exchange holiday not in the calendar",
              closedBy: "analyst@larkspur.test",
              closedAt: "2026-03-11T09:00:00.000Z",
            }),
          ],
        }),
        "cro",
      ),
    );
    renderApp("/data?status=all");

    const table = await screen.findByRole("table", { name: "Data-quality findings" });
    expect(within(table).getByText("Explained")).toBeInTheDocument();
    expect(within(table).getByText("“Exchange holiday not in the calendar”")).toBeInTheDocument();
    expect(within(table).getByText("11 Mar 2026, 09:00 UTC")).toBeInTheDocument();
    expect(screen.queryByRole("button", { name: /Resolve|Explain/ })).not.toBeInTheDocument();
  });
});
