import { configure, screen, within } from "@testing-library/react";
import { capitalHistorySchema, forecastResponseSchema } from "@shared/schemas/capital";
import { capitalOnDateSchema } from "@shared/schemas/determination";
import { fakeApi, signedInAs } from "./support/fake-api";
import { renderApp } from "./support/render-app";
import { larkspurEU, larkspurUK } from "./support/entities";

// Display fixture: the screen must show what the server computed, unchanged. The figures are the
// hand-worked example of tests/shared/frtb-capital.test.ts (MAR33.41–33.45): C_A 270, DRC 20,
// IMA_G,A 290, C_U 120, SA_all 400, SA_G,A 350, k = 3/14, surcharge 12.86, ACR 400 (capped).
const onDate = capitalOnDateSchema.parse({
  entity: "LKS-UK",
  currency: "GBP",
  date: "2026-11-27",
  inForce: null,
  indicative: {
    asOf: "2026-11-27",
    counted: 2,
    zone: "green",
    zoneLabel: "green",
    plusFactor: 0,
    multiplier: 1.5,
    multiplierSvar: 1.5,
    windowComplete: true,
  },
  requirement: null,
  addOn: null,
  indicativeRequirement: 400,
  capitalNote: null,
  nextDetermination: { quarterEnd: "2026-12-31", asOf: "2026-12-31", effectiveFrom: "2027-01-04" },
  settings: {
    id: null,
    effectiveFrom: "2025-01-01",
    reference: "initial",
    pnlBasis: "hypothetical",
    qualitativeAddend: 0,
    qualitativeAddendSvar: null,
    multiplierFloor: null,
    determinationFrequency: "quarterly",
  },
  frtb: {
    statusQuarterEnd: "2026-09-30",
    multiplier: 1.5,
    imccPrev: 160,
    imccAvg: 160,
    sesPrev: 30,
    sesAvg: 30,
    binding: "average",
    ca: 270,
    drc: 20,
    imaGA: 290,
    cU: 120,
    saAll: 400,
    saGA: 350,
    saAmber: 150,
    k: 0.214286,
    surcharge: 12.86,
    acrTotal: 400,
    sources: { imcc: "desks", drc: "desks", saAll: "top", saGA: "desks" },
    desks: [
      {
        code: "LKS-UK-CREDIT",
        status: "out-of-model",
        backtest99: 14,
        backtest975: 25,
        plaZone: null,
        plaObservations: 180,
        reason: "Fails desk backtesting: 14 exceptions at 99% (limit 12) (MAR32.19).",
        sa: 120,
      },
      {
        code: "LKS-UK-FX",
        status: "in-model",
        backtest99: 3,
        backtest975: 8,
        plaZone: "green",
        plaObservations: 250,
        reason: "Backtesting within limits and PLA green.",
        sa: 200,
      },
      {
        code: "LKS-UK-RATES",
        status: "amber",
        backtest99: 4,
        backtest975: 9,
        plaZone: "amber",
        plaObservations: 250,
        reason: "PLA amber zone: in the model with the capital surcharge (MAR33.45).",
        sa: 150,
      },
    ],
    notes: [
      "The standardised charge of the desks in the model together (sa_ga) is not supplied: SA_G,A adds up the desks' own.",
    ],
  },
  frtbNote: null,
  frtbTimeline: [
    {
      quarterEnd: "2026-06-30",
      asOf: "2026-06-30",
      effectiveFrom: "2026-07-01",
      desks: [
        {
          code: "LKS-UK-CREDIT",
          status: "in-model",
          backtest99: 9,
          backtest975: 20,
          plaZone: null,
          plaObservations: 120,
          reason: "r",
        },
        {
          code: "LKS-UK-FX",
          status: "in-model",
          backtest99: 2,
          backtest975: 6,
          plaZone: "green",
          plaObservations: 250,
          reason: "r",
        },
      ],
    },
    {
      quarterEnd: "2026-09-30",
      asOf: "2026-09-30",
      effectiveFrom: "2026-10-01",
      desks: [
        {
          code: "LKS-UK-CREDIT",
          status: "out-of-model",
          backtest99: 14,
          backtest975: 25,
          plaZone: null,
          plaObservations: 180,
          reason: "r",
        },
        {
          code: "LKS-UK-FX",
          status: "in-model",
          backtest99: 3,
          backtest975: 8,
          plaZone: "green",
          plaObservations: 250,
          reason: "r",
        },
        {
          code: "LKS-UK-RATES",
          status: "amber",
          backtest99: 4,
          backtest975: 9,
          plaZone: "amber",
          plaObservations: 250,
          reason: "r",
        },
      ],
    },
  ],
});

