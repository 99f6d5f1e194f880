import type { SnapshotListItem, SnapshotReturn } from "../../../shared/schemas/snapshot";
import type { Column, Table } from "../../kit/table-export";

/** The quarters' snapshots, as Quarter close lists them (several entities: the currency is a column). */
export function snapshotsTable(
  rows: SnapshotListItem[],
  currencies: Map<string, string>,
  entity: string | undefined,
): Table<SnapshotListItem> {
  const columns: Column<SnapshotListItem>[] = [
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
    { header: "Amends snapshot", kind: "integer", value: (s) => s.amends },
    { header: "Amended by snapshot", kind: "integer", value: (s) => s.amendedBy },
  ];
  // One currency in the format when every row shares it; otherwise the Currency column says it per row.
  const inRows = new Set(rows.map((s) => currencies.get(s.entity)));
  const currency = entity ? currencies.get(entity) : inRows.size === 1 ? [...inRows][0] : null;
  return { title: `Snapshots${entity ? ` ${entity}` : ""}`, columns, rows, currency };
}

type ReturnField = SnapshotReturn["fields"][number];

const returnColumns: Column<ReturnField>[] = [
  { header: "Template row", kind: "text", value: (f) => f.templateRow },
  { header: "Item", kind: "text", value: (f) => f.label },
  { header: "Value", kind: "number", value: (f) => f.value },
  { header: "Unit", kind: "text", value: (f) => (f.unit === "amount" ? (f.currency ?? "amount") : f.unit) },
  { header: "Source", kind: "text", value: (f) => f.source },
  { header: "Entered by the analyst", kind: "yes-no", value: (f) => f.analystInput === true },
  { header: "Key", kind: "text", value: (f) => f.key },
];

/** A snapshot's return data: each value with the template row it goes to and where it comes from. */
export function returnTable(entity: string, data: SnapshotReturn): Table<ReturnField> {
  return { title: `Return data ${entity} ${data.quarterEnd}`, columns: returnColumns, rows: data.fields };
}
