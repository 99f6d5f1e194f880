import { configure, screen, waitFor, within } from "@testing-library/react";
import userEvent from "@testing-library/user-event";
import {
  forecastResponseSchema,
  whatIfResponseSchema,
  type ForecastResponse,
  type WhatIfResponse,
  capitalHistorySchema,
  type CapitalHistoryItem,
} from "@shared/schemas/capital";
import { binomialPmf } from "@shared/backtest/binomial";
import { everyFigure } from "@/lib/query-scope";
import { fakeApi, signedInAs, type Call, type Reply, refusal } from "./support/fake-api";
import { renderApp } from "./support/render-app";
import { larkspurEU, larkspurUK } from "./support/entities";

// Display fixtures: the screen must show what the server computed, unchanged. Zones, plus factors and
// multipliers follow BCBS 1996 Table 2 (EU CRR Art. 366 uses the same addends): 4 exceptions green 0.00,
// 5 yellow 0.40, 6 yellow 0.50, 8 yellow 0.75 on a base multiplier of 3. Each fixture is parsed with
// the shared schema, so a change of contract fails here first.

const entities = [larkspurEU, { ...larkspurUK, pnlBasis: "max" }];

function quarter(
  over: Partial<CapitalHistoryItem> & Pick<CapitalHistoryItem, "quarterEnd" | "snapshotId">,
): CapitalHistoryItem {
  return {
    status: "approved",
    zone: "green",
    counted: 4,
    plusFactor: 0,
    multiplier: 3,
    capital: 360_000_000,
    addOn: 0,
    restatedAfterSignOff: false,
    windowComplete: true,
    ...over,
  };
}

/** What the server sends treasury: signed-off quarters only, oldest first. */
const signedOffHistory = capitalHistorySchema.parse([
  quarter({ snapshotId: 3, quarterEnd: "2025-06-30", status: "filed" }),
  quarter({
    snapshotId: 5,
    quarterEnd: "2025-09-30",
    status: "filed",
    zone: "yellow",
    counted: 5,
    plusFactor: 0.4,
    multiplier: 3.4,
    capital: 398_100_000,
    addOn: 46_835_294,
    restatedAfterSignOff: true,
  }),
  quarter({
    snapshotId: 8,
    quarterEnd: "2025-12-31",
    zone: "yellow",
    counted: 6,
    plusFactor: 0.5,
    multiplier: 3.5,
    capital: 412_500_000,
    addOn: 58_928_571,
  }),
]);

/** What analysts and the CRO also see: the open quarter's draft. */
const fullHistory = capitalHistorySchema.parse([
  ...signedOffHistory,
  quarter({
    snapshotId: 11,
    quarterEnd: "2026-03-31",
    status: "draft",
    zone: "yellow",
    counted: 6,
    plusFactor: 0.5,
    multiplier: 3.5,
    capital: 409_000_000,
    addOn: 58_428_571,
  }),
]);

/** Binomial(22, 1%) new exceptions on top of the 4 still in the window (common practice: a calibrated 99% VaR). */
const distribution = Array.from({ length: 23 }, (_, x) => ({
  exceptions: 4 + x,
  probability: binomialPmf(x, 22, 0.01),
}));

