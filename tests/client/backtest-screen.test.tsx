import { configure, screen, waitFor, within } from "@testing-library/react";
import userEvent from "@testing-library/user-event";
import { backtestAt, rollingBacktest } from "@shared/backtest/exceptions";
import { rollOffs } from "@shared/backtest/forecast";
import { pnlMakeUp, withPnlDefinition } from "@shared/backtest/pnl-definition";
import { formatAmount } from "@/lib/format";
import type { BacktestOptions, Observation } from "@shared/backtest/types";
import type { Review } from "@shared/schemas/review";
import { fakeApi, signedInAs, type Reply } from "./support/fake-api";
import { renderApp } from "./support/render-app";
import { larkspurUS } from "./support/entities";

// The fixture is the engine's own answer for a small invented series (docs/rules.md#exception; the engine's
// figures are checked against BCBS 1996 Table 2 in tests/shared); the screen must show it unchanged.

/** 270 weekdays from 2025-01-06 with VaR 1,000,000; losses beyond VaR on the chosen days. */
function invent(): Observation[] {
  const out: Observation[] = [];
  const d = new Date(Date.UTC(2025, 0, 6));
  const actualHits = new Set([30, 75, 140, 190, 215, 230, 262]);
  const hypotheticalHits = new Set([75, 190, 262]);
  let i = 0;
  while (out.length < 270) {
    const wd = d.getUTCDay();
    if (wd !== 0 && wd !== 6) {
      const swing = ((i * 37) % 11) * 50_000 - 250_000;
      out.push({
        date: d.toISOString().slice(0, 10),
        actualPnl: actualHits.has(i) ? -1_000_000 - 20_000 * (i % 7) - 1 : swing,
        hypotheticalPnl: hypotheticalHits.has(i) ? -1_100_000 : swing * 0.9,
        var99: 1_000_000,
      });
      i++;
    }
    d.setUTCDate(d.getUTCDate() + 1);
  }
  return out;
}

const observations = invent();
const asOf = observations.at(-1)!.date;
const opts: BacktestOptions = { regime: "us", pnlBasis: "actual", asOf };
const engine = backtestAt(observations, opts);

function backtestBody(reviews: Record<string, Review> = {}) {
  return {
    ...engine,
    portfolio: { code: "LKS-US-TOTAL", name: "Larkspur Securities — total trading", level: "top" },
    entity: { code: "LKS-US", name: "Larkspur Securities LLC", currency: "USD" },
    latestDate: asOf,
    exceptionDays: engine.exceptionDays.map((d) => ({ ...d, review: reviews[d.date] ?? null })),
    rollOffs: rollOffs(observations, opts),
    desks: [],
    engineVersion: "test",
  };
}

const entities = [larkspurUS];

/**
 * Capital on the latest day as the server answers it: the determination of the quarter end before
 * (four exceptions, green 3.00, approved) is in force; the rolling count has since reached seven.
 */
const capitalOnDate = {
  entity: "LKS-US",
  currency: "USD",
  date: asOf,
  inForce: {
    quarterEnd: "2025-09-30",
    asOf: "2025-09-30",
    effectiveFrom: "2025-10-01",
    effectiveTo: null,
    counted: 4,
    zone: "green",
    zoneLabel: "green",
    plusFactor: 0,
    multiplier: 3,
    multiplierSvar: 3,
    status: "approved",
    snapshotId: 4,
  },
  indicative: {
    asOf,
    counted: 7,
    zone: "yellow",
    zoneLabel: "yellow",
    plusFactor: 0.65,
    multiplier: 3.65,
    multiplierSvar: 3.65,
    windowComplete: true,
  },
  requirement: null,
  addOn: null,
  indicativeRequirement: null,
  capitalNote: "No capital figure: no stressed VaR in the data",
  nextDetermination: { quarterEnd: "2025-12-31", asOf: "2025-12-31", effectiveFrom: "2026-01-02" },
  settings: {
    id: 1,
    effectiveFrom: "1900-01-01",
    reference: "Settings entered when the entity was created",
    pnlBasis: "actual",
    qualitativeAddend: 0,
    qualitativeAddendSvar: null,
    multiplierFloor: null,
    determinationFrequency: "quarterly",
  },
};

