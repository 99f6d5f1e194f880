/**
 * Who is who in the invented Larkspur daily data (docs/architecture.md#demo-data): one entity turns
 * yellow after a stress episode, one FRTB desk sits amber on P&L attribution, and another left the
 * model for a while after failing desk backtesting.
 */
import {
  generateDeskedRows,
  generatePortfolioRows,
  normal,
  seededRandom,
  type DemoRow,
  type PortfolioSpec,
} from "./daily-data";
import { PNL_DEFINITIONS } from "../../shared/backtest/pnl-definition";

export const DEMO_YEARS = 3;

interface EntityScenario {
  top: PortfolioSpec;
  desks?: PortfolioSpec[];
  /** Data problems for the Data screen to find: a business day never sent, a P&L never sent (days before the last). */
  missingDayBeforeEnd?: number;
  blankHypotheticalBeforeEnd?: number;
  /**
   * The finance system sends the parts of the actual P&L (docs/rules.md#pnl-definition): fee income, reserves,
   * net interest income, intraday trading and new-trade P&L, of about these sizes against the daily volatility.
   * The supplied actual P&L carries them, so the rule set's own P&L (the simulated one) is what is backtested.
   */
  pnlParts?: { seed: number };
}

export const SCENARIO: Record<string, EntityScenario> = {
  "LKS-EU": { top: { code: "LKS-EU-TOTAL", seed: 1106, dailyVol: 3_200_000 }, missingDayBeforeEnd: 12 },
  // A stress episode about four months ago: the historical-simulation VaR learns late, exceptions bunch.
  "LKS-US": {
    top: {
      code: "LKS-US-TOTAL",
      seed: 2203,
      dailyVol: 4_500_000,
      stress: { startsDaysBeforeEnd: 85, days: 20, factor: 4 },
    },
    pnlParts: { seed: 2290 },
  },
  "LKS-AP": { top: { code: "LKS-AP-TOTAL", seed: 3303, dailyVol: 2_100_000 }, blankHypotheticalBeforeEnd: 7 },
  "LKS-UK": {
    top: { code: "LKS-UK-TOTAL", seed: 4404, dailyVol: 0 },
    desks: [
      { code: "LKS-UK-RATES", seed: 4413, dailyVol: 1_800_000, rtplLoading: 0.97, withEs: true },
      { code: "LKS-UK-FX", seed: 4416, dailyVol: 1_200_000, rtplLoading: 0.96, withEs: true },
      // The risk model misses part of this desk's basis risk: RTPL follows HPL only loosely.
      { code: "LKS-UK-CREDIT", seed: 4433, dailyVol: 1_000_000, rtplLoading: 0.8, withEs: true },
      // About two years ago this desk's VaR left out a risk factor for 150 days: it failed desk backtesting,
      // left the model, and returned once its 250-day count was back within the limits with PLA green.
      {
        code: "LKS-UK-EQUITIES",
        seed: 4444,
        dailyVol: 1_500_000,
        rtplLoading: 0.95,
        withEs: true,
        varUnderstated: { startsDaysBeforeEnd: 560, days: 150, factor: 0.4 },
      },
    ],
  },
};

/** Business days (weekdays minus holidays) ending on the last one strictly before `today`. */
export function demoDates(today: string, holidays: ReadonlySet<string>, years = DEMO_YEARS): string[] {
  const dates: string[] = [];
  const d = new Date(`${today}T00:00:00Z`);
  const start = new Date(d);
  start.setUTCFullYear(start.getUTCFullYear() - years);
  d.setUTCDate(d.getUTCDate() - 1);
  while (d >= start) {
    const iso = d.toISOString().slice(0, 10);
    const wd = d.getUTCDay();
    if (wd !== 0 && wd !== 6 && !holidays.has(iso)) dates.push(iso);
    d.setUTCDate(d.getUTCDate() - 1);
  }
  return dates.reverse();
}

export function demoRowsFor(entityCode: string, dates: string[]): DemoRow[] {
  const spec = SCENARIO[entityCode];
  if (!spec) return [];
  let rows = spec.desks ? generateDeskedRows(spec.top, spec.desks, dates) : generatePortfolioRows(spec.top, dates);
  if (spec.missingDayBeforeEnd !== undefined) {
    const gone = dates[dates.length - 1 - spec.missingDayBeforeEnd];
    rows = rows.filter((r) => r.date !== gone);
  }
  if (spec.pnlParts) rows = withPnlParts(rows, spec.pnlParts.seed, spec.top.dailyVol);
  if (spec.blankHypotheticalBeforeEnd !== undefined) {
    const blank = dates[dates.length - 1 - spec.blankHypotheticalBeforeEnd];
    rows = rows.map((r) => (r.date === blank ? { ...r, hypothetical_pnl: null } : r));
  }
  return rows;
}

const cents = (x: number) => Math.round(x * 100) / 100;

/**
 * Adds the parts of the actual P&L to a US entity's rows: the simulated actual P&L is what the US rule
 * backtests (12 CFR 217.204(b), docs/rules.md#pnl-definition), so the file's actual P&L is it plus the
 * parts that rule takes out. New-trade P&L is already inside the simulated figure (no rule takes it out).
 */
function withPnlParts(rows: DemoRow[], seed: number, dailyVol: number): DemoRow[] {
  const rand = seededRandom(seed);
  const excluded = new Set<string>(PNL_DEFINITIONS.us.excludes);
  return rows.map((r) => {
    const parts = {
      fees_commissions: cents(dailyVol * (0.018 + 0.008 * rand())),
      reserves_adjustments: cents(-dailyVol * 0.004 * rand()),
      net_interest_income: cents(dailyVol * 0.006 * normal(rand)),
      intraday_pnl: cents(dailyVol * 0.03 * normal(rand)),
      new_trade_pnl: cents(dailyVol * 0.01 * normal(rand)),
    };
    if (typeof r.actual_pnl !== "number") return { ...r, ...parts };
    const camel = {
      fees_commissions: "feesCommissions",
      reserves_adjustments: "reservesAdjustments",
      net_interest_income: "netInterestIncome",
      intraday_pnl: "intradayPnl",
      new_trade_pnl: "newTradePnl",
    } as const;
    let supplied = r.actual_pnl;
    for (const [column, amount] of Object.entries(parts))
      if (excluded.has(camel[column as keyof typeof camel])) supplied += amount;
    return { ...r, ...parts, actual_pnl: cents(supplied) };
  });
}