function forecast(over: Partial<ForecastResponse> = {}): ForecastResponse {
  return forecastResponseSchema.parse({
    entity: "LKS-EU",
    portfolio: "LKS-EU-TOTAL",
    regime: "eu",
    currency: "EUR",
    asOf: "2026-11-27",
    date: "2026-12-31",
    knownRemaining: 4,
    newDays: 22,
    distribution,
    // P(X = 0) = 0.99^22 = 80.16% keeps the count at 4 (green); 1 to 5 more is yellow; 6 or more is red.
    zones: { green: 0.801630589539046, yellow: 0.1983693454361352, red: 6.502481877192537e-8 },
    ifNoNewException: { counted: 4, zone: "green", plusFactor: 0, addOn: 0 },
    expectedAddOn: 9_982_000,
    nextExceptionCost: 1_250_000,
    today: { counted: 6, zone: "yellow", plusFactor: 0.5, multiplier: 3.5, windowComplete: true },
    // The reporting office's forecast starts from current data; Q3 2026's determination is in force.
    startsFrom: { kind: "current", quarterEnd: null, asOf: "2026-11-27", status: null },
    inForce: {
      quarterEnd: "2026-09-30",
      effectiveFrom: "2026-10-01",
      counted: 6,
      zone: "yellow",
      plusFactor: 0.5,
      multiplier: 3.5,
      status: "approved",
    },
    bitesFrom: { quarterEnd: "2026-12-31", asOf: "2026-12-31", effectiveFrom: "2027-01-04" },
    nextExceptionBitesFrom: { quarterEnd: "2026-12-31", asOf: "2026-12-31", effectiveFrom: "2027-01-04" },
    rollOffs: [
      {
        date: "2025-12-04",
        actual: true,
        hypothetical: false,
        leavesOn: "2026-12-02",
        countAfter: 5,
        zoneAfter: "yellow",
        plusFactorAfter: 0.4,
      },
      {
        date: "2025-12-19",
        actual: true,
        hypothetical: true,
        leavesOn: "2026-12-17",
        countAfter: 4,
        zoneAfter: "green",
        plusFactorAfter: 0,
      },
      {
        date: "2026-02-12",
        actual: true,
        hypothetical: false,
        leavesOn: "2027-02-10",
        countAfter: 3,
        zoneAfter: "green",
        plusFactorAfter: 0,
      },
      {
        date: "2026-03-10",
        actual: false,
        hypothetical: true,
        leavesOn: "2027-03-08",
        countAfter: 2,
        zoneAfter: "green",
        plusFactorAfter: 0,
      },
      {
        date: "2026-05-21",
        actual: true,
        hypothetical: true,
        leavesOn: "2027-05-19",
        countAfter: 1,
        zoneAfter: "green",
        plusFactorAfter: 0,
      },
      {
        date: "2026-07-02",
        actual: true,
        hypothetical: false,
        leavesOn: "2027-06-30",
        countAfter: 0,
        zoneAfter: "green",
        plusFactorAfter: 0,
      },
    ],
    ...over,
  });
}

/** At the end of Q1 2027 four of today's six have left; Binomial(84, 1%) new ones on top of the 2 left. */
const forecastForQ1 = forecast({
  date: "2027-03-31",
  knownRemaining: 2,
  newDays: 84,
  distribution: Array.from({ length: 85 }, (_, x) => ({ exceptions: 2 + x, probability: binomialPmf(x, 84, 0.01) })),
  zones: { green: 0.947545389159951, yellow: 0.05245239251165762, red: 0.000002218328391451454 },
  ifNoNewException: { counted: 2, zone: "green", plusFactor: 0, addOn: 0 },
  expectedAddOn: 2_850_000,
  bitesFrom: { quarterEnd: "2027-03-31", asOf: "2027-03-31", effectiveFrom: "2027-04-01" },
});

/** +2 exceptions: 6 → 8, plus factor 0.50 → 0.75, so the requirement grows by 0.25 / 3.5 of itself. */
const whatIfAnswer: WhatIfResponse = whatIfResponseSchema.parse({
  entity: "LKS-EU",
  portfolio: "LKS-EU-TOTAL",
  currency: "EUR",
  asOf: "2026-11-27",
  base: { zone: "yellow", counted: 6, plusFactor: 0.5, multiplier: 3.5, capital: 412_500_000, addOn: 58_928_571 },
  scenario: { zone: "yellow", counted: 8, plusFactor: 0.75, multiplier: 3.75, capital: 441_964_286, addOn: 88_392_857 },
  delta: { counted: 2, plusFactor: 0.25, multiplier: 0.25, capital: 29_464_286, addOn: 29_464_286, zoneChanged: false },
  startsFrom: { kind: "current", quarterEnd: null, asOf: "2026-11-27", status: null },
  bitesFrom: { quarterEnd: "2026-12-31", asOf: "2026-12-31", effectiveFrom: "2027-01-04" },
});

/**
 * Treasury reads approved figures only: its forecast starts from the latest signed-off determination
 * (Q4 2025, six exceptions, yellow, 3.50), which is the one it reads as in force.
 */
