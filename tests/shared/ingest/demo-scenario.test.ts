import { beforeEach, describe, expect, it } from "vitest";
import { demoDates, demoRowsFor, SCENARIO } from "../../../seeders/demo/scenario";
import { parseObservationCsv, serialiseObservationCsv } from "../../../shared/ingest/parse-csv";
import { seriesByPortfolio as parsedSeries } from "../../../shared/ingest/series";
import { backtestAt } from "../../../shared/backtest/exceptions";
import { withPnlDefinition } from "../../../shared/backtest/pnl-definition";
import { plaTest } from "../../../shared/backtest/pla";
import type { Observation } from "../../../shared/backtest/types";
import { findDataQualityIssues } from "../../../shared/ingest/data-quality";
import type { RegimeId } from "../../../shared/schemas/common";
import { deskStatusHistory, frtbAggregation } from "../../../shared/backtest/frtb-capital";

const REGIME: Record<string, RegimeId> = { "LKS-EU": "eu", "LKS-US": "us", "LKS-AP": "basel", "LKS-UK": "frtb" };

// A calendar like the seed's (fixed-date holidays on weekdays) must not change the story.
const SEED_LIKE_HOLIDAYS = new Set([
  "2024-01-01",
  "2024-07-04",
  "2024-12-25",
  "2025-01-01",
  "2025-06-19",
  "2025-07-04",
  "2025-12-25",
  "2026-01-01",
  "2026-06-19",
  "2027-01-01",
]);
let holidays: ReadonlySet<string> = new Set();

function seriesByPortfolio(entity: string, today: string) {
  const dates = demoDates(today, holidays);
  const csv = serialiseObservationCsv(demoRowsFor(entity, dates));
  const portfolios = new Map(
    [SCENARIO[entity].top, ...(SCENARIO[entity].desks ?? [])].map((p) => [
      p.code,
      { entityCode: entity, holidays: new Map<string, string>() },
    ]),
  );
  const parsed = parseObservationCsv(csv, { portfolios });
  expect(parsed.errors).toEqual([]); // the demo passes the same checks as any upload
  const out = parsedSeries(parsed.rows);
  // Each rule set backtests its own actual P&L, as the server's read does (docs/rules.md#pnl-definition).
  for (const [code, series] of out) out.set(code, withPnlDefinition(series, REGIME[entity]));
  return { dates, out };
}

// The demo story (docs/architecture.md#demo-data), checked with the engine for two different "today"s: the
// generator works relative to the last business day, so the story holds whenever it is seeded.
describe("the demo's parts of the P&L", () => {
  it("when LKS-US sends the parts of its P&L, then the US rule's P&L is the simulated one and the file's carries the parts it takes out", () => {
    const dates = demoDates("2026-11-30", new Set());
    const day = demoRowsFor("LKS-US", dates)[100];
    expect(day.fees_commissions).toBeGreaterThan(0);
    const n = (v: unknown) => Number(v);
    const [derived] = withPnlDefinition<Observation>(
      [
        {
          date: String(day.date),
          actualPnl: n(day.actual_pnl),
          hypotheticalPnl: n(day.hypothetical_pnl),
          var99: n(day.var_99),
          feesCommissions: n(day.fees_commissions),
          reservesAdjustments: n(day.reserves_adjustments),
          netInterestIncome: n(day.net_interest_income),
          intradayPnl: n(day.intraday_pnl),
          newTradePnl: n(day.new_trade_pnl),
        },
      ],
      "us",
    );
    // 12 CFR 217.204(b)(1) (from memory): fees, commissions, reserves, NII and intraday trading come out.
    const parts =
      n(day.fees_commissions) + n(day.reserves_adjustments) + n(day.net_interest_income) + n(day.intraday_pnl);
    expect(derived.actualPnl).toBeCloseTo(n(day.actual_pnl) - parts, 2);
    expect(derived.suppliedActualPnl).toBe(day.actual_pnl);
    expect(demoRowsFor("LKS-EU", dates)[100].fees_commissions).toBeUndefined(); // the others send none
  });
});

