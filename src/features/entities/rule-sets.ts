import type { PnlBasis, RegimeId } from "@shared/schemas/common";

export const ruleSetLabels: Record<RegimeId, string> = {
  basel: "Basel 2.5",
  us: "US market risk rule",
  eu: "EU CRR",
  frtb: "FRTB IMA",
};

export const pnlBasisLabels: Record<PnlBasis, string> = {
  actual: "Actual P&L",
  hypothetical: "Hypothetical P&L",
  max: "Higher of actual and hypothetical",
};

/**
 * The P&L basis a new entity starts with (DESIGN.md §4: Basel 2.5 max, US actual, EU max, FRTB max).
 * Only a form default; the count itself is computed by the engine in shared/backtest.
 */
export const defaultPnlBasis: Record<RegimeId, PnlBasis> = {
  basel: "max",
  us: "actual",
  eu: "max",
  frtb: "max",
};

export const ruleSetIds = Object.keys(ruleSetLabels) as RegimeId[];
export const pnlBasisIds = Object.keys(pnlBasisLabels) as PnlBasis[];