const treasuryStart: Partial<ForecastResponse> = {
  asOf: "2025-12-31",
  startsFrom: { kind: "approved", quarterEnd: "2025-12-31", asOf: "2025-12-31", status: "approved" },
  inForce: {
    quarterEnd: "2025-12-31",
    effectiveFrom: "2026-01-02",
    counted: 6,
    zone: "yellow",
    plusFactor: 0.5,
    multiplier: 3.5,
    status: "approved",
  },
  nextExceptionBitesFrom: { quarterEnd: "2026-03-31", asOf: "2026-03-31", effectiveFrom: "2026-04-01" },
};

type Handler = Reply | ((c: Call) => Reply);

function routes(role: "analyst" | "cro" | "treasury", extra: Record<string, Handler> = {}): Record<string, Handler> {
  return {
    "GET /api/auth/session": signedInAs(role),
    "GET /api/entities": { status: 200, body: entities },
    "GET /api/entities/LKS-EU/capital/history": {
      status: 200,
      body: role === "treasury" ? signedOffHistory : fullHistory,
    },
    "GET /api/entities/LKS-EU/capital/forecast": (c) => {
      const date = new URLSearchParams(c.search).get("date");
      const body = date === "2027-03-31" ? forecastForQ1 : date ? forecast({ date }) : forecast();
      return { status: 200, body: role === "treasury" ? { ...body, ...treasuryStart } : body };
    },
    ...extra,
  };
}

const searchOf = (c: Call) => Object.fromEntries(new URLSearchParams(c.search));

