import { z } from "zod";

/**
 * A message's id is its file name in the local mail sink without ".eml": letters, digits, hyphens
 * and underscores only, so no id can name a path (no dots, no slashes, nothing encoded).
 */
export const OUTBOX_ID_PATTERN = /^[A-Za-z0-9][A-Za-z0-9_-]{0,127}$/;

export const outboxIdParamSchema = z.object({
  id: z.string().regex(OUTBOX_ID_PATTERN, "Not a message id of the outbox"),
});

export const outboxAttachmentParamSchema = outboxIdParamSchema.extend({
  index: z
    .string()
    .regex(/^\d{1,3}$/, "An attachment's index is a whole number")
    .transform(Number),
});

export const outboxAttachmentSchema = z.object({
  /** Position among the message's attachments, from 0: the address of its download. */
  index: z.number().int().min(0),
  filename: z.string().nullable(),
  contentType: z.string(),
  size: z.number().int().min(0),
  sha256: z.string().regex(/^[0-9a-f]{64}$/),
});
export type OutboxAttachment = z.infer<typeof outboxAttachmentSchema>;

const storedFileSchema = z.object({
  id: z.string(),
  /** Bytes of the .eml file. */
  size: z.number().int().min(0),
  /** When the sink wrote the file (ISO). */
  storedAt: z.string(),
});

export const readableOutboxMessageSchema = storedFileSchema.extend({
  readable: z.literal(true),
  from: z.string().nullable(),
  to: z.array(z.string()),
  subject: z.string().nullable(),
  /** The message's own Date header (ISO), when it has one. */
  date: z.string().nullable(),
  messageId: z.string().nullable(),
  attachments: z.array(outboxAttachmentSchema),
});

/** A file in the sink that is not a message we can read; listed so that it is seen, not hidden. */
export const unreadableOutboxMessageSchema = storedFileSchema.extend({
  readable: z.literal(false),
  problem: z.string(),
});

export const outboxMessageSchema = z.discriminatedUnion("readable", [
  readableOutboxMessageSchema,
  unreadableOutboxMessageSchema,
]);
export type OutboxMessage = z.infer<typeof outboxMessageSchema>;
export type ReadableOutboxMessage = z.infer<typeof readableOutboxMessageSchema>;

export const outboxListSchema = z.object({
  /** The sink's folder on the server, for the developer who wants to open the files themselves. */
  folder: z.string(),
  /** Messages in the folder; `messages` holds the newest of them, newest first. */
  total: z.number().int().min(0),
  messages: z.array(outboxMessageSchema),
});
export type OutboxList = z.infer<typeof outboxListSchema>;

export const outboxMessageDetailSchema = z.discriminatedUnion("readable", [
  readableOutboxMessageSchema.extend({ text: z.string().nullable() }),
  unreadableOutboxMessageSchema,
]);
export type OutboxMessageDetail = z.infer<typeof outboxMessageDetailSchema>;
