import { quarterLabel, SIGNED_OFF, type CapitalHistoryItem } from "@shared/schemas/snapshot";

export type HistoryPoint = CapitalHistoryItem & { label: string; signedOff: boolean };

/** The history as the chart and table read it: a quarter label and whether its figures are signed off. */
export function historyPoints(items: readonly CapitalHistoryItem[]): HistoryPoint[] {
  return items.map((i) => ({ ...i, label: quarterLabel(i.quarterEnd), signedOff: SIGNED_OFF.has(i.status) }));
}
