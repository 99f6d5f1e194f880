import type { Snapshot } from "../../../shared/schemas/snapshot";
import type { Column, Table } from "../../kit/table-export";

/** The quarters' snapshots, as Quarter close lists them (several entities: the currency is a column). */
export function snapshotsTable(
  rows: Snapshot[],
  currencies: Map<string, string>,
  entity: string | undefined,
): Table<Snapshot> {
  const columns: Column<Snapshot>[] = [
    { header: "Snapshot", kind: "integer", value: (s) => s.id },
    { header: "Entity", kind: "text", value: (s) => s.entity },
    { header: "Entity name", kind: "text", value: (s) => s.entityName },
    { header: "Quarter end", kind: "date", value: (s) => s.quarterEnd },
    { header: "Status", kind: "text", value: (s) => s.status },
    { header: "Zone", kind: "text", value: (s) => s.zone },
    { header: "Exceptions counted", kind: "integer", value: (s) => s.counted },
    { header: "Plus factor", kind: "number", decimals: 2, value: (s) => s.plusFactor },
    { header: "Multiplier", kind: "number", decimals: 2, value: (s) => s.multiplier },
    { header: "Currency", kind: "text", value: (s) => currencies.get(s.entity) },
    { header: "Capital requirement", kind: "money", value: (s) => s.capital },
    { header: "Add-on from exceptions", kind: "money", value: (s) => s.addOn },
    { header: "Prepared by", kind: "text", value: (s) => s.preparedBy },
    { header: "Prepared at", kind: "datetime", value: (s) => s.preparedAt },
    { header: "Submitted by", kind: "text", value: (s) => s.submittedBy },
    { header: "Submitted at", kind: "datetime", value: (s) => s.submittedAt },
    { header: "Approved by", kind: "text", value: (s) => s.approvedBy },
    { header: "Approved at", kind: "datetime", value: (s) => s.approvedAt },
    { header: "Restated after sign-off", kind: "text", value: (s) => s.restatedAfterSignOff?.detail },
    { header: "Open findings", kind: "integer", value: (s) => s.openFindings },
    { header: "Signature (hash)", kind: "text", value: (s) => s.hash },
    { header: "Inputs sha256", kind: "text", value: (s) => s.inputsSha256 },
  ];
  // One currency in the format when every row shares it; otherwise the Currency column says it per row.
  const inRows = new Set(rows.map((s) => currencies.get(s.entity)));
  const currency = entity ? currencies.get(entity) : inRows.size === 1 ? [...inRows][0] : null;
  return { title: `Snapshots${entity ? ` ${entity}` : ""}`, columns, rows, currency };
}
