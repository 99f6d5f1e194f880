import { screen, within } from "@testing-library/react";
import { fakeApi, signedInAs } from "./support/fake-api";
import { renderApp } from "./support/render-app";
import { larkspurUS } from "./support/entities";

const entities = [larkspurUS];

// Figures as the server's engine would return them; the screen only formats them.
const item = {
  entity: "LKS-US",
  name: "Larkspur Securities LLC",
  regime: "us",
  currency: "USD",
  portfolio: "LKS-US-TOTAL",
  asOf: "2026-11-30",
  complete: true,
  zone: "yellow",
  zoneLabel: "yellow",
  counted: 7,
  plusFactor: 0.65,
  multiplier: 3.65,
  addOn: 48_215_003.4,
  // The Q3 determination counted 5 (yellow, 3.40); the rolling count has since reached 7.
  inForce: {
    quarterEnd: "2026-09-30",
    effectiveFrom: "2026-10-01",
    counted: 5,
    zone: "yellow",
    zoneLabel: "yellow",
    plusFactor: 0.4,
    multiplier: 3.4,
    status: "approved",
  },
  nextRollOff: {
    date: "2026-02-11",
    leavesOn: "2027-02-08",
    actual: true,
    hypothetical: false,
    countAfter: 6,
    zoneAfter: "yellow",
    plusFactorAfter: 0.5,
  },
  openReviews: 3,
  openFindings: 2,
  quarterClose: { snapshotId: 12, quarterEnd: "2026-09-30", status: "approved" },
};

/** `role` opens the Overview with `overviewItem` as the server's only entity; its row of the standing table. */
async function standingRow(role: Parameters<typeof signedInAs>[0], overviewItem: object) {
  fakeApi({
    "GET /api/auth/session": signedInAs(role),
    "GET /api/entities": { status: 200, body: entities },
    "GET /api/overview": { status: 200, body: [overviewItem] },
  });
  renderApp("/");
  return within(await screen.findByRole("table", { name: "Where each entity stands" })).getAllByRole("row")[1];
}

describe("Overview", () => {
  it("for an analyst, each entity's row shows its zone by name, counted exceptions, multiplier and capital add-on with the currency", async () => {
    fakeApi({
      "GET /api/auth/session": signedInAs("analyst"),
      "GET /api/entities": { status: 200, body: entities },
      "GET /api/overview": { status: 200, body: [item] },
    });
    renderApp("/");

    const table = await screen.findByRole("table", { name: "Where each entity stands" });
    const row = within(table).getAllByRole("row")[1];
    const cells = within(row).getAllByRole("cell");
    expect(within(cells[1]).getByText("3.40")).toBeInTheDocument();
    expect(within(cells[1]).getByText("Yellow")).toBeInTheDocument();
    expect(within(cells[1]).getByText("in force since 2026-10-01 (Q3 2026, approved)")).toBeInTheDocument();
    expect(within(cells[2]).getByText("Yellow")).toBeInTheDocument();
    expect(within(row).getByText("7")).toHaveClass("text-right", "figures");
    expect(within(cells[5]).getByText("3.65")).toBeInTheDocument();
    expect(within(table).getByRole("columnheader", { name: "Indicative multiplier" })).toBeInTheDocument();
    expect(within(row).getByText("0.65")).toBeInTheDocument();
    expect(within(row).getByText("48,215,003 USD")).toBeInTheDocument();
    expect(within(row).getByText("2027-02-08")).toBeInTheDocument();
    expect(within(cells[8]).getByText("Yellow")).toBeInTheDocument();
    expect(within(row).getByRole("link", { name: "LKS-US" })).toHaveAttribute("href", "/backtest/LKS-US-TOTAL");
    expect(within(row).getByRole("link", { name: "3 open reviews for LKS-US" })).toHaveAttribute(
      "href",
      "/backtest/LKS-US-TOTAL#exceptions",
    );
    expect(within(row).getByRole("link", { name: "2 open findings for LKS-US" })).toHaveAttribute(
      "href",
      "/data?entity=LKS-US",
    );
    expect(within(row).getByRole("link", { name: "Quarter close of LKS-US: Q3 2026 · Approved" })).toHaveAttribute(
      "href",
      "/quarters?entity=LKS-US&snapshot=12",
    );
  });

  it("when an entity has no snapshot yet, then its quarter-close cell says so", async () => {
    const row = await standingRow("cro", { ...item, quarterClose: null });
    expect(within(row).getByText("No snapshot yet")).toBeInTheDocument();
  });

  it("when no quarter end with data has passed, then the multiplier in force says no determination exists yet", async () => {
    const row = await standingRow("analyst", { ...item, inForce: null });
    expect(within(row).getAllByRole("cell")[1]).toHaveTextContent("No determination yet");
  });

  it("when the window is short, then the count says provisional; an FRTB entity's middle zone reads Amber", async () => {
    const row = await standingRow("cro", {
      ...item,
      regime: "frtb",
      currency: "GBP",
      complete: false,
      nextRollOff: null,
      addOn: null,
    });
    expect(within(row).getByText("provisional")).toBeInTheDocument();
    expect(within(row).getAllByText("Amber")).toHaveLength(2);
    expect(within(row).getByText("None in the window")).toBeInTheDocument();
  });

  it("treasury's overview lists the entities and never asks for the live figures", async () => {
    const api = fakeApi({
      "GET /api/auth/session": signedInAs("treasury"),
      "GET /api/entities": { status: 200, body: entities },
    });
    renderApp("/");
    expect(
      await screen.findByRole("table", { name: "Legal entities and their backtesting rules" }),
    ).toBeInTheDocument();
    expect(api.callsTo("GET", "/api/overview")).toHaveLength(0);
  });
});
