import { quarterLabel } from "@shared/backtest/quarters";
import { SIGNED_OFF } from "@shared/schemas/snapshot";
import { type CapitalHistoryItem } from "@shared/schemas/capital";

export type HistoryPoint = CapitalHistoryItem & { label: string; signedOff: boolean };

/** The history as the chart and table read it: a quarter label and whether its figures are signed off. */
export function historyPoints(items: readonly CapitalHistoryItem[]): HistoryPoint[] {
  return items.map((i) => ({ ...i, label: quarterLabel(i.quarterEnd), signedOff: SIGNED_OFF.has(i.status) }));
}