function routes(
  role: "analyst" | "cro",
  body: unknown,
  extra: Record<string, Reply | ((c: { body: unknown }) => Reply)> = {},
) {
  return {
    "GET /api/auth/session": signedInAs(role),
    "GET /api/entities": { status: 200, body: entities },
    "GET /api/entities/LKS-US/portfolios": {
      status: 200,
      body: [{ code: "LKS-US-TOTAL", name: "Larkspur Securities — total trading", level: "top" }],
    },
    "GET /api/portfolios/LKS-US-TOTAL/backtest": { status: 200, body },
    "GET /api/entities/LKS-US/capital": { status: 200, body: capitalOnDate },
    "GET /api/portfolios/LKS-US-TOTAL/rolling": {
      status: 200,
      body: rollingBacktest(observations, { regime: "us", pnlBasis: "actual" }),
    },
    "GET /api/portfolios/LKS-US-TOTAL/observations": {
      status: 200,
      body: observations.map((o) => ({
        ...o,
        backtestActualPnl: o.actualPnl,
        var975: null,
        svar99: null,
        var10d: null,
        svar10d: null,
        es975: null,
        ses: null,
        rtpl: null,
        imaDrc: null,
        sbm: null,
        rrao: null,
        saDrc: null,
        saGa: null,
        feesCommissions: null,
        reservesAdjustments: null,
        netInterestIncome: null,
        intradayPnl: null,
        newTradePnl: null,
        version: 1,
      })),
    },
    ...extra,
  };
}

function review(date: string, over: Partial<Review> = {}): Review {
  return {
    date,
    cause: "market_move",
    narrative: "Rates sold off after the payrolls surprise; the curve moved four standard deviations.",
    exclusionStatus: "none",
    decisionReference: null,
    decisionDate: null,
    decidedBy: null,
    reviewedBy: "Theo Marchetti",
    reviewedAt: "2026-01-05T10:00:00.000Z",
    version: 3,
    evidence: [],
    ...over,
  };
}

