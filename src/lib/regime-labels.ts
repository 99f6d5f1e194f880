import type { PnlBasis, RegimeId } from "@shared/schemas/common";
import { REGIMES } from "@shared/backtest/regimes";

/** Each rule set's name, as the engine's rule table writes it. */
export const regimeLabels = Object.fromEntries(
  (Object.keys(REGIMES) as RegimeId[]).map((id) => [id, REGIMES[id].label]),
) as Record<RegimeId, string>;

export const pnlBasisLabels: Record<PnlBasis, string> = {
  actual: "Actual P&L",
  hypothetical: "Hypothetical P&L",
  max: "Higher of actual and hypothetical",
};

/** The P&L basis a new entity starts with, read from the engine's rule sets (one source of truth). */
export const defaultPnlBasis = Object.fromEntries(
  (Object.keys(REGIMES) as RegimeId[]).map((id) => [id, REGIMES[id].defaultPnlBasis]),
) as Record<RegimeId, PnlBasis>;

export const regimeIds = Object.keys(regimeLabels) as RegimeId[];
export const pnlBasisIds = Object.keys(pnlBasisLabels) as PnlBasis[];
