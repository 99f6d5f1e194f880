import { configure, screen, waitFor, within } from "@testing-library/react";
import userEvent from "@testing-library/user-event";
import { fakeApi, signedInAs, type Call, type Reply, refusal } from "./support/fake-api";
import { renderApp } from "./support/render-app";
import { larkspurEU, larkspurEUInitialSettings } from "./support/entities";

const entities = [larkspurEU];

/** The first record, made with the entity; in force from the start. */
const initial = {
  ...larkspurEUInitialSettings,
  entity: "LKS-EU",
  status: "approved",
  proposedBy: null,
  proposedByName: null,
  proposedAt: null,
  decidedBy: null,
  decidedByName: null,
  decidedAt: "2026-01-05T09:00:00.000Z",
  decisionComment: null,
  inForceToday: true,
};

/** An admin's proposal: an addend of 0.50 from 3 August 2026 (the supervisor's letter SUP-2026-021). */
const proposal = {
  ...initial,
  id: 2,
  effectiveFrom: "2026-08-03",
  reference: "SUP-2026-021",
  qualitativeAddend: 0.5,
  status: "proposed",
  proposedBy: "admin@larkspur.test",
  proposedByName: "Ada Admin",
  proposedAt: "2026-07-29T10:00:00.000Z",
  decidedAt: null,
  inForceToday: false,
};

type Handler = Reply | ((c: Call) => Reply);

function routes(role: "admin" | "cro" | "analyst", records: object[], extra: Record<string, Handler> = {}) {
  return {
    "GET /api/auth/session": signedInAs(role),
    "GET /api/entities": { status: 200, body: entities },
    "GET /api/entities/LKS-EU/settings": { status: 200, body: records },
    ...extra,
  };
}

