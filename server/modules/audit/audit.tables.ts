import type { AuditEvent } from "../../../shared/schemas/audit";
import { col, type Column, type Table } from "../../kit/table-export";

const json = (v: unknown) => (v === null || v === undefined ? null : JSON.stringify(v));

const columns: Column<AuditEvent>[] = [
  col.integer("Event", (e) => e.id),
  col.datetime("At", (e) => e.at),
  col.text("Who", (e) => e.actorEmail),
  col.text("Action", (e) => e.action),
  col.text("Target", (e) => e.target),
  col.text("Address", (e) => e.ip),
  col.text("Before", (e) => json(e.before)),
  col.text("After", (e) => json(e.after)),
];

/** The audit log with the screen's filter applied, newest first. */
export function auditTable(rows: AuditEvent[], filter: { action?: string }): Table<AuditEvent> {
  return { title: `Audit log${filter.action ? ` ${filter.action}` : ""}`, columns, rows };
}
