import { EngineInputError } from "./errors";
import type { PnlBasis, RegimeId } from "../schemas/common";
import { binomialCdf } from "./binomial";
import type { Zone } from "./types";

/**
 * Each rule set as data. Status letters as in docs/rules.md#status: V read in the published text,
 * C computed and matching, M the table as widely reproduced (not re-read).
 */
export interface RegimeRules {
  id: RegimeId;
  label: string;
  /** The rule set as a whole. */
  citation: string;
  /** Multiplier before any plus factor: m_c (and m_s where it exists). */
  baseMultiplier: number;
  baseMultiplierCitation: string;
  defaultPnlBasis: PnlBasis;
  defaultPnlBasisCitation: string;
  /** Plus factor (EU: addend) by number of exceptions; index 10 applies to 10 or more. */
  plusFactors: readonly number[];
  plusFactorsCitation: string;
  plusFactorsStatus: "V" | "C" | "M";
  /** For 250 observations: yellow (amber) from 5, red from 10 exceptions. */
  zoneBoundaries: { yellowFrom: number; redFrom: number };
  zoneBoundariesCitation: string;
  /** FRTB: a day with P&L or VaR missing counts as an exception. */
  missingCountsAsException: boolean;
  missingCitation: string;
  capitalFormula: "var-svar" | "es-ses";
  capitalCitation: string;
  /** What the middle zone is called on screen. */
  middleZoneName: "yellow" | "amber";
}

/** The 250-observation window of the Basel framework and every rule set derived from it. */
export const STANDARD_WINDOW = 250;

const BCBS_1996_ZONES = "BCBS (1996) backtesting framework, Table 2: yellow from 5, red from 10 exceptions in 250";

/**
 * The plus factors and zones of BCBS (1996) Table 2, which the US (multiplication factor less 3.00)
 * and EU (addend) tables repeat step for step; each rule set below cites its own text.
 */
const BCBS_1996_PLUS_FACTORS: readonly number[] = [0, 0, 0, 0, 0, 0.4, 0.5, 0.65, 0.75, 0.85, 1.0];
const BCBS_1996_BOUNDARIES = { yellowFrom: 5, redFrom: 10 };
const MISSING_IS_A_GAP = "no rule; a missing value is a data gap";

