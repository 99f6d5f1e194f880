import type { CapitalHistoryItem } from "../../../shared/schemas/capital";
import type { Column, Table } from "../../kit/table-export";

const historyColumns: Column<CapitalHistoryItem>[] = [
  { header: "Quarter end", kind: "date", value: (h) => h.quarterEnd },
  { header: "Status", kind: "text", value: (h) => h.status },
  { header: "Zone", kind: "text", value: (h) => h.zone },
  { header: "Exceptions counted", kind: "integer", value: (h) => h.counted },
  { header: "Plus factor", kind: "number", decimals: 2, value: (h) => h.plusFactor },
  { header: "Multiplier", kind: "number", decimals: 2, value: (h) => h.multiplier },
  { header: "Capital requirement", kind: "money", value: (h) => h.capital },
  { header: "Add-on from exceptions", kind: "money", value: (h) => h.addOn },
  { header: "Full window", kind: "yes-no", value: (h) => h.windowComplete },
  { header: "Restated after sign-off", kind: "yes-no", value: (h) => h.restatedAfterSignOff },
  { header: "Snapshot", kind: "integer", value: (h) => h.snapshotId },
];

/** Each quarter's frozen capital figures, as the Capital screen's history lists them. */
export function capitalHistoryTable(
  entity: { code: string; currency: string },
  rows: CapitalHistoryItem[],
): Table<CapitalHistoryItem> {
  return { title: `Capital history ${entity.code}`, columns: historyColumns, rows, currency: entity.currency };
}
