import type { AuditEvent } from "@shared/schemas/audit";
import { EmptyState, Table, TableHead, Td, Tr } from "@/components/ui/table";
import { compactJson, formatDateTime } from "@/lib/format";

function Change({ before, after }: { before: unknown; after: unknown }) {
  if ((before === null || before === undefined) && (after === null || after === undefined))
    return <span className="text-ink-faint">—</span>;
  return (
    <details className="max-w-md">
      <summary className="text-xs text-accent">Before → after</summary>
      <div className="mt-1 grid grid-cols-[auto_1fr] gap-x-2 gap-y-0.5 text-2xs">
        <span className="text-ink-muted">Before</span>
        <code className="break-all">{compactJson(before)}</code>
        <span className="text-ink-muted">After</span>
        <code className="break-all">{compactJson(after)}</code>
      </div>
    </details>
  );
}

export function AuditTable({ events, filtered }: { events: AuditEvent[]; filtered: boolean }) {
  if (events.length === 0) {
    return filtered ? (
      <EmptyState title="No events match this filter">
        Clear the filter, widen the days, or check the spelling of the action or e-mail.
      </EmptyState>
    ) : (
      <EmptyState title="No events recorded yet">
        Sign-ins, failed sign-ins and every change made under Administration are written here as they happen.
      </EmptyState>
    );
  }
  return (
    <Table caption="Audit events, newest first">
      <TableHead columns={["When", "Who", "Action", "Target", "From address", "Change"]} />
      <tbody>
        {events.map((e) => (
          <Tr key={e.id}>
            <Td className="figures whitespace-nowrap">{formatDateTime(e.at)}</Td>
            <Td>
              {e.actorEmail ? (
                <span title={e.actorEmail}>{e.actorName ?? e.actorEmail}</span>
              ) : (
                <span className="text-ink-muted">Anonymous</span>
              )}
            </Td>
            <Td>
              <code className="text-xs">{e.action}</code>
            </Td>
            <Td className="break-words">
              {e.target === null ? (
                <span className="text-ink-faint">—</span>
              ) : e.targetWords ? (
                // The words for reading; the stored reference (as signed) on hover.
                <span title={e.target}>{e.targetWords}</span>
              ) : (
                e.target
              )}
            </Td>
            <Td className="figures whitespace-nowrap">{e.ip ?? <span className="text-ink-faint">—</span>}</Td>
            <Td>
              <Change before={e.before} after={e.after} />
            </Td>
          </Tr>
        ))}
      </tbody>
    </Table>
  );
}
