import type { AuditEvent } from "../../../shared/schemas/audit";
import type { Column, Table } from "../../kit/table-export";

const json = (v: unknown) => (v === null || v === undefined ? null : JSON.stringify(v));

const columns: Column<AuditEvent>[] = [
  { header: "Event", kind: "integer", value: (e) => e.id },
  { header: "At", kind: "datetime", value: (e) => e.at },
  { header: "Who", kind: "text", value: (e) => e.actorEmail },
  { header: "Action", kind: "text", value: (e) => e.action },
  { header: "Target", kind: "text", value: (e) => e.target },
  { header: "Address", kind: "text", value: (e) => e.ip },
  { header: "Before", kind: "text", value: (e) => json(e.before) },
  { header: "After", kind: "text", value: (e) => json(e.after) },
];

/** The audit log with the screen's filter applied, newest first. */
export function auditTable(rows: AuditEvent[], filter: { action?: string }): Table<AuditEvent> {
  return { title: `Audit log${filter.action ? ` ${filter.action}` : ""}`, columns, rows };
}
