import type { PnlBasis, RegimeId } from "../schemas/common";

/** One business day of one portfolio. Amounts in the entity's currency; VaR as a positive amount. */
export interface Observation {
  /** Business date, YYYY-MM-DD. */
  date: string;
  actualPnl: number | null;
  hypotheticalPnl: number | null;
  /** One-day 99% VaR forecast that covers this day's P&L. */
  var99: number | null;
  var975?: number | null;
  svar99?: number | null;
  var10d?: number | null;
  svar10d?: number | null;
  /** Expected shortfall at 97.5% (FRTB IMCC input). */
  es975?: number | null;
  /** Stressed expected shortfall for non-modellable risk factors. */
  ses?: number | null;
  /** Risk-theoretical P&L (FRTB P&L attribution). */
  rtpl?: number | null;
  /** FRTB internal-model default risk charge (MAR33.18): the desk's own, or the desks in the model together. */
  imaDrc?: number | null;
  /** FRTB standardised figures (MAR20.2): sensitivities-based method, residual risk add-on, default risk charge. */
  sbm?: number | null;
  rrao?: number | null;
  saDrc?: number | null;
  /** Top of house only: the standardised charge of the desks in the model together, where the upstream engine supplies it. */
  saGa?: number | null;
  /**
   * Parts of actualPnl that the rule sets treat differently (docs/rules.md#pnl-definition), each
   * already inside actualPnl; shared/backtest/pnl-definition.ts derives each rule set's P&L from them.
   */
  feesCommissions?: number | null;
  reservesAdjustments?: number | null;
  netInterestIncome?: number | null;
  intradayPnl?: number | null;
  newTradePnl?: number | null;
  /** Set by withPnlDefinition when actualPnl was derived: the file's actual_pnl. */
  suppliedActualPnl?: number | null;
}

export type Zone = "green" | "yellow" | "red";

/** What the screen and the pack print: FRTB calls the middle zone amber (MAR99). */
export function zoneLabel(zone: Zone, regime: RegimeId): "green" | "yellow" | "amber" | "red" {
  if (zone === "yellow" && regime === "frtb") return "amber";
  return zone;
}

/** Options shared by every computation that looks at a backtesting window. */
export interface BacktestOptions {
  regime: RegimeId;
  /** Defaults to the regime's default basis (docs/rules.md#pnl-basis). */
  pnlBasis?: PnlBasis;
  /** As-of date, YYYY-MM-DD: the window is the last `windowSize` observations dated on or before it. */
  asOf: string;
  /** Dates whose exception the supervisor agreed to disregard. */
  excludedDates?: Iterable<string>;
  /** The supervisor's qualitative addend to the multiplier (entity setting). */
  qualitativeAddend?: number;
  /** Observations in the window; 250 unless told otherwise. */
  windowSize?: number;
  /** VaR confidence level backtested: 0.99 (var99) or 0.975 (var975). */
  confidence?: number;
}

export type PnlSeriesName = "actual" | "hypothetical";

export interface TestOutcome {
  statistic: number;
  pValue: number;
  reject: boolean;
  verdict: string;
}
