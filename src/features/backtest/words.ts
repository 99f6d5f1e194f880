import type { ExceptionCause, ExceptionDayDto, ExclusionStatus } from "@shared/schemas/backtest";
import type { PnlBasis, RegimeId } from "@shared/schemas/common";

/** A p-value with four places; below that, "< 0.0001". */
export function formatPValue(p: number): string {
  if (p < 0.0001) return "< 0.0001";
  return p.toLocaleString("en-GB", { minimumFractionDigits: 4, maximumFractionDigits: 4 });
}

export function formatStatistic(s: number): string {
  return s.toLocaleString("en-GB", { minimumFractionDigits: 3, maximumFractionDigits: 3 });
}

export const causeLabels: Record<ExceptionCause, string> = {
  market_move: "Market move",
  model_limitation: "Model limitation",
  data_issue: "Data issue",
  intraday_trading: "Intraday trading",
  pricing: "Pricing",
  other: "Other",
};
export const causeIds = Object.keys(causeLabels) as ExceptionCause[];

export const exclusionStatusLabels: Record<ExclusionStatus, string> = {
  none: "Explained",
  requested: "Exclusion requested",
  approved: "Excluded by the supervisor",
  rejected: "Exclusion refused",
};

/** One word for where an exception's review stands, for the table and the overview. */
export function reviewStatusOf(day: Pick<ExceptionDayDto, "review">): string {
  if (!day.review) return "Not reviewed";
  return exclusionStatusLabels[day.review.exclusionStatus];
}

export const basisLabels: Record<PnlBasis, string> = {
  actual: "actual P&L",
  hypothetical: "hypothetical P&L",
  max: "the higher of actual and hypothetical",
};

export const regimeLabels: Record<RegimeId, string> = {
  basel: "Basel 2.5",
  us: "US market risk rule",
  eu: "EU CRR",
  frtb: "FRTB IMA",
};
