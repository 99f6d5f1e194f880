import { screen, within } from "@testing-library/react";
import userEvent from "@testing-library/user-event";
import type { QueueItem } from "@shared/schemas/queue";
import type { SettingsRecord } from "@shared/schemas/determination";
import { fakeApi, signedInAs } from "./support/fake-api";
import { renderApp } from "./support/render-app";

const items: QueueItem[] = [
  {
    kind: "approved_not_filed",
    entity: "LKS-EU",
    title: "Q3 2026 of LKS-EU approved, not yet filed with the supervisor",
    href: "/quarters?entity=LKS-EU&snapshot=14",
  },
  {
    kind: "snapshot_submitted",
    entity: "LKS-UK",
    title: "Q2 2026 of LKS-UK submitted for sign-off by Ann Analyst",
    href: "/quarters?entity=LKS-UK&snapshot=9",
  },
  {
    kind: "settings_proposal",
    entity: "LKS-EU",
    title: "Settings of LKS-EU from 2026-10-01 proposed by Ada Admin (Supervisor letter)",
    href: "/waiting#settings-31",
  },
];

const proposal: SettingsRecord = {
  id: 31,
  entity: "LKS-EU",
  effectiveFrom: "2026-10-01",
  reference: "Supervisor letter",
  pnlBasis: "max",
  qualitativeAddend: 0.25,
  qualitativeAddendSvar: null,
  multiplierFloor: null,
  determinationFrequency: "quarterly",
  status: "proposed",
  proposedBy: "ada.admin@larkspur.test",
  proposedByName: "Ada Admin",
  proposedAt: "2026-11-30T09:00:00.000Z",
  decidedBy: null,
  decidedByName: null,
  decidedAt: null,
  decisionComment: null,
  inForceToday: false,
};

describe("Waiting for me", () => {
  it("when the chief risk officer has three items, then the navigation counts them and the screen groups them, each linking to where it is done", async () => {
    fakeApi({ "GET /api/auth/session": signedInAs("cro"), "GET /api/queue": { status: 200, body: items } });
    renderApp("/waiting");

    const nav = await screen.findByRole("navigation", { name: "Main" });
    expect(await within(nav).findByRole("link", { name: /^Waiting for me\s*3\s*items$/ })).toHaveAttribute(
      "href",
      "/waiting",
    );
    expect(await screen.findByRole("heading", { name: "Waiting for me", level: 1 })).toBeInTheDocument();
    const signOff = screen.getByRole("region", { name: "Quarters to sign off" });
    expect(within(signOff).getByRole("link", { name: items[1].title })).toHaveAttribute("href", items[1].href);
    const toFile = screen.getByRole("region", { name: "Approved quarters to file" });
    expect(within(toFile).getByRole("link", { name: items[0].title })).toHaveAttribute("href", items[0].href);
    // The sign-off comes before the filing: the order says what is most pressing.
    const headings = screen.getAllByRole("heading", { level: 2 }).map((h) => h.textContent);
    expect(headings.slice(0, 3)).toEqual([
      "Quarters to sign off 1 item",
      "Approved quarters to file 1 item",
      "Settings changes to decide 1 item",
    ]);
  });

  it("when the chief risk officer approves a settings proposal, then the confirmation says what it changes and only its acceptance sends the approval", async () => {
    let status: SettingsRecord["status"] = "proposed";
    const api = fakeApi({
      "GET /api/auth/session": signedInAs("cro"),
      "GET /api/queue": () => ({ status: 200, body: status === "proposed" ? items : items.slice(0, 2) }),
      "GET /api/entities/LKS-EU/settings": () => ({ status: 200, body: [{ ...proposal, status }] }),
      "POST /api/settings/31/approve": () => {
        status = "approved";
        return { status: 200, body: { ...proposal, status, decidedBy: "Test Person" } };
      },
    });
    const user = userEvent.setup();
    renderApp("/waiting#settings-31");

    const card = await screen.findByRole("region", { name: "Settings of LKS-EU from 2026-10-01" });
    expect(within(card).getByText("0.25")).toBeInTheDocument();
    await user.click(within(card).getByRole("button", { name: "Approve…" }));
    const confirm = within(card).getByRole("group", { name: "Approve the settings of LKS-EU" });
    expect(confirm).toHaveTextContent(
      "Approving puts these settings in force for LKS-EU from 2026-10-01: the multiplier determinations from that date on are computed again with them.",
    );
    expect(within(confirm).getByRole("button", { name: "Approve the settings" })).toHaveFocus();
    await user.keyboard("{Escape}");
    expect(within(card).getByRole("button", { name: "Approve…" })).toHaveFocus();
    expect(api.callsTo("POST", "/api/settings/31/approve")).toHaveLength(0);

    await user.click(within(card).getByRole("button", { name: "Approve…" }));
    await user.click(within(card).getByRole("button", { name: "Approve the settings" }));
    expect(api.callsTo("POST", "/api/settings/31/approve")[0].body).toEqual({});
    expect(
      await screen.findByText("Approved: the settings of LKS-EU are in force from 2026-10-01."),
    ).toBeInTheDocument();
  });

  it("when a reject has no reason, then the field asks for one and nothing is sent", async () => {
    const api = fakeApi({
      "GET /api/auth/session": signedInAs("cro"),
      "GET /api/queue": { status: 200, body: items },
      "GET /api/entities/LKS-EU/settings": { status: 200, body: [proposal] },
    });
    const user = userEvent.setup();
    renderApp("/waiting");
    const card = await screen.findByRole("region", { name: "Settings of LKS-EU from 2026-10-01" });
    await user.click(within(card).getByRole("button", { name: "Reject" }));
    expect(within(card).getByLabelText("Comment")).toHaveAccessibleDescription(
      /Say why it is rejected: the administrator reads it before proposing again/,
    );
    expect(api.callsTo("POST", "/api/settings/31/reject")).toHaveLength(0);
  });

  it("when nothing waits, then the screen says so and the navigation shows no count; treasury has no such screen", async () => {
    fakeApi({ "GET /api/auth/session": signedInAs("analyst"), "GET /api/queue": { status: 200, body: [] } });
    renderApp("/waiting");
    expect(await screen.findByText("Nothing is waiting for you")).toBeInTheDocument();
    const nav = screen.getByRole("navigation", { name: "Main" });
    expect(within(nav).getByRole("link", { name: "Waiting for me" })).toBeInTheDocument();
  });

  it("treasury sees no Waiting for me link", async () => {
    fakeApi({ "GET /api/auth/session": signedInAs("treasury"), "GET /api/entities": { status: 200, body: [] } });
    renderApp("/");
    const nav = await screen.findByRole("navigation", { name: "Main" });
    expect(within(nav).queryByRole("link", { name: /Waiting for me/ })).not.toBeInTheDocument();
  });
});