describe("Supervisory settings", { timeout: 20_000 }, () => {
  beforeAll(async () => {
    await Promise.all([import("@/app/routes/app-layout"), import("@/app/routes/settings")]);
    configure({ asyncUtilTimeout: 4000 });
  }, 30_000);

  it("when an admin opens the screen from the navigation, then the dated records show with status, reference and who proposed and decided them by name", async () => {
    fakeApi(routes("admin", [{ ...proposal }, initial]));
    renderApp("/");
    const nav = await screen.findByRole("navigation", { name: "Main" });
    await userEvent.setup().click(within(nav).getByRole("link", { name: "Supervisory settings" }));

    const table = await screen.findByRole("table", {
      name: "Supervisory settings of LKS-EU, newest effective date first",
    });
    const rows = within(table).getAllByRole("row").slice(1);
    expect(within(rows[0]).getByText("2026-08-03")).toBeInTheDocument();
    expect(within(rows[0]).getByText("Proposed")).toBeInTheDocument();
    expect(within(rows[0]).getByText("SUP-2026-021")).toBeInTheDocument();
    expect(within(rows[0]).getByText("Ada Admin")).toBeInTheDocument();
    expect(within(rows[0]).getByText(/addend 0\.50/)).toBeInTheDocument();
    expect(within(rows[1]).getByText("From the start")).toBeInTheDocument();
    expect(within(rows[1]).getByText("in force today")).toBeInTheDocument();
    // An admin proposes; approving is the CRO's.
    expect(screen.getByRole("form", { name: "Propose a settings change" })).toBeInTheDocument();
    expect(screen.getByText("Waiting for a chief risk officer to approve or reject it.")).toBeInTheDocument();
    expect(screen.queryByRole("button", { name: "Approve…" })).not.toBeInTheDocument();
  });

  it("when the admin's proposal is invalid, then the schema's messages show under the fields and nothing is sent; a valid one is sent with only the values that change", async () => {
    const api = fakeApi(
      routes("admin", [initial], {
        "POST /api/entities/LKS-EU/settings": { status: 201, body: proposal },
      }),
    );
    const user = userEvent.setup();
    renderApp("/settings?entity=LKS-EU");
    const form = await screen.findByRole("form", { name: "Propose a settings change" });

    await user.type(within(form).getByLabelText("Effective from"), "3 August");
    await user.type(within(form).getByLabelText("Qualitative addend"), "4");
    await user.click(within(form).getByRole("button", { name: "Propose the change" }));
    expect(within(form).getByText("A date as YYYY-MM-DD")).toBeInTheDocument();
    expect(within(form).getByText("At most 3")).toBeInTheDocument();
    expect(within(form).getByLabelText("Effective from")).toHaveAttribute("aria-invalid", "true");
    expect(api.callsTo("POST", "/api/entities/LKS-EU/settings")).toHaveLength(0);

    await user.clear(within(form).getByLabelText("Effective from"));
    await user.type(within(form).getByLabelText("Effective from"), "2026-08-03");
    await user.type(within(form).getByLabelText("Supervisor's decision reference"), "SUP-2026-021");
    await user.clear(within(form).getByLabelText("Qualitative addend"));
    await user.type(within(form).getByLabelText("Qualitative addend"), "0.5");
    await user.click(within(form).getByRole("button", { name: "Propose the change" }));
    await waitFor(() => expect(api.callsTo("POST", "/api/entities/LKS-EU/settings")).toHaveLength(1));
    expect(api.callsTo("POST", "/api/entities/LKS-EU/settings")[0].body).toEqual({
      effectiveFrom: "2026-08-03",
      reference: "SUP-2026-021",
      qualitativeAddend: 0.5,
    });
    expect(await screen.findByText(/Nothing changes until a chief risk officer approves it/)).toBeInTheDocument();
  });

  it("when the server refuses a date inside a signed-off quarter (422), then its message shows and the field is marked", async () => {
    fakeApi(
      routes("admin", [initial], {
        "POST /api/entities/LKS-EU/settings": refusal(
          422,
          "validation_failed",
          "LKS-EU's quarter ending 2026-06-30 is signed off and its figures never change, so a settings change can take effect from 2026-06-30 + 1 day at the earliest.",
          { fields: { effectiveFrom: "After 2026-06-30" } },
        ),
      }),
    );
    const user = userEvent.setup();
    renderApp("/settings?entity=LKS-EU");
    const form = await screen.findByRole("form", { name: "Propose a settings change" });
    await user.type(within(form).getByLabelText("Effective from"), "2026-06-15");
    await user.type(within(form).getByLabelText("Supervisor's decision reference"), "SUP-2026-014");
    await user.type(within(form).getByLabelText("Multiplier floor"), "3.6");
    await user.click(within(form).getByRole("button", { name: "Propose the change" }));
    expect(await within(form).findByText(/quarter ending 2026-06-30 is signed off/)).toBeInTheDocument();
    expect(within(form).getByText("After 2026-06-30")).toBeInTheDocument();
  });

  it("when a CRO approves, then the inline confirmation states the consequence before anything is sent, and the approval is sent once confirmed", async () => {
    let records: object[] = [{ ...proposal }, initial];
    const api = fakeApi(
      routes("cro", [], {
        "GET /api/entities/LKS-EU/settings": () => ({ status: 200, body: records }),
        "POST /api/settings/2/approve": () => {
          const approved = {
            ...proposal,
            status: "approved",
            decidedBy: "cro@larkspur.test",
            decidedByName: "Test Person",
            decidedAt: "2026-07-30T10:00:00.000Z",
          };
          records = [approved, { ...initial }];
          return { status: 200, body: approved };
        },
      }),
    );
    const user = userEvent.setup();
    renderApp("/settings?entity=LKS-EU");
    const waiting = await screen.findByRole("region", { name: "SUP-2026-021: from 2026-08-03" });
    const consequence =
      "From 2026-08-03 the multiplier of LKS-EU will include a qualitative addend of 0.50 instead of 0.00. Figures before that day do not change.";
    expect(within(waiting).getByTestId("consequence-2")).toHaveTextContent(consequence);

    await user.click(within(waiting).getByRole("button", { name: "Approve…" }));
    const confirm = within(waiting).getByRole("group", { name: "Confirm the approval" });
    expect(within(confirm).getByText(`${consequence} Approve it?`)).toBeInTheDocument();
    expect(within(confirm).getByRole("button", { name: "Approve the change" })).toHaveFocus();
    expect(api.callsTo("POST", "/api/settings/2/approve")).toHaveLength(0);

    await user.click(within(confirm).getByRole("button", { name: "Approve the change" }));
    await waitFor(() => expect(api.callsTo("POST", "/api/settings/2/approve")).toHaveLength(1));
    expect(api.callsTo("POST", "/api/settings/2/approve")[0].body).toEqual({});
    // The list is read again: nothing waits any more and the record reads approved, by name.
    await waitFor(() =>
      expect(screen.queryByRole("region", { name: "SUP-2026-021: from 2026-08-03" })).not.toBeInTheDocument(),
    );
    const table = screen.getByRole("table", { name: "Supervisory settings of LKS-EU, newest effective date first" });
    expect(within(within(table).getAllByRole("row")[1]).getByText("Approved")).toBeInTheDocument();
    expect(within(table).getByText("Test Person")).toBeInTheDocument();
  });

  it("when a CRO rejects without a reason, then the field says one is needed and nothing is sent", async () => {
    const api = fakeApi(routes("cro", [{ ...proposal }, initial]));
    const user = userEvent.setup();
    renderApp("/settings?entity=LKS-EU");
    const waiting = await screen.findByRole("region", { name: "SUP-2026-021: from 2026-08-03" });
    await user.click(within(waiting).getByRole("button", { name: "Reject…" }));
    const confirm = within(waiting).getByRole("group", { name: "Confirm the rejection" });
    await user.click(within(confirm).getByRole("button", { name: "Reject the change" }));
    expect(within(confirm).getByText(/Say why the change is rejected/)).toBeInTheDocument();
    expect(api.callsTo("POST", "/api/settings/2/reject")).toHaveLength(0);
  });

  it("when the CRO proposed the change themselves, then the screen says why they cannot approve it and offers no approval", async () => {
    fakeApi(routes("cro", [{ ...proposal, proposedBy: "cro@larkspur.test", proposedByName: "Test Person" }, initial]));
    renderApp("/settings?entity=LKS-EU");
    const waiting = await screen.findByRole("region", { name: "SUP-2026-021: from 2026-08-03" });
    expect(within(waiting).getByTestId("own-proposal-2")).toHaveTextContent(
      "You proposed this change, so another person with the chief risk officer role must approve it (four eyes).",
    );
    expect(within(waiting).queryByRole("button", { name: "Approve…" })).not.toBeInTheDocument();
  });

  it("an analyst reads the records and may neither propose nor decide", async () => {
    fakeApi(routes("analyst", [{ ...proposal }, initial]));
    renderApp("/settings?entity=LKS-EU");
    await screen.findByRole("table", { name: "Supervisory settings of LKS-EU, newest effective date first" });
    expect(screen.getByTestId("settings-in-force")).toHaveTextContent(
      "In force today: Higher of actual and hypothetical · addend 0.00 · no floor · quarterly",
    );
    expect(screen.queryByRole("form", { name: "Propose a settings change" })).not.toBeInTheDocument();
    expect(screen.queryByRole("button", { name: "Approve…" })).not.toBeInTheDocument();
  });
});
