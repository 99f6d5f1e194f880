import { screen, waitFor, within } from "@testing-library/react";
import userEvent from "@testing-library/user-event";
import { fakeApi, signedInAs, refusal } from "./support/fake-api";
import { renderApp } from "./support/render-app";

const entity = {
  code: "LKS-UK",
  name: "Larkspur Bank plc",
  regime: "frtb",
  pnlBasis: "max",
  currency: "GBP",
  qualitativeAddend: 0.25,
  supervisorName: "Prudential desk",
  supervisorEmails: ["desk@supervisor.test"],
  version: 3,
};

describe("Admin › Entities", () => {
  it("lists entities with the rule set in words and the addend as a right-aligned figure", async () => {
    fakeApi({ "GET /api/auth/session": signedInAs("admin"), "GET /api/entities": { status: 200, body: [entity] } });
    renderApp("/admin/entities");

    const table = await screen.findByRole("table", { name: "Legal entities" });
    const row = within(table).getAllByRole("row")[1];
    expect(within(row).getByRole("link", { name: "LKS-UK" })).toHaveAttribute("href", "/admin/entities/LKS-UK");
    expect(within(row).getByText("FRTB IMA")).toBeInTheDocument();
    expect(within(row).getByText("0.25")).toHaveClass("text-right", "figures");
  });

  it("when the rule set changes, then the P&L basis follows that rule set's default until chosen by hand", async () => {
    const api = fakeApi({
      "GET /api/auth/session": signedInAs("admin"),
      "GET /api/entities": { status: 200, body: [] },
      "POST /api/entities": ({ body }) => ({
        status: 201,
        body: { qualitativeAddend: 0, supervisorName: null, supervisorEmails: [], version: 1, ...(body as object) },
      }),
    });
    const user = userEvent.setup();
    renderApp("/admin/entities");

    expect(await screen.findByText("No entities yet")).toBeInTheDocument();
    const ruleSet = screen.getByLabelText("Rule set");
    const basis = screen.getByLabelText("P&L basis for the count");
    await user.selectOptions(ruleSet, "us");
    expect(basis).toHaveValue("actual");
    await user.selectOptions(ruleSet, "basel");
    expect(basis).toHaveValue("max");

    await user.selectOptions(basis, "hypothetical");
    await user.selectOptions(ruleSet, "us");
    expect(basis).toHaveValue("hypothetical");

    await user.type(screen.getByLabelText("Code"), "lks-us");
    await user.type(screen.getByLabelText("Name"), "Larkspur Securities LLC");
    await user.type(screen.getByLabelText("Currency"), "usd");
    await user.type(screen.getByLabelText("Supervisor contact e-mails"), "one@sup.test, two@sup.test");
    await user.click(screen.getByRole("button", { name: "Add entity" }));

    expect(await screen.findByText(/LKS-US added/)).toBeInTheDocument();
    expect(api.callsTo("POST", "/api/entities")[0].body).toEqual({
      code: "LKS-US",
      name: "Larkspur Securities LLC",
      regime: "us",
      pnlBasis: "hypothetical",
      currency: "USD",
      qualitativeAddend: 0,
      supervisorName: null,
      supervisorEmails: ["one@sup.test", "two@sup.test"],
    });
  });

  it("when a contact e-mail is not valid, then the message stands beside that field and nothing is sent", async () => {
    const api = fakeApi({
      "GET /api/auth/session": signedInAs("admin"),
      "GET /api/entities": { status: 200, body: [] },
    });
    const user = userEvent.setup();
    renderApp("/admin/entities");

    await user.type(await screen.findByLabelText("Code"), "LKS-EU");
    await user.type(screen.getByLabelText("Name"), "Larkspur Markets SA");
    await user.type(screen.getByLabelText("Currency"), "EUR");
    await user.type(screen.getByLabelText("Supervisor contact e-mails"), "desk@sup.test, not-an-address");
    await user.click(screen.getByRole("button", { name: "Add entity" }));

    expect(screen.getByLabelText("Supervisor contact e-mails")).toHaveAccessibleDescription(
      "Each contact must be a valid e-mail address",
    );
    expect(api.callsTo("POST", "/api/entities")).toHaveLength(0);
  });

  it("the entity page lists holidays by date and portfolios top of house first", async () => {
    fakeApi({
      "GET /api/auth/session": signedInAs("admin"),
      "GET /api/entities": { status: 200, body: [entity] },
      "GET /api/entities/LKS-UK/portfolios": {
        status: 200,
        body: [
          { code: "LKS-UK-RATES", name: "Rates", level: "desk" },
          { code: "LKS-UK", name: "Larkspur Bank plc", level: "top" },
        ],
      },
      "GET /api/entities/LKS-UK/holidays": {
        status: 200,
        body: [
          { date: "2026-12-28", name: "Boxing Day (substitute)" },
          { date: "2026-12-25", name: "Christmas Day" },
        ],
      },
    });
    renderApp("/admin/entities/LKS-UK");

    const holidays = await screen.findByRole("table", { name: "Holidays of LKS-UK" });
    const holidayRows = within(holidays).getAllByRole("row").slice(1);
    expect(holidayRows.map((r) => (r as HTMLTableRowElement).cells[0].textContent)).toEqual([
      "2026-12-25 (Fri)",
      "2026-12-28 (Mon)",
    ]);
    const portfolios = screen.getByRole("table", { name: "Portfolios of LKS-UK" });
    const levels = within(portfolios)
      .getAllByRole("row")
      .slice(1)
      .map((r) => (r as HTMLTableRowElement).cells[2].textContent);
    expect(levels).toEqual(["Top of house", "Trading desk"]);
  });

  it("when an admin removes a holiday, then a confirmation says the windows move, Cancel sends nothing, and only the confirmation deletes it", async () => {
    const api = fakeApi({
      "GET /api/auth/session": signedInAs("admin"),
      "GET /api/entities": { status: 200, body: [entity] },
      "GET /api/entities/LKS-UK/portfolios": { status: 200, body: [] },
      "GET /api/entities/LKS-UK/holidays": { status: 200, body: [{ date: "2026-12-25", name: "Christmas Day" }] },
      "DELETE /api/entities/LKS-UK/holidays/2026-12-25": { status: 204 },
    });
    const user = userEvent.setup();
    renderApp("/admin/entities/LKS-UK");

    await user.click(await screen.findByRole("button", { name: "Remove holiday 2026-12-25" }));
    const confirm = screen.getByRole("group", { name: "Remove holiday 2026-12-25" });
    expect(confirm).toHaveTextContent(
      /It becomes a business day of LKS-UK: every backtesting window, exception count and roll-off date that reaches it moves/,
    );
    await user.click(within(confirm).getByRole("button", { name: "Cancel" }));
    expect(screen.queryByRole("group", { name: "Remove holiday 2026-12-25" })).not.toBeInTheDocument();
    expect(api.callsTo("DELETE", "/api/entities/LKS-UK/holidays/2026-12-25")).toHaveLength(0);

    await user.click(screen.getByRole("button", { name: "Remove holiday 2026-12-25" }));
    await user.click(screen.getByRole("button", { name: "Remove the holiday" }));
    await waitFor(() => expect(api.callsTo("DELETE", "/api/entities/LKS-UK/holidays/2026-12-25")).toHaveLength(1));
  });

  it("the calendar says which days come from the library and which are the bank's own", async () => {
    fakeApi({
      "GET /api/auth/session": signedInAs("admin"),
      "GET /api/entities": { status: 200, body: [{ ...entity, country: "GB" }] },
      "GET /api/entities/LKS-UK/portfolios": { status: 200, body: [] },
      "GET /api/entities/LKS-UK/holidays": {
        status: 200,
        body: [
          { date: "2026-04-03", name: "Good Friday", source: "library" },
          { date: "2026-04-06", name: "Easter Monday", source: "library" },
          { date: "2026-12-24", name: "Christmas Eve (offices closed)", source: "bank" },
        ],
      },
    });
    renderApp("/admin/entities/LKS-UK");
    const table = await screen.findByRole("table", { name: "Holidays of LKS-UK" });
    const sources = within(table)
      .getAllByRole("row")
      .slice(1)
      .map((r) => (r as HTMLTableRowElement).cells[2].textContent);
    expect(sources).toEqual(["Public holiday (library)", "Public holiday (library)", "Bank closing day"]);
    expect(screen.getByText("2 public holidays from the library · 1 bank closing day")).toBeInTheDocument();
    expect(screen.getByLabelText("Calendar country")).toHaveValue("GB");
  });

  it("when an admin imports a year, then the confirmation states how many days change and that windows move; only it imports", async () => {
    const plan = {
      year: 2026,
      country: "GB",
      countryName: "United Kingdom (England and Wales)",
      add: [
        { date: "2026-04-03", name: "Good Friday" },
        { date: "2026-04-06", name: "Easter Monday" },
      ],
      remove: [{ date: "2026-06-01", name: "Old day" }],
      rename: [],
      alreadyBank: [],
      changes: 3,
    };
    const api = fakeApi({
      "GET /api/auth/session": signedInAs("admin"),
      "GET /api/entities": { status: 200, body: [{ ...entity, country: "GB" }] },
      "GET /api/entities/LKS-UK/portfolios": { status: 200, body: [] },
      "GET /api/entities/LKS-UK/holidays": { status: 200, body: [] },
      "GET /api/entities/LKS-UK/holiday-import": { status: 200, body: plan },
      "POST /api/entities/LKS-UK/holiday-import": { status: 200, body: plan },
    });
    const user = userEvent.setup();
    renderApp("/admin/entities/LKS-UK");
    const year = await screen.findByLabelText("Year");
    await user.clear(year);
    await user.type(year, "2026");
    await user.click(screen.getByRole("button", { name: "Check what changes" }));
    const confirm = await screen.findByRole("group", { name: "Import the 2026 public holidays" });
    expect(confirm).toHaveTextContent(
      "Import the 2026 public holidays of United Kingdom (England and Wales) into LKS-UK? 2 days stop being business days and 1 day becomes a business day again. Every backtesting window, exception count and roll-off date that reaches them moves",
    );
    expect(confirm).toHaveTextContent("2026-04-03 (Fri) Good Friday");
    await user.click(within(confirm).getByRole("button", { name: "Cancel" }));
    expect(api.callsTo("POST", "/api/entities/LKS-UK/holiday-import")).toHaveLength(0);
    expect(api.callsTo("GET", "/api/entities/LKS-UK/holiday-import")[0].search).toBe("?year=2026");

    await user.click(screen.getByRole("button", { name: "Check what changes" }));
    await user.click(await screen.findByRole("button", { name: "Import and move 3 days" }));
    await waitFor(() => expect(api.callsTo("POST", "/api/entities/LKS-UK/holiday-import")).toHaveLength(1));
    expect(api.callsTo("POST", "/api/entities/LKS-UK/holiday-import")[0].body).toEqual({ year: 2026, changes: 3 });
    expect(await screen.findByText(/Imported the 2026 public holidays/)).toBeInTheDocument();
  });

  it("when a euro entity has no calendar country, then the calendar says to choose one instead of offering an import", async () => {
    fakeApi({
      "GET /api/auth/session": signedInAs("admin"),
      "GET /api/entities": { status: 200, body: [{ ...entity, currency: "EUR", country: null }] },
      "GET /api/entities/LKS-UK/portfolios": { status: 200, body: [] },
      "GET /api/entities/LKS-UK/holidays": { status: 200, body: [] },
    });
    renderApp("/admin/entities/LKS-UK");
    expect(await screen.findByText(/No calendar country is chosen for LKS-UK/)).toBeInTheDocument();
    expect(screen.queryByRole("button", { name: "Check what changes" })).not.toBeInTheDocument();
    expect(screen.getByLabelText("Calendar country")).toHaveValue("");
  });

  it("when an admin saves the addend, then only the change and the version read are sent; a 409 shows the server's message", async () => {
    let conflict = false;
    const api = fakeApi({
      "GET /api/auth/session": signedInAs("admin"),
      "GET /api/entities": { status: 200, body: [entity] },
      "GET /api/entities/LKS-UK/portfolios": { status: 200, body: [] },
      "GET /api/entities/LKS-UK/holidays": { status: 200, body: [] },
      "PATCH /api/entities/LKS-UK": ({ body }) =>
        conflict
          ? refusal(409, "stale", "Someone else changed LKS-UK since you opened it (now version 4).")
          : { status: 200, body: { ...entity, ...(body as object), version: 4 } },
    });
    const user = userEvent.setup();
    renderApp("/admin/entities/LKS-UK");
    const addend = await screen.findByLabelText("Qualitative addend");
    await user.clear(addend);
    await user.type(addend, "0.3");
    await user.click(screen.getByRole("button", { name: /save changes/i }));
    await screen.findByText("Changes saved.");
    expect(api.callsTo("PATCH", "/api/entities/LKS-UK")[0].body).toEqual({ qualitativeAddend: 0.3, version: 3 });

    conflict = true;
    await user.clear(addend);
    await user.type(addend, "0.4");
    await user.click(screen.getByRole("button", { name: /save changes/i }));
    expect(await screen.findByText(/Someone else changed LKS-UK/)).toBeInTheDocument();
  });

  it("when the entity code does not exist, then the page says so", async () => {
    fakeApi({
      "GET /api/auth/session": signedInAs("admin"),
      "GET /api/entities": { status: 200, body: [entity] },
      "GET /api/entities/NOPE/portfolios": { status: 200, body: [] },
      "GET /api/entities/NOPE/holidays": { status: 200, body: [] },
    });
    renderApp("/admin/entities/NOPE");
    expect(await screen.findByText("There is no entity with the code NOPE.")).toBeInTheDocument();
  });
});