// A whole screen with two charts renders slowly in jsdom.
describe("Backtest screen", { timeout: 20_000 }, () => {
  // The screen and its charts are lazy modules; load them once so each test waits only for the fake server.
  beforeAll(async () => {
    await Promise.all([
      import("@/app/routes/app-layout"),
      import("@/app/routes/backtest/portfolio"),
      import("@/features/backtest/components/charts"),
    ]);
    // A full backtest screen is a big render in jsdom; give it longer than the default second.
    configure({ asyncUtilTimeout: 4000 });
  }, 30_000);

  it("shows exactly the engine's counted exceptions, zone, plus factor, multiplier and window dates", async () => {
    fakeApi(routes("analyst", backtestBody()));
    renderApp("/backtest/LKS-US-TOTAL");

    const standing = await screen.findByRole("region", { name: "Where we stand" });
    expect(within(standing).getByTestId("counted")).toHaveTextContent(String(engine.exceptions.counted));
    expect(within(standing).getByTestId("plus-factor")).toHaveTextContent(engine.plusFactor.toFixed(2));
    expect(within(standing).getByTestId("multiplier")).toHaveTextContent(engine.multiplier.toFixed(2));
    expect(within(standing).getByTestId("window-dates")).toHaveTextContent(
      `${engine.window.start} to ${engine.window.end}`,
    );
    const zoneName = engine.zone[0].toUpperCase() + engine.zone.slice(1);
    expect(within(standing).getAllByText(zoneName).length).toBeGreaterThan(0);
    // Which multiplier is which: the last determination's is in force, the rolling count's is indicative.
    expect(await within(standing).findByTestId("multiplier-in-force")).toHaveTextContent("3.00");
    expect(within(standing).getByText(/in force since 2025-10-01 \(Q3 2025, approved\)/)).toBeInTheDocument();
    expect(within(standing).getByText("Green")).toBeInTheDocument();
    expect(within(standing).getByText("Indicative if determined today")).toBeInTheDocument();
    expect(within(standing).getByTestId("multiplier-indicative")).toHaveTextContent(engine.multiplier.toFixed(2));
    // Sanity on the invented series: seven actual exceptions in the last 250 days, US rule → yellow.
    expect(engine.exceptions.counted).toBe(7);
    expect(engine.zone).toBe("yellow");

    const table = screen.getByRole("table", { name: "Exceptions in the window" });
    expect(within(table).getAllByRole("row")).toHaveLength(engine.exceptionDays.length + 1);
    expect(screen.getByRole("table", { name: "Roll-off calendar" })).toBeInTheDocument();
    // The charts are lazy chunks (recharts): on a busy machine their first import takes a while.
    const lazyChart = { timeout: 25_000 };
    expect(await screen.findByRole("figure", { name: /Daily actual P&L against −VaR/ }, lazyChart)).toBeInTheDocument();
    expect(
      await screen.findByRole("figure", { name: /Counted exceptions in the trailing window/ }, lazyChart),
    ).toBeInTheDocument();
  });

  it("when the portfolio has no data yet, then the screen says an analyst uploads it under Data", async () => {
    fakeApi(
      routes("analyst", undefined, {
        "GET /api/portfolios/LKS-US-TOTAL/backtest": {
          status: 404,
          body: { error: { code: "no_data", message: "No daily data" } },
        },
      }),
    );
    renderApp("/backtest/LKS-US-TOTAL");
    expect(await screen.findByText("No daily data for LKS-US-TOTAL yet")).toBeInTheDocument();
    expect(within(screen.getByRole("main")).getByRole("link", { name: "Data" })).toHaveAttribute("href", "/data");
  });

  it("the analyst's review is sent with the version seen; a 409 shows the review that now stands, and the next save builds on it", async () => {
    const day = engine.exceptionDays[0].date;
    const theirs = review(day, {
      version: 4,
      reviewedBy: "Ana Other",
      cause: "pricing",
      narrative: "A stale curve mark on the swaption book caused it.",
    });
    let puts = 0;
    const api = fakeApi(
      routes("analyst", backtestBody({ [day]: review(day) }), {
        [`PUT /api/portfolios/LKS-US-TOTAL/exceptions/${day}/review`]: ({ body }) => {
          puts++;
          return puts === 1
            ? {
                status: 409,
                body: {
                  error: { code: "stale", message: "Someone else saved first", details: { current: theirs } },
                },
              }
            : { status: 200, body: { ...theirs, ...(body as object), version: 5 } };
        },
      }),
    );
    const user = userEvent.setup();
    renderApp(`/backtest/LKS-US-TOTAL?exception=${day}`);

    const form = await screen.findByRole("form", { name: `Review of the exception of ${day}` });
    const narrative = within(form).getByLabelText("What happened");
    await user.clear(narrative);
    await user.type(narrative, "Payrolls surprise; the model's lookback missed the jump.");
    await user.click(within(form).getByRole("checkbox", { name: /Ask the supervisor to disregard this exception/ }));
    await user.click(within(form).getByRole("button", { name: "Save review" }));

    const puts1 = api.callsTo("PUT", `/api/portfolios/LKS-US-TOTAL/exceptions/${day}/review`);
    expect(puts1[0].body).toEqual({
      cause: "market_move",
      narrative: "Payrolls surprise; the model's lookback missed the jump.",
      exclusion: true,
      version: 3,
    });
    const alert = await within(form).findByRole("alert");
    expect(alert).toHaveTextContent("Ana Other saved this review");
    // Someone else's save is news, not a zone: the neutral notice tone, no zone colour.
    expect(alert).toHaveAttribute("data-tone", "notice");
    expect(alert.outerHTML).not.toMatch(/\b(bg|text|border)-zone-/);
    expect(alert).toHaveTextContent("A stale curve mark on the swaption book caused it.");
    expect(within(form).getByLabelText("What happened")).toHaveValue(
      "Payrolls surprise; the model's lookback missed the jump.",
    );

    await user.click(within(form).getByRole("button", { name: "Save review" }));
    await waitFor(() =>
      expect(api.callsTo("PUT", `/api/portfolios/LKS-US-TOTAL/exceptions/${day}/review`)).toHaveLength(2),
    );
    expect(api.callsTo("PUT", `/api/portfolios/LKS-US-TOTAL/exceptions/${day}/review`)[1].body).toMatchObject({
      version: 4,
    });
    expect(await within(form).findByText("Review saved (version 5).")).toBeInTheDocument();
  });

  it("an exception shows how its actual P&L was made up under the rule set, or that the file's P&L was used as supplied", async () => {
    const [withParts, plain] = engine.exceptionDays;
    // The file gave the day's parts: fees 15,000, NII 5,000, intraday −30,000, new trades 2,000. Under the US
    // rule (docs/rules.md#pnl-definition) the first three come out, so the supplied figure is chosen to leave
    // exactly the engine's exception P&L: supplied − 15,000 − 5,000 + 30,000.
    const supplied = withParts.actualPnl! - 10_000;
    const day = observations.find((o) => o.date === withParts.date)!;
    const [derived] = withPnlDefinition(
      [
        {
          ...day,
          actualPnl: supplied,
          feesCommissions: 15_000,
          netInterestIncome: 5_000,
          intradayPnl: -30_000,
          newTradePnl: 2_000,
        },
      ],
      "us",
    );
    const makeUp = pnlMakeUp(derived, "us")!;
    expect(makeUp.backtesting).toBe(withParts.actualPnl);
    const body = backtestBody();
    body.exceptionDays = body.exceptionDays.map((d) =>
      d.date === withParts.date ? { ...d, actualMakeUp: makeUp } : d,
    );
    fakeApi(routes("cro", body));
    const user = userEvent.setup();
    renderApp("/backtest/LKS-US-TOTAL");

    await user.click(await screen.findByRole("button", { name: `Review the exception of ${withParts.date}` }));
    const table = await screen.findByRole("table", { name: "How the actual P&L was made up" });
    const row = (name: RegExp) => within(table).getByRole("row", { name });
    expect(row(/Actual P&L in the file/)).toHaveTextContent(formatAmount(supplied, "USD"));
    expect(row(/Fees and commissions/)).toHaveTextContent(/15,000 USD\s*taken out/);
    expect(row(/Reserves and valuation adjustments/)).toHaveTextContent(/not given\s*none to take out/);
    expect(row(/Intraday trading/)).toHaveTextContent(/−30,000 USD\s*taken out/);
    expect(row(/New and modified trades/)).toHaveTextContent(/2,000 USD\s*kept in/);
    expect(row(/Backtested against VaR/)).toHaveTextContent(formatAmount(withParts.actualPnl, "USD"));
    expect(within(table).getByText(/12 CFR 217\.204\(b\)/)).toBeInTheDocument();

    await user.click(screen.getByRole("button", { name: `Review the exception of ${plain.date}` }));
    expect(await screen.findByText(/Actual P&L as supplied: the file gave no parts of it/)).toBeInTheDocument();
    expect(screen.queryByRole("table", { name: "How the actual P&L was made up" })).not.toBeInTheDocument();
  });

  it("the CRO's decision form appears only for an exception whose exclusion is requested, and sends the review's version", async () => {
    const [requested, explained] = engine.exceptionDays.map((d) => d.date);
    const api = fakeApi(
      routes(
        "cro",
        backtestBody({
          [requested]: review(requested, { exclusionStatus: "requested", version: 2 }),
          [explained]: review(explained),
        }),
        {
          [`PUT /api/portfolios/LKS-US-TOTAL/exceptions/${requested}/decision`]: ({ body }) => ({
            status: 200,
            body: review(requested, {
              exclusionStatus: "approved",
              decisionReference: "SUP-2026-014",
              decisionDate: "2026-01-20",
              decidedBy: "Cora Ruiz",
              version: 3,
              ...(body as object),
            }),
          }),
        },
      ),
    );
    const user = userEvent.setup();
    renderApp("/backtest/LKS-US-TOTAL");

    await user.click(await screen.findByRole("button", { name: `Review the exception of ${explained}` }));
    expect(await screen.findByRole("heading", { name: new RegExp(`Exception of ${explained}`) })).toBeInTheDocument();
    expect(screen.queryByRole("form", { name: "Supervisor's decision on the exclusion" })).not.toBeInTheDocument();
    expect(screen.queryByRole("form", { name: /Review of the exception/ })).not.toBeInTheDocument();

    await user.click(screen.getByRole("button", { name: `Review the exception of ${requested}` }));
    const form = await screen.findByRole("form", { name: "Supervisor's decision on the exclusion" });
    await user.click(within(form).getByRole("radio", { name: /Approved/ }));
    await user.type(within(form).getByLabelText("Supervisor's reference"), "SUP-2026-014");
    await user.type(within(form).getByLabelText("Decided on"), "2026-01-20");
    await user.click(within(form).getByRole("button", { name: "Record decision" }));

    await waitFor(() =>
      expect(api.callsTo("PUT", `/api/portfolios/LKS-US-TOTAL/exceptions/${requested}/decision`)).toHaveLength(1),
    );
    expect(api.callsTo("PUT", `/api/portfolios/LKS-US-TOTAL/exceptions/${requested}/decision`)[0].body).toEqual({
      decision: "approved",
      reference: "SUP-2026-014",
      decidedOn: "2026-01-20",
      version: 2,
    });
    // After the decision the figures are read again from the server.
    await waitFor(() => expect(api.callsTo("GET", "/api/portfolios/LKS-US-TOTAL/backtest").length).toBeGreaterThan(1));
  });

  it("when a decision is already recorded, then the CRO corrects it with a reason, a future date is refused before sending, and every record stays listed", async () => {
    const day = engine.exceptionDays[0].date;
    const decisions = [
      {
        id: 5,
        decision: "approved" as const,
        reference: "SUP-2026-014",
        decidedOn: "2026-01-20",
        recordedBy: "Cora Ruiz",
        recordedAt: "2026-01-21T09:00:00.000Z",
        supersedes: null,
        correctionReason: null,
        superseded: true,
      },
      {
        id: 6,
        decision: "rejected" as const,
        reference: "SUP-2026-014a",
        decidedOn: "2026-01-27",
        recordedBy: "Cora Ruiz",
        recordedAt: "2026-01-28T09:00:00.000Z",
        supersedes: 5,
        correctionReason: "The supervisor withdrew its letter",
        superseded: false,
      },
    ];
    const api = fakeApi(
      routes(
        "cro",
        backtestBody({
          [day]: review(day, {
            exclusionStatus: "rejected",
            decisionReference: "SUP-2026-014a",
            decisionDate: "2026-01-27",
            decidedBy: "Cora Ruiz",
            version: 4,
            decisions,
          }),
        }),
        {
          [`PUT /api/portfolios/LKS-US-TOTAL/exceptions/${day}/decision`]: () => ({
            status: 200,
            body: review(day, { exclusionStatus: "approved", version: 5, decisions }),
          }),
        },
      ),
    );
    const user = userEvent.setup();
    renderApp("/backtest/LKS-US-TOTAL");
    await user.click(await screen.findByRole("button", { name: `Review the exception of ${day}` }));

    const history = await screen.findByRole("list", { name: "Decisions recorded" });
    const items = within(history).getAllByRole("listitem");
    expect(items[0]).toHaveTextContent(/Approved \(SUP-2026-014, 2026-01-20\).*superseded by a correction/);
    expect(items[1]).toHaveTextContent(/Refused \(SUP-2026-014a, 2026-01-27\).*“The supervisor withdrew its letter”/);

    const form = screen.getByRole("form", { name: "Supervisor's decision on the exclusion" });
    expect(within(form).getByRole("heading", { name: "Correct the recorded decision" })).toBeInTheDocument();
    await user.click(within(form).getByRole("radio", { name: /Approved/ }));
    await user.type(within(form).getByLabelText("Supervisor's reference"), "SUP-2026-014b");
    await user.type(within(form).getByLabelText("Decided on"), "2999-01-01");
    await user.click(within(form).getByRole("button", { name: "Record the correction" }));
    expect(within(form).getByLabelText("Decided on")).toHaveAccessibleDescription(
      "The supervisor's decision cannot be dated in the future",
    );
    expect(within(form).getByLabelText("Why the recorded decision is corrected")).toHaveAttribute(
      "aria-invalid",
      "true",
    );
    expect(api.callsTo("PUT", `/api/portfolios/LKS-US-TOTAL/exceptions/${day}/decision`)).toHaveLength(0);

    await user.clear(within(form).getByLabelText("Decided on"));
    await user.type(within(form).getByLabelText("Decided on"), "2026-02-03");
    await user.type(within(form).getByLabelText("Why the recorded decision is corrected"), "A second letter");
    await user.click(within(form).getByRole("button", { name: "Record the correction" }));
    await waitFor(() =>
      expect(api.callsTo("PUT", `/api/portfolios/LKS-US-TOTAL/exceptions/${day}/decision`)).toHaveLength(1),
    );
    expect(api.callsTo("PUT", `/api/portfolios/LKS-US-TOTAL/exceptions/${day}/decision`)[0].body).toEqual({
      decision: "approved",
      reference: "SUP-2026-014b",
      decidedOn: "2026-02-03",
      correctionReason: "A second letter",
      version: 4,
    });
  });

  it('evidence uploads as the form field "file" and is listed as a download once the server has it', async () => {
    const day = engine.exceptionDays[1].date;
    const file = {
      id: 41,
      fileName: "desk-note.txt",
      contentType: "text/plain",
      sizeBytes: 1_480,
      sha256: "ab".repeat(32),
      uploadedBy: "Theo Marchetti",
      uploadedAt: "2026-01-05T11:00:00.000Z",
    };
    let received = false;
    const api = fakeApi(
      routes("analyst", undefined, {
        "GET /api/portfolios/LKS-US-TOTAL/backtest": () => ({
          status: 200,
          body: backtestBody({ [day]: review(day, { evidence: received ? [file] : [] }) }),
        }),
        [`POST /api/portfolios/LKS-US-TOTAL/exceptions/${day}/evidence`]: () => {
          received = true;
          return { status: 201, body: review(day, { evidence: [file] }) };
        },
      }),
    );
    const fetchStub = vi.mocked(globalThis.fetch);
    const user = userEvent.setup();
    renderApp(`/backtest/LKS-US-TOTAL?exception=${day}`);

    await user.upload(
      await screen.findByLabelText("Attach a file"),
      new File(["Desk head's note on the payrolls day."], "desk-note.txt", { type: "text/plain" }),
    );
    await user.click(screen.getByRole("button", { name: "Upload" }));

    await waitFor(() =>
      expect(api.callsTo("POST", `/api/portfolios/LKS-US-TOTAL/exceptions/${day}/evidence`)).toHaveLength(1),
    );
    const init = fetchStub.mock.calls.find(([url]) => String(url).endsWith("/evidence"))![1]!;
    expect(((init.body as FormData).get("file") as File).name).toBe("desk-note.txt");
    // The upload's success refetches the backtest; the file then appears with a download link.
    const link = await screen.findByRole("link", { name: "desk-note.txt" });
    expect(link).toHaveAttribute("href", "/api/evidence/41");
    expect(link).toHaveAttribute("download", "desk-note.txt");
  });

  it("changing the as-of date asks the engine for that date", async () => {
    const api = fakeApi(routes("analyst", backtestBody()));
    const user = userEvent.setup();
    renderApp("/backtest/LKS-US-TOTAL");
    const input = await screen.findByLabelText("As of");
    expect(input).toHaveValue(asOf);
    await user.clear(input);
    await user.type(input, "2025-11-28");
    await user.click(screen.getByRole("button", { name: "Show" }));
    await waitFor(() =>
      expect(
        api.calls.some((c) => c.path === "/api/portfolios/LKS-US-TOTAL/backtest" && c.search === "?asOf=2025-11-28"),
      ).toBe(true),
    );
  });
});
