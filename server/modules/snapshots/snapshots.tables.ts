import type { SnapshotListItem, SnapshotReturn } from "../../../shared/schemas/snapshot";
import { col, type Column, type Table } from "../../kit/table-export";

/** The quarters' snapshots, as Quarter close lists them (several entities: the currency is a column). */
export function snapshotsTable(
  rows: SnapshotListItem[],
  currencies: Map<string, string>,
  entity: string | undefined,
): Table<SnapshotListItem> {
  const columns: Column<SnapshotListItem>[] = [
    col.integer("Snapshot", (s) => s.id),
    col.text("Entity", (s) => s.entity),
    col.text("Entity name", (s) => s.entityName),
    col.date("Quarter end", (s) => s.quarterEnd),
    col.text("Status", (s) => s.status),
    col.text("Zone", (s) => s.zone),
    col.integer("Exceptions counted", (s) => s.counted),
    col.factor("Plus factor", (s) => s.plusFactor),
    col.factor("Multiplier", (s) => s.multiplier),
    col.text("Currency", (s) => currencies.get(s.entity)),
    col.money("Capital requirement", (s) => s.capital),
    col.money("Add-on from exceptions", (s) => s.addOn),
    col.text("Prepared by", (s) => s.preparedBy),
    col.datetime("Prepared at", (s) => s.preparedAt),
    col.text("Submitted by", (s) => s.submittedBy),
    col.datetime("Submitted at", (s) => s.submittedAt),
    col.text("Approved by", (s) => s.approvedBy),
    col.datetime("Approved at", (s) => s.approvedAt),
    col.text("Restated after sign-off", (s) => s.restatedAfterSignOff?.detail),
    col.integer("Open findings", (s) => s.openFindings),
    col.text("Signature (hash)", (s) => s.hash),
    col.text("Inputs sha256", (s) => s.inputsSha256),
    col.integer("Amends snapshot", (s) => s.amends),
    col.integer("Amended by snapshot", (s) => s.amendedBy),
  ];
  // One currency in the format when every row shares it; otherwise the Currency column says it per row.
  const inRows = new Set(rows.map((s) => currencies.get(s.entity)));
  const currency = entity ? currencies.get(entity) : inRows.size === 1 ? [...inRows][0] : null;
  return { title: `Snapshots${entity ? ` ${entity}` : ""}`, columns, rows, currency };
}

type ReturnField = SnapshotReturn["fields"][number];

const returnColumns: Column<ReturnField>[] = [
  col.text("Template row", (f) => f.templateRow),
  col.text("Item", (f) => f.label),
  col.number("Value", (f) => f.value),
  col.text("Unit", (f) => (f.unit === "amount" ? (f.currency ?? "amount") : f.unit)),
  col.text("Source", (f) => f.source),
  col.yesNo("Entered by the analyst", (f) => f.analystInput === true),
  col.text("Key", (f) => f.key),
];

/** A snapshot's return data: each value with the template row it goes to and where it comes from. */
export function returnTable(entity: string, data: SnapshotReturn): Table<ReturnField> {
  return { title: `Return data ${entity} ${data.quarterEnd}`, columns: returnColumns, rows: data.fields };
}
