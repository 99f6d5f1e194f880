import { EngineInputError } from "./errors";
import { capitalInputsAt } from "./capital";
import { capitalUnder, multipliersFor, type SupervisorySettings } from "./determination";
import { backtestAt } from "./exceptions";
import { getRegime, zoneFor } from "./regimes";
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

export interface WhatIfFromCountOptions {
  regime: WhatIfOptions["regime"];
  asOf: string;
  /** The counted exceptions the scenario starts from (today's, or a determination's). */
  counted: number;
  /** Addends and floor; default: opts.qualitativeAddend on both multipliers, no floor. */
  settings?: Pick<SupervisorySettings, "qualitativeAddend" | "qualitativeAddendSvar" | "multiplierFloor">;
  extraExceptions?: number;
  varScale?: number;
  svarScale?: number;
  windowSize?: number;
}

function checkScenario(opts: { extraExceptions?: number; varScale?: number; svarScale?: number }): void {
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
}

/**
 * The what-if from a given count: the base is that count with today's capital inputs, the scenario
 * adds exceptions and scales VaR / stressed VaR. Multipliers follow the settings (separate addends
 * for m_c and m_s, the supervisor's floor).
 */
export function whatIfFromCount(observations: readonly Observation[], opts: WhatIfFromCountOptions): WhatIfResult {
  checkScenario(opts);
  const extra = opts.extraExceptions ?? 0;
  const rules = getRegime(opts.regime);
  const windowSize = opts.windowSize ?? 250;
  const settings = opts.settings ?? { qualitativeAddend: 0, qualitativeAddendSvar: null, multiplierFloor: null };

  const figures = (counted: number, scales: { varScale?: number; svarScale?: number }): WhatIfFigures => {
    const inputs = capitalInputsAt(observations, opts.regime, opts.asOf, scales);
    const m = multipliersFor(counted, opts.regime, settings, windowSize);
    const c = capitalUnder(inputs, opts.regime, m.plusFactor, settings);
    return {
      zone: zoneFor(counted, rules, windowSize),
      counted,
      plusFactor: m.plusFactor,
      multiplier: m.multiplier,
      capital: c.requirement,
      addOn: c.addOn,
    };
  };

  const base = figures(opts.counted, {});
  const scenario = figures(opts.counted + extra, { varScale: opts.varScale, svarScale: opts.svarScale });
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

/** The what-if from the rolling count at opts.asOf. */
export function whatIf(
  observations: readonly Observation[],
  opts: WhatIfOptions & { settings?: WhatIfFromCountOptions["settings"] },
): WhatIfResult {
  checkScenario(opts);
  const bt = backtestAt(observations, opts);
  return whatIfFromCount(observations, {
    ...opts,
    counted: bt.exceptions.counted,
    settings: opts.settings ?? {
      qualitativeAddend: opts.qualitativeAddend ?? 0,
      qualitativeAddendSvar: null,
      multiplierFloor: null,
    },
  });
}
