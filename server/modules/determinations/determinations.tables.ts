import type { DeterminationDto } from "../../../shared/schemas/determination";
import type { Column, Table } from "../../kit/table-export";

const columns: Column<DeterminationDto>[] = [
  { header: "Period end", kind: "date", value: (d) => d.quarterEnd },
  { header: "Counted on", kind: "date", value: (d) => d.asOf },
  { header: "In force from", kind: "date", value: (d) => d.effectiveFrom },
  { header: "In force until", kind: "date", value: (d) => d.effectiveTo },
  { header: "Status", kind: "text", value: (d) => d.status },
  { header: "Exceptions counted", kind: "integer", value: (d) => d.counted },
  { header: "On actual P&L", kind: "integer", value: (d) => d.actual },
  { header: "On hypothetical P&L", kind: "integer", value: (d) => d.hypothetical },
  { header: "Zone", kind: "text", value: (d) => d.zoneLabel },
  { header: "Plus factor", kind: "number", decimals: 2, value: (d) => d.plusFactor },
  { header: "Multiplier (VaR)", kind: "number", decimals: 2, value: (d) => d.multiplier },
  { header: "Multiplier (stressed VaR)", kind: "number", decimals: 2, value: (d) => d.multiplierSvar },
  { header: "Full window", kind: "yes-no", value: (d) => d.windowComplete },
  { header: "Settings reference", kind: "text", value: (d) => d.settings.reference },
  { header: "Settings in force from", kind: "date", value: (d) => d.settings.effectiveFrom },
  { header: "Snapshot", kind: "integer", value: (d) => d.snapshotId },
];

/** An entity's determinations: the count, zone and multiplier each one put in force, and when. */
export function determinationsTable(entity: string, rows: DeterminationDto[]): Table<DeterminationDto> {
  return { title: `Determinations ${entity}`, columns, rows };
}
