import type { ReactNode } from "react";
import type { OutboxMessageDetail } from "@shared/schemas/outbox";
import { FullHash } from "@/components/ui/hash";
import { Table, Td, Th, Tr } from "@/components/ui/table";
import { formatBytes, formatDateTime } from "@/lib/format";
import { outboxAttachmentHref } from "../api/outbox-queries";
import { Subsection } from "@/components/ui/page-title";

function Field({ label, children }: { label: string; children: ReactNode }) {
  return (
    <div className="grid grid-cols-[8rem_1fr] gap-x-3">
      <dt className="text-2xs font-semibold tracking-wide text-ink-muted uppercase">{label}</dt>
      <dd className="min-w-0 text-sm break-words">{children}</dd>
    </div>
  );
}

/** One message as the sink kept it: envelope, plain text, and each attachment with its SHA-256 and download. */
export function OutboxMessageView({ message, folder }: { message: OutboxMessageDetail; folder: string }) {
  const file = `${folder}/${message.id}.eml`;
  if (!message.readable)
    return (
      <section aria-labelledby="outbox-message-title" className="flex flex-col gap-2 border-t border-rule pt-4">
        <h2 id="outbox-message-title">This file could not be read as an e-mail message</h2>
        <p className="text-sm text-ink-soft">{message.problem}</p>
        <p className="text-sm text-ink-muted">
          It stays where the sink keeps its messages, for you to open by hand:{" "}
          <code className="text-xs break-all">{file}</code> ({formatBytes(message.size)}, written{" "}
          {formatDateTime(message.storedAt)}).
        </p>
      </section>
    );

  return (
    <section aria-labelledby="outbox-message-title" className="flex flex-col gap-4 border-t border-rule pt-4">
      <h2 id="outbox-message-title">{message.subject || "(no subject)"}</h2>
      <dl className="flex flex-col gap-1.5">
        <Field label="From">{message.from ?? "—"}</Field>
        <Field label="To">{message.to.join(", ") || "—"}</Field>
        <Field label="Sent">
          <span className="figures">{formatDateTime(message.date)}</span>
          <span className="text-ink-muted"> · kept by the sink </span>
          <span className="figures text-ink-muted">{formatDateTime(message.storedAt)}</span>
        </Field>
        <Field label="Message-ID">
          <code className="text-xs break-all">{message.messageId ?? "—"}</code>
        </Field>
        <Field label="Size">
          <span className="figures">{formatBytes(message.size)}</span>
          <span className="text-ink-muted"> · </span>
          <code className="text-xs break-all text-ink-muted">{file}</code>
        </Field>
      </dl>

      <Subsection titleId="outbox-body-title" title="Text of the message" className="flex flex-col gap-1.5">
        {message.text ? (
          <pre className="max-h-96 overflow-auto border border-rule bg-paper-raised px-3 py-2 font-sans text-sm whitespace-pre-wrap">
            {message.text}
          </pre>
        ) : (
          <p className="text-sm text-ink-muted">The message has no plain-text part.</p>
        )}
      </Subsection>

      <Subsection titleId="outbox-attachments-title" title="Attachments" className="flex flex-col gap-1.5">
        {message.attachments.length === 0 ? (
          <p className="text-sm text-ink-muted">None.</p>
        ) : (
          <>
            <p className="text-xs text-ink-muted">
              The SHA-256 is computed from the bytes in the message. For a filing pack it is the one Filings shows for
              that filing: the file the supervisor received is the file Quartermark keeps.
            </p>
            <Table caption="Attachments of the message">
              <thead>
                <tr>
                  <Th>File</Th>
                  <Th>Type</Th>
                  <Th numeric>Size</Th>
                  <Th>SHA-256</Th>
                  <Th>
                    <span className="sr-only">Download</span>
                  </Th>
                </tr>
              </thead>
              <tbody>
                {message.attachments.map((a) => {
                  const name = a.filename ?? `Attachment ${a.index + 1}`;
                  return (
                    <Tr key={a.index}>
                      <Td className="figures font-medium">{name}</Td>
                      <Td className="text-xs">{a.contentType}</Td>
                      <Td numeric className="whitespace-nowrap">
                        {formatBytes(a.size)}
                      </Td>
                      <Td className="max-w-md">
                        <span data-testid={`attachment-sha256-${a.index}`}>
                          <FullHash value={a.sha256} />
                        </span>
                      </Td>
                      <Td className="whitespace-nowrap">
                        <a
                          href={outboxAttachmentHref(message.id, a.index)}
                          download={a.filename ?? undefined}
                          aria-label={`Download ${name}`}
                        >
                          Download
                        </a>
                      </Td>
                    </Tr>
                  );
                })}
              </tbody>
            </Table>
          </>
        )}
      </Subsection>
    </section>
  );
}