describe.each([
  ["2026-12-01", "no holidays"],
  ["2027-05-14", "no holidays"],
  ["2026-12-01", "seed-like holidays"],
])("the invented Larkspur demo data seeded on %s with %s", (today, calendar) => {
  beforeEach(() => {
    holidays = calendar === "no holidays" ? new Set() : SEED_LIKE_HOLIDAYS;
  });

  it("has three years of business days ending the day before the seed runs", () => {
    const dates = demoDates(today, holidays);
    expect(dates.length).toBeGreaterThan(770);
    expect(dates[dates.length - 1] < today).toBe(true);
  });

  it("LKS-US is in the yellow zone after its stress episode, and was green before it", () => {
    const { dates, out } = seriesByPortfolio("LKS-US", today);
    const obs = out.get("LKS-US-TOTAL")!;
    const now = backtestAt(obs, { regime: "us", asOf: dates[dates.length - 1] });
    const before = backtestAt(obs, { regime: "us", asOf: dates[dates.length - 130] });
    expect(now.zone).toBe("yellow");
    expect(before.zone).toBe("green");
  });

  it("the other entities sit in the green zone today", () => {
    for (const entity of ["LKS-EU", "LKS-AP", "LKS-UK"]) {
      const { dates, out } = seriesByPortfolio(entity, today);
      const top = SCENARIO[entity].top.code;
      expect(backtestAt(out.get(top)!, { regime: REGIME[entity], asOf: dates[dates.length - 1] }).zone, entity).toBe(
        "green",
      );
    }
  });

  it("the FRTB Credit desk is amber on P&L attribution and the other desks green (MAR32.42 thresholds)", () => {
    const { out } = seriesByPortfolio("LKS-UK", today);
    const zones = Object.fromEntries(
      (SCENARIO["LKS-UK"].desks ?? []).map((d) => {
        const last = out.get(d.code)!.slice(-250);
        return [
          d.code,
          plaTest(
            last.map((o) => o.hypotheticalPnl!),
            last.map((o) => o.rtpl!),
          ).zone,
        ];
      }),
    );
    expect(zones).toEqual({
      "LKS-UK-RATES": "green",
      "LKS-UK-FX": "green",
      "LKS-UK-CREDIT": "amber",
      "LKS-UK-EQUITIES": "green",
    });
  });

  it("an FRTB desk left the model after failing desk backtesting and came back; today Credit is amber, so the surcharge is above 0 (MAR32.19, 32.45, 33.45)", () => {
    const { dates, out } = seriesByPortfolio("LKS-UK", today);
    // Each quarter's last business day with data: the determinations (docs/rules.md#frtb-eligibility).
    const asOfs = dates.filter(
      (d, i) =>
        ["03", "06", "09", "12"].includes(d.slice(5, 7)) &&
        dates[i + 1]?.slice(5, 7) !== d.slice(5, 7) &&
        i + 1 < dates.length,
    );
    const desks = (SCENARIO["LKS-UK"].desks ?? []).map((d) => ({ code: d.code, series: out.get(d.code)! }));
    const history = deskStatusHistory(desks, asOfs);
    const statusOf = (code: string) => history.map((h) => h.desks.find((d) => d.code === code)!.status);
    const equities = statusOf("LKS-UK-EQUITIES");
    const left = equities.indexOf("out-of-model");
    expect(left, equities.join(",")).toBeGreaterThan(0);
    expect(history[left].desks.find((d) => d.code === "LKS-UK-EQUITIES")!.backtestPasses).toBe(false);
    expect(equities.slice(left).includes("in-model"), equities.join(",")).toBe(true);
    expect(equities[equities.length - 1]).toBe("in-model");
    const last = history[history.length - 1].desks;
    expect(last.find((d) => d.code === "LKS-UK-CREDIT")!.status).toBe("amber");
    for (const code of ["LKS-UK-RATES", "LKS-UK-FX"])
      expect(
        statusOf(code).every((s) => s === "in-model"),
        code,
      ).toBe(true);

    const top = out.get(SCENARIO["LKS-UK"].top.code)!;
    const r = frtbAggregation(
      top,
      last.map((d) => ({ code: d.code, status: d.status, series: out.get(d.code)! })),
      dates[dates.length - 1],
      1.5,
    );
    expect(r.k).toBeGreaterThan(0);
    expect(r.surcharge).toBeGreaterThan(0);
    // Realistic proportions: the standardised charge of all desks above the internal-model figure.
    expect(r.saAll).toBeGreaterThan(r.imaGA);
    expect(r.acrTotal).toBeLessThanOrEqual(r.saAll + Math.max(0, r.imaGA - r.saGA));
  });

  it("leaves exactly two data problems for the Data screen: a missing day for LKS-EU and a VaR without hypothetical P&L for LKS-AP; VaR moves every day", () => {
    const kinds = (entity: string) => {
      const { out } = seriesByPortfolio(entity, today);
      return [...out.values()].flatMap((s) => findDataQualityIssues(s, holidays).map((f) => f.kind));
    };
    expect(kinds("LKS-EU")).toEqual(["missing_day"]);
    expect(kinds("LKS-AP")).toEqual(["var_without_pnl"]);
    expect(kinds("LKS-US")).toEqual([]); // in particular no stale VaR: the positions change daily
  });

  it("is the same every time it is generated (seeded)", () => {
    const dates = demoDates(today, holidays);
    expect(serialiseObservationCsv(demoRowsFor("LKS-EU", dates))).toBe(
      serialiseObservationCsv(demoRowsFor("LKS-EU", dates)),
    );
  });
});
