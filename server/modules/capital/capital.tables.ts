import type { CapitalHistoryItem } from "../../../shared/schemas/capital";
import { col, type Column, type Table } from "../../kit/table-export";

const historyColumns: Column<CapitalHistoryItem>[] = [
  col.date("Quarter end", (h) => h.quarterEnd),
  col.text("Status", (h) => h.status),
  col.text("Zone", (h) => h.zone),
  col.integer("Exceptions counted", (h) => h.counted),
  col.factor("Plus factor", (h) => h.plusFactor),
  col.factor("Multiplier", (h) => h.multiplier),
  col.money("Capital requirement", (h) => h.capital),
  col.money("Add-on from exceptions", (h) => h.addOn),
  col.yesNo("Full window", (h) => h.windowComplete),
  col.yesNo("Restated after sign-off", (h) => h.restatedAfterSignOff),
  col.integer("Snapshot", (h) => h.snapshotId),
];

/** Each quarter's frozen capital figures, as the Capital screen's history lists them. */
export function capitalHistoryTable(
  entity: { code: string; currency: string },
  rows: CapitalHistoryItem[],
): Table<CapitalHistoryItem> {
  return { title: `Capital history ${entity.code}`, columns: historyColumns, rows, currency: entity.currency };
}