describe("Capital screen", { timeout: 20_000 }, () => {
  beforeAll(async () => {
    // The screen and its charts are lazy modules; load them once so each test waits only for the fake server.
    await Promise.all([
      import("@/app/routes/app-layout"),
      import("@/app/routes/capital"),
      import("@/features/capital/components/charts"),
    ]);
    configure({ asyncUtilTimeout: 4000 });
  }, 30_000);

  it("when treasury opens Capital, then the history lists only signed-off quarters and the header says what the next exception would cost", async () => {
    const api = fakeApi(routes("treasury"));
    renderApp("/");

    const nav = await screen.findByRole("navigation", { name: "Main" });
    await userEvent.setup().click(within(nav).getByRole("link", { name: "Capital" }));

    const standing = await screen.findByRole("region", { name: "Where we stand" });
    expect(within(standing).getByTestId("today-counted")).toHaveTextContent("6");
    expect(within(standing).getAllByText("Yellow")).toHaveLength(2);
    expect(within(standing).getByTestId("today-plus-factor")).toHaveTextContent("0.50");
    expect(within(standing).getByTestId("today-multiplier")).toHaveTextContent("3.50");
    expect(within(standing).getByTestId("next-exception-cost")).toHaveTextContent("1,250,000 EUR");
    // Which multiplier: treasury's figures start from the approved Q4 2025 determination, and nothing indicative.
    expect(within(standing).getByText(/starts from the approved Q4 2025 determination/)).toBeInTheDocument();
    expect(within(standing).getByTestId("capital-multiplier-in-force")).toHaveTextContent("3.50");
    expect(within(standing).getByText(/in force since 2026-01-02 \(Q4 2025, approved\)/)).toBeInTheDocument();
    expect(within(standing).queryByTestId("capital-multiplier-indicative")).not.toBeInTheDocument();
    expect(within(standing).getByTestId("next-exception-words")).toHaveTextContent(
      "One more exception would raise the capital requirement by 1,250,000 EUR from 2026-04-01 (the Q1 2026 determination); until then the multiplier in force stays as it is.",
    );

    const table = screen.getByRole("table", { name: "Capital history by quarter end, oldest first" });
    const rows = within(table).getAllByRole("row").slice(1);
    expect(rows.map((r) => within(r).getAllByRole("cell")[0].textContent)).toEqual([
      "Q2 20252025-06-30",
      "Q3 20252025-09-30",
      "Q4 20252025-12-31",
    ]);
    const q4 = rows[2];
    for (const text of ["Approved", "Yellow", "6", "0.50", "3.50", "412,500,000 EUR", "58,928,571 EUR"])
      expect(within(q4).getByText(text)).toBeInTheDocument();
    expect(within(rows[1]).getByText(/Restated after sign-off; the figures stay as approved/)).toBeInTheDocument();
    expect(within(table).queryByText("not signed off")).not.toBeInTheDocument();
    expect(
      await screen.findByRole("figure", { name: "Multiplier and capital add-on at each quarter end, EUR" }),
    ).toBeInTheDocument();
    expect(api.callsTo("GET", "/api/entities/LKS-EU/capital/history")).toHaveLength(1);
  });

  it("when an analyst opens Capital, then the multiplier in force and the indicative one are named, and the forecast and next exception say from when they would bite", async () => {
    fakeApi(routes("analyst"));
    renderApp("/capital?entity=LKS-EU");

    const standing = await screen.findByRole("region", { name: "Where we stand" });
    expect(within(standing).getByText(/last day with data/)).toBeInTheDocument();
    expect(within(standing).getByTestId("capital-multiplier-in-force")).toHaveTextContent("3.50");
    expect(within(standing).getByText(/in force since 2026-10-01 \(Q3 2026, approved\)/)).toBeInTheDocument();
    expect(within(standing).getByText("Indicative if determined today")).toBeInTheDocument();
    expect(within(standing).getByTestId("capital-multiplier-indicative")).toHaveTextContent("3.50");
    expect(within(standing).getByTestId("next-exception-words")).toHaveTextContent(
      "from 2027-01-04 (the Q4 2026 determination)",
    );
    expect(await screen.findByTestId("forecast-bites-from")).toHaveTextContent(
      "The count on 2026-12-31 sets the multiplier in force from 2027-01-04 (the Q4 2026 determination).",
    );
  });

  it("when an analyst opens Capital, then the open quarter's draft is listed too and marked as not signed off", async () => {
    fakeApi(routes("analyst"));
    renderApp("/capital?entity=LKS-EU");

    const table = await screen.findByRole("table", { name: "Capital history by quarter end, oldest first" });
    const draft = within(table).getByText("Q1 2026").closest("tr")!;
    expect(within(draft).getByText("Draft")).toBeInTheDocument();
    expect(within(draft).getByText("not signed off")).toBeInTheDocument();
    expect(screen.getByText("4 quarters · 1 not signed off")).toBeInTheDocument();
  });

  it("when a quarter's window or today's was short of 250 days, then its zone is marked provisional, and the others are not", async () => {
    const shortFirst = capitalHistorySchema.parse([
      quarter({ snapshotId: 2, quarterEnd: "2025-03-31", windowComplete: false }),
      ...signedOffHistory,
    ]);
    fakeApi(
      routes("treasury", {
        "GET /api/entities/LKS-EU/capital/history": { status: 200, body: shortFirst },
        "GET /api/entities/LKS-EU/capital/forecast": {
          status: 200,
          body: forecast({
            ...treasuryStart,
            today: { counted: 6, zone: "yellow", plusFactor: 0.5, multiplier: 3.5, windowComplete: false },
          }),
        },
      }),
    );
    renderApp("/capital?entity=LKS-EU");

    const standing = await screen.findByRole("region", { name: "Where we stand" });
    expect(within(standing).getByText("(provisional)")).toBeInTheDocument();
    const table = await screen.findByRole("table", { name: "Capital history by quarter end, oldest first" });
    const rows = within(table).getAllByRole("row").slice(1);
    expect(rows.map((r) => within(r).queryByText("(provisional)") !== null)).toEqual([true, false, false, false]);
  });

  it("when a forecast date is chosen, then it is asked for with ?date=, put in the address, and the zone chances and remaining count are said", async () => {
    const api = fakeApi(routes("treasury"));
    const user = userEvent.setup();
    const { router } = renderApp("/capital");

    const section = await screen.findByRole("region", { name: "Zone forecast for 2026-12-31" });
    const field = within(section).getByLabelText("Forecast date");
    expect(field).toHaveValue("2026-12-31");
    expect(searchOf(api.callsTo("GET", "/api/entities/LKS-EU/capital/forecast")[0])).toEqual({});

    await user.clear(field);
    await user.type(field, "2027-03-31");
    await user.click(within(section).getByRole("button", { name: "Forecast" }));

    const dated = await screen.findByRole("region", { name: "Zone forecast for 2027-03-31" });
    expect(searchOf(api.callsTo("GET", "/api/entities/LKS-EU/capital/forecast").at(-1)!)).toEqual({
      date: "2027-03-31",
    });
    expect(new URLSearchParams(router.state.location.search).get("date")).toBe("2027-03-31");
    expect(
      within(dated).getByText(
        "Of today's 6 exceptions, 2 are still in the window on 2027-03-31; 84 new business days could add more.",
      ),
    ).toBeInTheDocument();
    expect(within(dated).getByTestId("chance-green")).toHaveTextContent("94.75%");
    expect(within(dated).getByTestId("chance-yellow")).toHaveTextContent("5.25%");
    // 0.0002% is not none: it reads below the smallest step shown.
    expect(within(dated).getByTestId("chance-red")).toHaveTextContent("< 0.01%");
    const chances = within(dated).getByRole("table", { name: "Chance of each count of exceptions on 2027-03-31" });
    // Counts 2 to 8 have a chance of 0.01% or more; the rest are summed in words.
    expect(within(chances).getAllByRole("row")).toHaveLength(8);
    expect(within(dated).getByText(/Higher counts, each with a chance below 0.01%, are left out/)).toBeInTheDocument();
    expect(within(within(chances).getAllByRole("row")[1]).getByText("Green")).toBeInTheDocument();
    expect(within(dated).getByTestId("expected-add-on")).toHaveTextContent("2,850,000 EUR");
    const rollOffs = screen.getByRole("table", { name: "Roll-off calendar" });
    expect(within(rollOffs).getAllByText("Gone")).toHaveLength(4);
    expect(within(rollOffs).getAllByText("Still counted")).toHaveLength(2);
  });

  it("when a zone's chance is near but not at 0% or 100%, then it reads < 0.01% or > 99.99%, and a true 0% stays 0.00%", async () => {
    const nearlyCertain = forecast({ zones: { green: 0.99995, yellow: 0.00005, red: 0 } });
    fakeApi(routes("analyst", { "GET /api/entities/LKS-EU/capital/forecast": { status: 200, body: nearlyCertain } }));
    renderApp("/capital?entity=LKS-EU");

    const chances = await screen.findByLabelText("Chance of each zone on 2026-12-31");
    expect(within(chances).getByTestId("chance-green")).toHaveTextContent("> 99.99%");
    expect(within(chances).getByTestId("chance-yellow")).toHaveTextContent("< 0.01%");
    expect(within(chances).getByTestId("chance-red")).toHaveTextContent(/^0\.00%$/);
  });

  it("when the address names the entity in lower case, then the matched entity's code is what is asked for", async () => {
    const api = fakeApi(routes("analyst"));
    renderApp("/capital?entity=lks-eu");

    expect(await screen.findByRole("heading", { name: "Capital: Larkspur Markets SA" })).toBeInTheDocument();
    expect(await screen.findByTestId("today-counted")).toHaveTextContent("6");
    expect(screen.getByLabelText("Entity")).toHaveValue("LKS-EU");
    expect(api.callsTo("GET", "/api/entities/LKS-EU/capital/history")).toHaveLength(1);
    expect(api.callsTo("GET", "/api/entities/LKS-EU/capital/forecast").length).toBeGreaterThan(0);
    expect(api.calls.filter((c) => c.path.includes("lks-eu"))).toHaveLength(0);
  });

  it("when the server refuses the forecast date (422), then its message shows under the date field and today's figures stay", async () => {
    fakeApi(
      routes("analyst", {
        "GET /api/entities/LKS-EU/capital/forecast": (c) =>
          new URLSearchParams(c.search).get("date")
            ? refusal(422, "validation_failed", "Invalid query", {
                fields: { date: "On or after 2026-11-27, the last day with data" },
              })
            : { status: 200, body: forecast() },
      }),
    );
    renderApp("/capital?entity=LKS-EU&date=2026-06-30");

    const field = await screen.findByLabelText("Forecast date");
    await waitFor(() => expect(field).toHaveAccessibleDescription("On or after 2026-11-27, the last day with data"));
    expect(field).toHaveValue("2026-06-30");
    expect(screen.getByTestId("today-counted")).toHaveTextContent("6");
  });

  it("when a what-if is computed, then the form's figures are sent and today, the scenario and the change are shown side by side", async () => {
    const api = fakeApi(
      routes("treasury", { "POST /api/entities/LKS-EU/capital/what-if": { status: 200, body: whatIfAnswer } }),
    );
    const user = userEvent.setup();
    renderApp("/capital?entity=LKS-EU");

    const form = await screen.findByRole("form", { name: "What-if scenario" });
    await user.clear(within(form).getByLabelText("Extra exceptions"));
    await user.type(within(form).getByLabelText("Extra exceptions"), "2");
    await user.clear(within(form).getByLabelText("VaR (FRTB: ES) scale"));
    await user.type(within(form).getByLabelText("VaR (FRTB: ES) scale"), "1.1");
    expect(within(form).getByLabelText("stressed VaR (FRTB: SES) scale")).toHaveValue(1);
    await user.click(within(form).getByRole("button", { name: "Compute the scenario" }));

    const result = await screen.findByRole("table", {
      name: "What-if as of 2026-11-27: today, the scenario and the change",
    });
    expect(api.callsTo("POST", "/api/entities/LKS-EU/capital/what-if")[0].body).toEqual({
      extraExceptions: 2,
      varScale: 1.1,
      svarScale: 1,
    });
    const cells = (id: string) =>
      within(within(result).getByTestId(id))
        .getAllByRole("cell")
        .map((c) => c.textContent);
    expect(cells("what-if-zone")).toEqual(["Yellow", "Yellow", "No change"]);
    expect(cells("what-if-counted")).toEqual(["6", "8", "+2"]);
    expect(cells("what-if-plus-factor")).toEqual(["0.50", "0.75", "+0.25"]);
    expect(cells("what-if-multiplier")).toEqual(["3.50", "3.75", "+0.25"]);
    expect(cells("what-if-capital")).toEqual(["412,500,000 EUR", "441,964,286 EUR", "+29,464,286 EUR"]);
    expect(cells("what-if-add-on")).toEqual(["58,928,571 EUR", "88,392,857 EUR", "+29,464,286 EUR"]);
    expect(screen.getByTestId("what-if-bites-from")).toHaveTextContent(
      "Exceptions after 2026-11-27 would change the multiplier in force from 2027-01-04 (the Q4 2026 determination).",
    );
  });

  it("when the what-if input is invalid, then the schema's message shows under the field and nothing is sent", async () => {
    const api = fakeApi(routes("analyst"));
    const user = userEvent.setup();
    renderApp("/capital");

    const form = await screen.findByRole("form", { name: "What-if scenario" });
    await user.clear(within(form).getByLabelText("Extra exceptions"));
    await user.type(within(form).getByLabelText("Extra exceptions"), "1.5");
    await user.clear(within(form).getByLabelText("stressed VaR (FRTB: SES) scale"));
    await user.type(within(form).getByLabelText("stressed VaR (FRTB: SES) scale"), "12");
    await user.click(within(form).getByRole("button", { name: "Compute the scenario" }));

    expect(within(form).getByLabelText("Extra exceptions")).toHaveAccessibleDescription("A whole number of exceptions");
    expect(within(form).getByLabelText("stressed VaR (FRTB: SES) scale")).toHaveAccessibleDescription("At most 10 ×");
    await waitFor(() => expect(within(form).getByLabelText("Extra exceptions")).toHaveFocus());
    expect(api.callsTo("POST", "/api/entities/LKS-EU/capital/what-if")).toHaveLength(0);
  });

  it("when the server refuses a what-if field (422), then its message shows under that field", async () => {
    const api = fakeApi(
      routes("cro", {
        "POST /api/entities/LKS-EU/capital/what-if": refusal(
          422,
          "validation_failed",
          "Check the highlighted fields.",
          { fields: { svarScale: "No stressed VaR in the data to scale" } },
        ),
      }),
    );
    const user = userEvent.setup();
    renderApp("/capital");

    const form = await screen.findByRole("form", { name: "What-if scenario" });
    await user.clear(within(form).getByLabelText("stressed VaR (FRTB: SES) scale"));
    await user.type(within(form).getByLabelText("stressed VaR (FRTB: SES) scale"), "1.5");
    await user.click(within(form).getByRole("button", { name: "Compute the scenario" }));

    await waitFor(() =>
      expect(within(form).getByLabelText("stressed VaR (FRTB: SES) scale")).toHaveAccessibleDescription(
        "No stressed VaR in the data to scale",
      ),
    );
    expect(api.callsTo("POST", "/api/entities/LKS-EU/capital/what-if")[0].body).toEqual({
      extraExceptions: 1,
      varScale: 1,
      svarScale: 1.5,
    });
    expect(within(form).queryByRole("alert")).not.toBeInTheDocument();
    expect(screen.queryByRole("table", { name: /What-if as of/ })).not.toBeInTheDocument();
  });

  it("when the data holds no capital inputs, then the next exception's cost and the expected add-on say so in words", async () => {
    fakeApi(
      routes("treasury", {
        "GET /api/entities/LKS-EU/capital/forecast": {
          status: 200,
          body: forecast({
            nextExceptionCost: null,
            expectedAddOn: null,
            ifNoNewException: { counted: 4, zone: "green", plusFactor: 0, addOn: null },
          }),
        },
      }),
    );
    renderApp("/capital");

    const standing = await screen.findByRole("region", { name: "Where we stand" });
    expect(within(standing).getByTestId("next-exception-cost")).toHaveTextContent("No capital inputs in the data");
    expect(within(standing).getByText(/no exception can be priced/)).toBeInTheDocument();
    expect(screen.getByTestId("expected-add-on")).toHaveTextContent("No capital inputs in the data");
  });

  it("when the entity has no daily data yet, then the screen says so instead of a forecast", async () => {
    fakeApi(
      routes("analyst", {
        "GET /api/entities/LKS-EU/capital/history": { status: 200, body: [] },
        "GET /api/entities/LKS-EU/capital/forecast": {
          status: 404,
          body: { error: { code: "no_data", message: "No daily data for LKS-EU-TOTAL yet." } },
        },
      }),
    );
    renderApp("/capital");

    expect(await screen.findByText("No daily data for LKS-EU yet")).toBeInTheDocument();
    expect(within(screen.getByRole("main")).getByRole("link", { name: "Data" })).toHaveAttribute(
      "href",
      "/data?entity=LKS-EU",
    );
    expect(screen.getByText("No quarter snapshots for LKS-EU yet")).toBeInTheDocument();
    expect(screen.queryByRole("form", { name: "What-if scenario" })).not.toBeInTheDocument();
  });

  it("when an upload or sign-off makes every figure stale, then the capital history and forecast are read again", async () => {
    const api = fakeApi(routes("treasury"));
    const { queryClient } = renderApp("/capital");
    await screen.findByRole("table", { name: "Capital history by quarter end, oldest first" });

    await queryClient.invalidateQueries(everyFigure);

    await waitFor(() => expect(api.callsTo("GET", "/api/entities/LKS-EU/capital/history")).toHaveLength(2));
    expect(api.callsTo("GET", "/api/entities/LKS-EU/capital/forecast")).toHaveLength(2);
  });

  it.each([
    ["a regulator", "regulator"],
    ["an administrator", "admin"],
  ] as const)("when %s opens Capital, then it is refused and no capital figure is asked for", async (_who, role) => {
    const api = fakeApi({
      "GET /api/auth/session": signedInAs(role),
      "GET /api/entities": { status: 200, body: entities },
    });
    renderApp("/capital");

    expect(await screen.findByRole("heading", { name: "Not available for your role" })).toBeInTheDocument();
    expect(
      within(screen.getByRole("navigation", { name: "Main" })).queryByRole("link", { name: "Capital" }),
    ).not.toBeInTheDocument();
    expect(api.calls.filter((c) => c.path.includes("/capital"))).toHaveLength(0);
  });
});