export const REGIMES: Record<RegimeId, RegimeRules> = {
  basel: {
    id: "basel",
    label: "Basel 2.5",
    citation: "BCBS (2009), Revisions to the Basel II market risk framework, para 718(Lxxvi)",
    baseMultiplier: 3, // para 718(Lxxvi): m_c and m_s at least 3
    baseMultiplierCitation: "BCBS (2009) para 718(Lxxvi)",
    defaultPnlBasis: "max", // bank's basis; Quartermark's default (docs/rules.md#pnl-basis)
    defaultPnlBasisCitation: "Quartermark default (docs/rules.md#pnl-basis)",
    // BCBS 1996 Table 2 (M): 0–4 → 0.00, 5 → 0.40, 6 → 0.50, 7 → 0.65, 8 → 0.75, 9 → 0.85, ≥10 → 1.00
    plusFactors: BCBS_1996_PLUS_FACTORS,
    plusFactorsCitation: "BCBS (1996) Table 2, applied to m_c and m_s by BCBS (2009) para 718(Lxxvi)",
    plusFactorsStatus: "M",
    zoneBoundaries: BCBS_1996_BOUNDARIES,
    zoneBoundariesCitation: BCBS_1996_ZONES,
    missingCountsAsException: false,
    missingCitation: MISSING_IS_A_GAP,
    capitalFormula: "var-svar",
    capitalCitation: "BCBS (2009) para 718(Lxxvi): max(VaR_{t-1}, m_c·VaR_avg) + max(sVaR_{t-1}, m_s·sVaR_avg)",
    middleZoneName: "yellow",
  },
  us: {
    id: "us",
    label: "US market risk rule",
    citation: "12 CFR 217.204(b), Table 1",
    baseMultiplier: 3, // 12 CFR 217.204(b) Table 1: multiplication factor 3.00 for four or fewer exceptions
    baseMultiplierCitation: "12 CFR 217.204(b) Table 1",
    defaultPnlBasis: "actual", // 217.204(b): actual trading losses over the most recent 250 business days
    defaultPnlBasisCitation: "12 CFR 217.204(b)",
    // 12 CFR 217.204(b) Table 1 (M): multiplication factor 3.00 / 3.40 / 3.50 / 3.65 / 3.75 / 3.85 / 4.00, less the base 3
    plusFactors: BCBS_1996_PLUS_FACTORS,
    plusFactorsCitation: "12 CFR 217.204(b) Table 1 (multiplication factor less 3.00)",
    plusFactorsStatus: "M",
    zoneBoundaries: BCBS_1996_BOUNDARIES,
    zoneBoundariesCitation: "12 CFR 217.204(b) Table 1 (same steps as " + BCBS_1996_ZONES + ")",
    missingCountsAsException: false,
    missingCitation: MISSING_IS_A_GAP,
    capitalFormula: "var-svar",
    capitalCitation:
      "12 CFR 217.204(a)(2)(i): greater of previous day's measure and multiplication factor × 60-day average",
    middleZoneName: "yellow",
  },
  eu: {
    id: "eu",
    label: "EU CRR",
    citation: "Regulation (EU) 575/2013 (CRR) Art. 366 Table 1; Art. 364(1)",
    baseMultiplier: 3, // CRR Art. 366(1): m_c and m_s at least 3
    baseMultiplierCitation: "CRR Art. 366(1)",
    defaultPnlBasis: "max", // higher of hypothetical and actual overshootings: EBA Q&A 2016_2759 (V)
    defaultPnlBasisCitation: "EBA Q&A 2016_2759; CRR Art. 366(3)",
    // CRR Art. 366 Table 1 (M): addend 0.00 / 0.40 / 0.50 / 0.65 / 0.75 / 0.85 / 1.00
    plusFactors: BCBS_1996_PLUS_FACTORS,
    plusFactorsCitation: "CRR Art. 366 Table 1 (addend)",
    plusFactorsStatus: "M",
    zoneBoundaries: BCBS_1996_BOUNDARIES,
    zoneBoundariesCitation: "CRR Art. 366 Table 1 (same steps as " + BCBS_1996_ZONES + ")",
    missingCountsAsException: false,
    missingCitation: MISSING_IS_A_GAP,
    capitalFormula: "var-svar",
    capitalCitation: "CRR Art. 364(1): max(VaR_{t-1}, m_c·VaR_avg) + max(sVaR_{t-1}, m_s·sVaR_avg)",
    middleZoneName: "yellow",
  },
  frtb: {
    id: "frtb",
    label: "FRTB IMA",
    citation: "Basel Framework MAR32 / MAR33 / MAR99; CRR Art. 325bf(6)",
    baseMultiplier: 1.5, // MAR33.41: m_c = 1.5 plus the backtesting add-on
    baseMultiplierCitation: "Basel Framework MAR33.41",
    defaultPnlBasis: "max", // MAR32.5(1): the greater of actual and hypothetical exceptions (V)
    defaultPnlBasisCitation: "Basel Framework MAR32.5(1)",
    // MAR33.42 range 0–0.5 (V); steps (M): 0 / 0.20 / 0.26 / 0.33 / 0.38 / 0.42 / 0.50, i.e. m_c 1.50 … 2.00
    plusFactors: [0, 0, 0, 0, 0, 0.2, 0.26, 0.33, 0.38, 0.42, 0.5],
    plusFactorsCitation: "Basel Framework MAR33.42 (range) and MAR99 (steps)",
    plusFactorsStatus: "M",
    zoneBoundaries: { yellowFrom: 5, redFrom: 10 }, // MAR99: amber from 5, red from 10 in 250
    zoneBoundariesCitation: "Basel Framework MAR99 (amber from 5, red from 10 exceptions in 250)",
    missingCountsAsException: true, // MAR32.5(2): missing P&L or VaR counts as an exception
    missingCitation: "Basel Framework MAR32.5(2)",
    capitalFormula: "es-ses",
    capitalCitation: "MAR33.41 / CRR Art. 325ba(1): max(IMCC_{t-1} + SES_{t-1}, m_c·IMCC_avg + SES_avg)",
    middleZoneName: "amber",
  },
};

