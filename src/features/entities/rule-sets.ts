import type { PnlBasis, RegimeId } from "@shared/schemas/common";
import { REGIMES } from "@shared/backtest/regimes";

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

/** The P&L basis a new entity starts with, read from the engine's rule sets (one source of truth). */
export const defaultPnlBasis = Object.fromEntries(
  (Object.keys(REGIMES) as RegimeId[]).map((id) => [id, REGIMES[id].defaultPnlBasis]),
) as Record<RegimeId, PnlBasis>;

export const ruleSetIds = Object.keys(ruleSetLabels) as RegimeId[];
export const pnlBasisIds = Object.keys(pnlBasisLabels) as PnlBasis[];
