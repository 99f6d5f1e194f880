import { Link } from "react-router-dom";
import type { OutboxMessage } from "@shared/schemas/outbox";
import { ListCell, RecordTable, Td, type RowOpening } from "@/components/ui/table";
import { formatDateTime, plural } from "@/lib/format";

/** The messages the local mail sink holds, newest first; a row opens its message. */
export function OutboxListTable({ messages, hrefOf, ...opening }: RowOpening<string> & { messages: OutboxMessage[] }) {
  return (
    <RecordTable
      caption="Messages kept by the local mail sink, newest first"
      columns={["Received", "To", "Subject", "Attachments"]}
      records={messages}
      empty={{
        title: "No e-mail sent yet — filing a pack from Quarter close sends one",
        next:
          "When the chief risk officer files an approved quarter, its pack goes by e-mail to the entity's supervisor " +
          "contacts; on this machine the local mail sink keeps the message, and it appears here.",
      }}
      {...opening}
    >
      {(m) => (
        <>
          <Td className="figures whitespace-nowrap">{formatDateTime(m.storedAt)}</Td>
          {m.readable ? (
            <>
              <ListCell items={m.to} />
              <Td>
                <Link to={hrefOf(m.id)} className="font-medium">
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
              <Link to={hrefOf(m.id)} className="font-medium">
                Unreadable file
              </Link>
              <span className="block text-xs text-ink-muted">{m.problem}</span>
            </Td>
          )}
        </>
      )}
    </RecordTable>
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