const forecast = forecastResponseSchema.parse({
  entity: "LKS-UK",
  portfolio: "LKS-UK-TOTAL",
  regime: "frtb",
  currency: "GBP",
  asOf: "2026-11-27",
  date: "2026-12-31",
  knownRemaining: 2,
  newDays: 23,
  distribution: [{ exceptions: 2, probability: 1 }],
  zones: { green: 1, yellow: 0, red: 0 },
  ifNoNewException: { counted: 2, zone: "green", plusFactor: 0, addOn: 0 },
  expectedAddOn: 0,
  nextExceptionCost: 0,
  today: { counted: 2, zone: "green", plusFactor: 0, multiplier: 1.5, windowComplete: true },
  rollOffs: [],
  startsFrom: { kind: "current", quarterEnd: null, asOf: "2026-11-27", status: null },
  inForce: null,
  bitesFrom: { quarterEnd: "2026-12-31", asOf: "2026-12-31", effectiveFrom: "2027-01-04" },
  nextExceptionBitesFrom: { quarterEnd: "2026-12-31", asOf: "2026-12-31", effectiveFrom: "2027-01-04" },
});

function routes(role: "analyst" | "treasury") {
  return {
    "GET /api/auth/session": signedInAs(role),
    "GET /api/entities": { status: 200, body: [larkspurEU, larkspurUK] },
    "GET /api/entities/LKS-UK/capital/history": { status: 200, body: capitalHistorySchema.parse([]) },
    "GET /api/entities/LKS-UK/capital/forecast": { status: 200, body: forecast },
    "GET /api/entities/LKS-UK/capital": { status: 200, body: onDate },
  };
}

describe("Capital screen, FRTB aggregation", { timeout: 20_000 }, () => {
  beforeAll(async () => {
    await Promise.all([import("@/app/routes/app-layout"), import("@/app/routes/capital")]);
    configure({ asyncUtilTimeout: 4000 });
  }, 30_000);

  it("when an analyst opens an FRTB entity, then every intermediate figure, the desks and their timeline are shown as the server sent them", async () => {
    const api = fakeApi(routes("analyst"));
    renderApp("/capital?entity=LKS-UK");

    const section = await screen.findByRole("region", { name: "FRTB aggregate capital requirement" });
    expect(within(section).getByTestId("frtb-summary")).toHaveTextContent(
      "the aggregate capital requirement is 400 GBP, capped by the standardised charge of all desks. LKS-UK-CREDIT out of the model; LKS-UK-RATES amber on P&L attribution (statuses of the Q3 2026 determination).",
    );
    const steps = within(section).getByRole("table", { name: /The aggregation step by step/ });
    expect(within(steps).getByTestId("frtb-ca")).toHaveTextContent("270 GBP");
    expect(within(steps).getByTestId("frtb-ima")).toHaveTextContent("290 GBP");
    expect(within(steps).getByTestId("frtb-cu")).toHaveTextContent("120 GBP");
    expect(within(steps).getByTestId("frtb-surcharge")).toHaveTextContent("13 GBP"); // amounts show in whole units;
    expect(within(steps).getByTestId("frtb-acr")).toHaveTextContent("400 GBP");
    expect(within(steps).getByText("0.2143")).toBeInTheDocument();
    expect(within(section).getByTestId("frtb-notes")).toHaveTextContent(/sa_ga\) is not supplied/);

    const desks = within(section).getByRole("table", { name: /Desks on this date/ });
    const credit = within(desks).getByText("LKS-UK-CREDIT").closest("tr")!;
    expect(within(credit).getByText("Out of the model (standardised)")).toBeInTheDocument();
    expect(within(credit).getByText("Provisional (180 of 250 days)")).toBeInTheDocument();
    const rates = within(desks).getByText("LKS-UK-RATES").closest("tr")!;
    expect(within(rates).getByText("Amber")).toBeInTheDocument();

    const timeline = within(section).getByRole("table", { name: /Desk status at each determination/ });
    const rows = within(timeline).getAllByRole("row").slice(1);
    expect(
      rows.map((r) =>
        within(r)
          .getAllByRole("cell")
          .map((c) => c.textContent),
      ),
    ).toEqual([
      ["LKS-UK-CREDIT", "In", "Out"],
      ["LKS-UK-FX", "In", "In"],
      ["LKS-UK-RATES", "—", "Amber"],
    ]);
    expect(api.callsTo("GET", "/api/entities/LKS-UK/capital")).toHaveLength(1);
  });

  it("when treasury opens an FRTB entity, then the current aggregation is not asked for (treasury reads signed-off figures)", async () => {
    const api = fakeApi(routes("treasury"));
    renderApp("/capital?entity=LKS-UK");
    await screen.findByRole("region", { name: "Where we stand" });
    expect(screen.queryByRole("region", { name: "FRTB aggregate capital requirement" })).not.toBeInTheDocument();
    expect(api.callsTo("GET", "/api/entities/LKS-UK/capital")).toHaveLength(0);
  });
});
