import { EngineInputError } from "./errors";
import { capitalAddOnFromInputs, capitalInputsAt, requirementFromInputs } from "./capital";
import { backtestAt } from "./exceptions";
import { getRegime, plusFactorFor, zoneFor } from "./regimes";
import type { BacktestOptions, Observation, Zone } from "./types";

/**
 * What-if (docs/rules.md#what-if): the figures with extra exceptions and with VaR / stressed VaR scaled.
 * The scaling applies to the capital inputs (FRTB: ES and SES); the exception record itself is
 * history and is not recounted against a scaled VaR.
 */

export interface WhatIfOptions extends BacktestOptions {
  extraExceptions?: number;
  varScale?: number;
  svarScale?: number;
}

export interface WhatIfFigures {
  zone: Zone;
  counted: number;
  plusFactor: number;
  multiplier: number;
  capital: number;
  addOn: number;
}

export interface WhatIfResult {
  base: WhatIfFigures;
  scenario: WhatIfFigures;
  delta: {
    counted: number;
    plusFactor: number;
    multiplier: number;
    capital: number;
    addOn: number;
    zoneChanged: boolean;
  };
}

export function whatIf(observations: readonly Observation[], opts: WhatIfOptions): WhatIfResult {
  const extra = opts.extraExceptions ?? 0;
  if (!Number.isInteger(extra) || extra < 0)
    throw new EngineInputError(`extraExceptions must be a non-negative whole number, got ${extra}`);
  for (const [name, v] of [
    ["varScale", opts.varScale],
    ["svarScale", opts.svarScale],
  ] as const) {
    if (v !== undefined && !(Number.isFinite(v) && v >= 0))
      throw new EngineInputError(`${name} must be a non-negative number, got ${v}`);
  }
  const rules = getRegime(opts.regime);
  const windowSize = opts.windowSize ?? 250;
  const addend = opts.qualitativeAddend ?? 0;
  const bt = backtestAt(observations, opts);

  const figures = (counted: number, scales: { varScale?: number; svarScale?: number }): WhatIfFigures => {
    const inputs = capitalInputsAt(observations, opts.regime, opts.asOf, scales);
    const plusFactor = plusFactorFor(counted, rules, windowSize);
    const multiplier = rules.baseMultiplier + plusFactor + addend;
    return {
      zone: zoneFor(counted, rules, windowSize),
      counted,
      plusFactor,
      multiplier,
      capital: requirementFromInputs(inputs, rules, multiplier).requirement,
      addOn: capitalAddOnFromInputs(inputs, opts.regime, plusFactor, addend),
    };
  };

  const base = figures(bt.exceptions.counted, {});
  const scenario = figures(bt.exceptions.counted + extra, { varScale: opts.varScale, svarScale: opts.svarScale });
  return {
    base,
    scenario,
    delta: {
      counted: scenario.counted - base.counted,
      plusFactor: scenario.plusFactor - base.plusFactor,
      multiplier: scenario.multiplier - base.multiplier,
      capital: scenario.capital - base.capital,
      addOn: scenario.addOn - base.addOn,
      zoneChanged: scenario.zone !== base.zone,
    },
  };
}