export function getRegime(id: RegimeId): RegimeRules {
  const rules = REGIMES[id];
  if (!rules)
    throw new EngineInputError(`Unknown rule set "${String(id)}"; expected one of ${Object.keys(REGIMES).join(", ")}`);
  return rules;
}

function resolve(regime: RegimeId | RegimeRules): RegimeRules {
  return typeof regime === "string" ? getRegime(regime) : regime;
}

export interface ZoneBoundaries {
  yellowFrom: number;
  redFrom: number;
  /** True when derived by the binomial rule for a window other than 250 observations. */
  provisional: boolean;
}

const derivedBoundaries = new Map<string, ZoneBoundaries>();

/**
 * The binomial rule behind BCBS 1996 Table 2: yellow from the smallest k with P(X ≤ k) ≥ 95%,
 * red from the smallest k with P(X ≤ k) ≥ 99.99%, X ~ Binomial(n, 1 − confidence).
 */
export function deriveZoneBoundaries(windowSize: number, confidence = 0.99): { yellowFrom: number; redFrom: number } {
  const p = 1 - confidence;
  let yellowFrom = -1;
  for (let k = 0; k <= windowSize; k++) {
    const cumulative = binomialCdf(k, windowSize, p);
    if (yellowFrom < 0 && cumulative >= 0.95) yellowFrom = k;
    if (cumulative >= 0.9999) return { yellowFrom: Math.max(yellowFrom, 0), redFrom: k };
  }
  return { yellowFrom: Math.max(yellowFrom, 0), redFrom: windowSize + 1 };
}

/** The zone boundaries in force: the regime's table for 250 observations, else derived and provisional. */
export function zoneBoundariesFor(regime: RegimeId | RegimeRules, windowSize = STANDARD_WINDOW): ZoneBoundaries {
  const rules = resolve(regime);
  if (windowSize === STANDARD_WINDOW) return { ...rules.zoneBoundaries, provisional: false };
  if (!Number.isInteger(windowSize) || windowSize < 1)
    throw new EngineInputError(`windowSize must be a positive integer, got ${windowSize}`);
  const key = String(windowSize);
  let found = derivedBoundaries.get(key);
  if (!found) {
    found = { ...deriveZoneBoundaries(windowSize), provisional: true };
    derivedBoundaries.set(key, found);
  }
  return found;
}

export function zoneFor(count: number, regime: RegimeId | RegimeRules, windowSize = STANDARD_WINDOW): Zone {
  const b = zoneBoundariesFor(regime, windowSize);
  if (count >= b.redFrom) return "red";
  if (count >= b.yellowFrom) return "yellow";
  return "green";
}

/**
 * The plus factor for a count. For 250 observations it is the regime's table. For other windows
 * (provisional) the yellow steps are taken in order from the derived yellow boundary, the last
 * yellow step repeats until red, and red takes the maximum — so the factor never falls as the count rises.
 */
export function plusFactorFor(count: number, regime: RegimeId | RegimeRules, windowSize = STANDARD_WINDOW): number {
  const rules = resolve(regime);
  const table = rules.plusFactors;
  const last = table.length - 1;
  if (!(count >= 0)) return 0;
  if (windowSize === STANDARD_WINDOW) return table[Math.min(Math.floor(count), last)];
  const b = zoneBoundariesFor(rules, windowSize);
  if (count >= b.redFrom) return table[last];
  if (count < b.yellowFrom) return 0;
  const y = rules.zoneBoundaries.yellowFrom;
  return table[Math.min(y + Math.floor(count) - b.yellowFrom, last - 1)];
}

/** Multiplier (multiplication factor) = base + plus factor + the supervisor's qualitative addend. */
export function multiplierFor(
  count: number,
  regime: RegimeId | RegimeRules,
  qualitativeAddend = 0,
  windowSize = STANDARD_WINDOW,
): number {
  const rules = resolve(regime);
  return rules.baseMultiplier + plusFactorFor(count, rules, windowSize) + qualitativeAddend;
}
