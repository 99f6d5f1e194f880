import type { SettingsRecord } from "@shared/schemas/determination";
import { EmptyState, Table, Td, Th, Tr } from "@/components/ui/table";
import { formatDateTime } from "@/lib/format";
import { settingsSummary, statusLabels } from "../words";

function Person({ name, email, at }: { name: string | null; email: string | null; at: string | null }) {
  if (!name && !email) return <span className="text-ink-muted">—</span>;
  return (
    <>
      <span>{name ?? email}</span>
      {at && <span className="block text-2xs text-ink-muted">{formatDateTime(at)}</span>}
    </>
  );
}

/** The entity's dated settings records, newest effective date first, with who proposed and decided each. */
export function SettingsTable({ records, entity }: { records: SettingsRecord[]; entity: string }) {
  if (records.length === 0) {
    return (
      <EmptyState title={`No settings records for ${entity} yet`}>
        An administrator proposes the supervisor's settings with the decision reference and the date they take effect.
      </EmptyState>
    );
  }
  return (
    <Table caption={`Supervisory settings of ${entity}, newest effective date first`}>
      <thead>
        <tr>
          <Th>Effective from</Th>
          <Th>Status</Th>
          <Th>Supervisor's reference</Th>
          <Th>Settings</Th>
          <Th>Proposed by</Th>
          <Th>Decided by</Th>
        </tr>
      </thead>
      <tbody>
        {records.map((r) => (
          <Tr key={r.id} data-record={r.id}>
            <Td className="figures whitespace-nowrap">
              {r.effectiveFrom === "1900-01-01" ? "From the start" : r.effectiveFrom}
            </Td>
            <Td className="whitespace-nowrap">
              <span className={r.status === "proposed" ? "font-medium" : undefined}>{statusLabels[r.status]}</span>
              {r.inForceToday && <span className="block text-2xs font-medium text-accent">in force today</span>}
            </Td>
            <Td>{r.reference}</Td>
            <Td className="text-sm">
              {settingsSummary(r)}
              {r.decisionComment && (
                <span className="block text-2xs text-ink-muted">Decision: {r.decisionComment}</span>
              )}
            </Td>
            <Td className="whitespace-nowrap">
              <Person name={r.proposedByName} email={r.proposedBy} at={r.proposedAt} />
            </Td>
            <Td className="whitespace-nowrap">
              <Person name={r.decidedByName} email={r.decidedBy} at={r.status === "proposed" ? null : r.decidedAt} />
            </Td>
          </Tr>
        ))}
      </tbody>
    </Table>
  );
}
