import { PNL_COMPONENTS, type RegimeId } from "../schemas/common";
import type { Observation } from "./types";

/**
 * The parts of a day's actual P&L that the rule texts treat differently (docs/rules.md#pnl-definition).
 * A file may carry them as optional columns; each is an amount already inside `actual_pnl` (signed,
 * like the P&L), and each rule set removes the ones its definition of the backtesting P&L excludes.
 */
export { PNL_COMPONENTS };
export type PnlComponent = (typeof PNL_COMPONENTS)[number];

/** What the screen and the pack call each part. */
export const PNL_COMPONENT_LABELS: Record<PnlComponent, string> = {
  feesCommissions: "Fees and commissions",
  reservesAdjustments: "Reserves and valuation adjustments",
  netInterestIncome: "Net interest income",
  intradayPnl: "Intraday trading",
  newTradePnl: "New and modified trades",
};

export interface PnlDefinition {
  /** The parts this rule set takes out of the actual P&L before it is compared with VaR. */
  excludes: readonly PnlComponent[];
  /** The rule text, in a line. */
  source: string;
  /** verified, verified-secondary, from memory or common practice (docs/rules.md#pnl-definition). */
  status: string;
}

/** docs/rules.md#pnl-definition: each rule set's actual P&L for backtesting. */
export const PNL_DEFINITIONS: Record<RegimeId, PnlDefinition> = {
  basel: {
    excludes: ["feesCommissions"],
    source:
      "BCBS 1996 backtesting framework: fee income contaminates actual trading outcomes; the text leaves " +
      "the definition to the bank and its supervisor",
    status: "common practice",
  },
  us: {
    excludes: ["feesCommissions", "reservesAdjustments", "netInterestIncome", "intradayPnl"],
    source:
      "12 CFR 217.204(b): trading losses excluding fees, commissions, reserves, net interest income and " +
      "intraday trading",
    status: "from memory",
  },
  eu: {
    excludes: ["feesCommissions", "netInterestIncome"],
    source:
      "CRR Art. 366(3): actual changes in the portfolio's value excluding fees, commissions and net interest income",
    status: "verified-secondary",
  },
  frtb: {
    excludes: ["feesCommissions", "reservesAdjustments"],
    source:
      "MAR32: actual P&L includes intraday trading and new and modified deals, and excludes fees and " +
      "commissions and valuation adjustments with their own capital treatment",
    status: "from memory",
  },
};

/** True when the day carries at least one part of its P&L. */
export function hasPnlComponents(o: Pick<Observation, PnlComponent>): boolean {
  return PNL_COMPONENTS.some((c) => o[c] != null);
}

/** To the cent, like the stored amounts (no −0). */
const toCents = (value: number) => Math.round(value * 100) / 100 + 0;

/**
 * The actual P&L a rule set backtests on: the file's `actual_pnl` less the parts the rule set
 * excludes (a part the file leaves empty is taken as none). Without parts, the P&L as supplied.
 */
export function backtestingActualPnl(o: Observation, regime: RegimeId): number | null {
  if (o.actualPnl == null) return null;
  let pnl = o.actualPnl;
  for (const c of PNL_DEFINITIONS[regime].excludes) pnl -= o[c] ?? 0;
  return toCents(pnl);
}

/**
 * The series a rule set backtests: each day's actual P&L derived by the rule set's definition,
 * the supplied figure kept beside it. Days without parts are returned as they are (the same object).
 */
export function withPnlDefinition<O extends Observation>(series: readonly O[], regime: RegimeId): O[] {
  return series.map((o) =>
    hasPnlComponents(o) ? { ...o, suppliedActualPnl: o.actualPnl, actualPnl: backtestingActualPnl(o, regime) } : o,
  );
}

export interface PnlMakeUpLine {
  component: PnlComponent;
  label: string;
  /** Null when the file left the part empty. */
  amount: number | null;
  /** Taken out of the backtesting P&L by this rule set. */
  removed: boolean;
}

export interface PnlMakeUp {
  /** The file's actual_pnl. */
  supplied: number;
  lines: PnlMakeUpLine[];
  /** supplied − the removed parts: what was compared with VaR. */
  backtesting: number;
  source: string;
}

/** How a day's actual P&L was made up under a rule set; null for a day without parts (P&L as supplied). */
export function pnlMakeUp(o: Observation, regime: RegimeId): PnlMakeUp | null {
  const supplied = o.suppliedActualPnl ?? o.actualPnl;
  if (supplied == null || !hasPnlComponents(o)) return null;
  const definition = PNL_DEFINITIONS[regime];
  const lines = PNL_COMPONENTS.map((component) => ({
    component,
    label: PNL_COMPONENT_LABELS[component],
    amount: o[component] ?? null,
    removed: definition.excludes.includes(component),
  }));
  const backtesting = toCents(lines.reduce((pnl, l) => (l.removed ? pnl - (l.amount ?? 0) : pnl), supplied));
  return { supplied, lines, backtesting, source: definition.source };
}
