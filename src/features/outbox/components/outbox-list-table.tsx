import { Link } from "react-router-dom";
import type { OutboxMessage } from "@shared/schemas/outbox";
import { EmptyState, SelectableTr, Table, TableHead, Td } from "@/components/ui/table";
import { formatDateTime, plural } from "@/lib/format";

/** The messages the local mail sink holds, newest first; a row opens its message. */
export function OutboxListTable({
  messages,
  selectedId,
  messageHref,
  onOpen,
}: {
  messages: OutboxMessage[];
  selectedId?: string;
  messageHref: (id: string) => string;
  onOpen: (id: string) => void;
}) {
  if (messages.length === 0)
    return (
      <EmptyState title="No e-mail sent yet — filing a pack from Quarter close sends one">
        When the chief risk officer files an approved quarter, its pack goes by e-mail to the entity's supervisor
        contacts; on this machine the local mail sink keeps the message, and it appears here.
      </EmptyState>
    );
  return (
    <Table caption="Messages kept by the local mail sink, newest first">
      <TableHead columns={["Received", "To", "Subject", "Attachments"]} />
      <tbody>
        {messages.map((m) => {
          const selected = m.id === selectedId;
          return (
            <SelectableTr key={m.id} selected={selected} onOpen={() => onOpen(m.id)}>
              <Td className="figures whitespace-nowrap">{formatDateTime(m.storedAt)}</Td>
              {m.readable ? (
                <>
                  <Td className="text-xs">
                    <ul>
                      {m.to.map((to) => (
                        <li key={to}>{to}</li>
                      ))}
                    </ul>
                  </Td>
                  <Td>
                    <Link to={messageHref(m.id)} className="font-medium">
                      {m.subject || "(no subject)"}
                    </Link>
                  </Td>
                  <Td className="text-xs">
                    {m.attachments.length === 0 ? (
                      <span className="text-ink-muted">None</span>
                    ) : (
                      <ul>
                        {m.attachments.map((a) => (
                          <li key={a.index} className="figures">
                            {a.filename ?? `Attachment ${a.index + 1}`}
                          </li>
                        ))}
                      </ul>
                    )}
                  </Td>
                </>
              ) : (
                <Td colSpan={3}>
                  <Link to={messageHref(m.id)} className="font-medium">
                    Unreadable file
                  </Link>
                  <span className="block text-xs text-ink-muted">{m.problem}</span>
                </Td>
              )}
            </SelectableTr>
          );
        })}
      </tbody>
    </Table>
  );
}

/** "12 messages · 1 unreadable", for the list's heading. */
export function outboxCountLine(messages: OutboxMessage[], total: number): string {
  const unreadable = messages.filter((m) => !m.readable).length;
  const shown =
    total > messages.length
      ? `the newest ${messages.length} of ${plural(total, "message", "messages")}`
      : plural(total, "message", "messages");
  return unreadable ? `${shown} · ${unreadable} unreadable` : shown;
}
