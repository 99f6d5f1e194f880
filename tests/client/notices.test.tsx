import { configure, screen, within } from "@testing-library/react";
import userEvent from "@testing-library/user-event";
import { fakeApi, signedInAs } from "./support/fake-api";
import { renderApp } from "./support/render-app";
import { larkspurEU } from "./support/entities";

const entities = [
  { ...larkspurEU, supervisorName: "Test Authority", supervisorEmails: ["a@authority.test", "b@authority.test"] },
];

/** An overshooting of 14 October 2026, drafted, due on 21 October and still not sent: late. */
const late = {
  id: 7,
  entity: "LKS-EU",
  entityName: larkspurEU.name,
  portfolio: "LKS-EU-TOTAL",
  currency: "EUR",
  date: "2026-10-14",
  status: "open",
  revealedOn: "2026-10-14",
  dueOn: "2026-10-21",
  late: true,
  series: "actual",
  actualPnl: -1250.5,
  hypotheticalPnl: -900,
  var99: 1000,
  excess: 250.5,
  cause: "Rates moved after the decision.",
  draftedBy: "Theo Marchetti",
  draftedAt: "2026-10-15T09:00:00.000Z",
  sentBy: null,
  sentAt: null,
  recipients: [],
  withdrawnAt: null,
  note: null,
  version: 2,
};

describe("Overshooting notices screen", { timeout: 20_000 }, () => {
  beforeAll(async () => {
    await Promise.all([import("@/app/routes/app-layout"), import("@/app/routes/notices")]);
    configure({ asyncUtilTimeout: 4000 });
  }, 30_000);

  it("when the CRO opens a late drafted notice, then it shows as late, and sending asks first with every recipient listed and sends the version seen", async () => {
    const api = fakeApi({
      "GET /api/auth/session": signedInAs("cro", "Margot Ellsworth"),
      "GET /api/entities": { status: 200, body: entities },
      "GET /api/queue": { status: 200, body: [] },
      "GET /api/notices": { status: 200, body: [late] },
      "POST /api/notices/7/send": {
        status: 200,
        body: {
          ...late,
          status: "sent",
          sentBy: "Margot Ellsworth",
          sentAt: "2026-10-22T10:00:00.000Z",
          recipients: entities[0].supervisorEmails,
          version: 3,
        },
      },
    });
    const user = userEvent.setup();
    renderApp("/notices?entity=LKS-EU&notice=7");

    const row = (await screen.findByRole("table", { name: "Overshooting notices" })).querySelector("tbody tr")!;
    expect(within(row as HTMLElement).getByText("Late")).toBeInTheDocument();
    expect(screen.getByTestId("notice-standing")).toHaveTextContent(/late: it was due on 2026-10-21/);
    expect(api.callsTo("GET", "/api/notices")[0].search).toBe("?entity=LKS-EU");

    await user.click(screen.getByRole("button", { name: "Send to the supervisor…" }));
    const confirmation = screen.getByRole("group", { name: "Confirm sending the notice" });
    expect(
      within(confirmation)
        .getAllByRole("listitem")
        .map((li) => li.textContent),
    ).toEqual(["a@authority.test", "b@authority.test"]);
    expect(api.callsTo("POST", "/api/notices/7/send")).toEqual([]);
    await user.click(within(confirmation).getByRole("button", { name: "Send the notice" }));
    expect(await screen.findByText("Sent to a@authority.test, b@authority.test.")).toHaveFocus();
    expect(api.callsTo("POST", "/api/notices/7/send").map((c) => c.body)).toEqual([{ version: 2 }]);
  });
});
