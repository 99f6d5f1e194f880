import type { DeterminationDto } from "../../../shared/schemas/determination";
import { col, type Column, type Table } from "../../kit/table-export";

const columns: Column<DeterminationDto>[] = [
  col.date("Period end", (d) => d.quarterEnd),
  col.date("Counted on", (d) => d.asOf),
  col.date("In force from", (d) => d.effectiveFrom),
  col.date("In force until", (d) => d.effectiveTo),
  col.text("Status", (d) => d.status),
  col.integer("Exceptions counted", (d) => d.counted),
  col.integer("On actual P&L", (d) => d.actual),
  col.integer("On hypothetical P&L", (d) => d.hypothetical),
  col.text("Zone", (d) => d.zoneLabel),
  col.factor("Plus factor", (d) => d.plusFactor),
  col.factor("Multiplier (VaR)", (d) => d.multiplier),
  col.factor("Multiplier (stressed VaR)", (d) => d.multiplierSvar),
  col.yesNo("Full window", (d) => d.windowComplete),
  col.text("Settings reference", (d) => d.settings.reference),
  col.date("Settings in force from", (d) => d.settings.effectiveFrom),
  col.integer("Snapshot", (d) => d.snapshotId),
];

/** An entity's determinations: the count, zone and multiplier each one put in force, and when. */
export function determinationsTable(entity: string, rows: DeterminationDto[]): Table<DeterminationDto> {
  return { title: `Determinations ${entity}`, columns, rows };
}
