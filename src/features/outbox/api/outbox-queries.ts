import { outboxListSchema, outboxMessageDetailSchema } from "@shared/schemas/outbox";
import { isApiError } from "@/lib/api-client";
import { getQuery } from "@/lib/queries";

const base = "/api/admin/outbox";

/** One attachment's bytes as the message carried them; a plain link downloads it with the session cookie. */
export const outboxAttachmentHref = (id: string, index: number) =>
  `${base}/${encodeURIComponent(id)}/attachments/${index}`;

/** The server says the outbox does not exist here (production, or no local mail sink). */
export const isOutboxUnavailable = (error: unknown) => isApiError(error) && error.code === "outbox_unavailable";

export const outboxKeys = {
  all: () => ["outbox"] as const,
  list: () => [...outboxKeys.all(), "list"] as const,
  message: (id: string) => [...outboxKeys.all(), "message", id] as const,
};

export const outboxQueries = {
  /** The newest messages the local mail sink holds, newest first. */
  list: () => getQuery(outboxKeys.list(), base, outboxListSchema, { staleTime: 5_000 }),
  /** A stored message never changes, so once read it stays read. */
  message: (id: string) =>
    getQuery(outboxKeys.message(id), `${base}/${encodeURIComponent(id)}`, outboxMessageDetailSchema, {
      staleTime: Infinity,
    }),
};
