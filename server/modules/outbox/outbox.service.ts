import { constants, type Dirent } from "node:fs";
import { lstat, open, readdir } from "node:fs/promises";
import { createHash } from "node:crypto";
import path from "node:path";
import { simpleParser, type AddressObject, type ParsedMail } from "mailparser";
import { config } from "../../config";
import { AppError, NotFoundError } from "../../errors";
import {
  OUTBOX_ID_PATTERN,
  type OutboxAttachment,
  type OutboxList,
  type OutboxMessage,
  type OutboxMessageDetail,
} from "../../../shared/schemas/outbox";

/** The newest messages a list shows; the folder may hold more (`total`). */
export const OUTBOX_LIST_LIMIT = 200;
/** A file larger than this is listed as unreadable rather than parsed (a pack is well under 1 MB). */
const MAX_MESSAGE_BYTES = 25 * 1024 * 1024;
const EML = ".eml";

/** The outbox reads the local sink's folder, which exists only in development and tests. */
export class OutboxUnavailableError extends AppError {
  constructor(reason: string) {
    super(404, "outbox_unavailable", `The mail outbox exists only in development; ${reason}`);
  }
}

/** The sink's folder, or the reason there is none to show: never in production, never unconfigured. */
function assertOutboxAvailable(): string {
  if (config.isProduction)
    throw new OutboxUnavailableError(
      "this server runs with NODE_ENV=production, where e-mail goes to the real mail server.",
    );
  if (!config.mailSinkDir)
    throw new OutboxUnavailableError("no local mail sink folder is configured (MAIL_SINK_DIR is empty).");
  return config.mailSinkDir;
}

interface StoredFile {
  id: string;
  size: number;
  storedAt: Date;
  bytes: Buffer | null;
  problem: string | null;
}

/**
 * Reads one message file of the folder, by an id that passed the pattern. The path must resolve to
 * a file directly inside the folder, and the file is opened without following a symbolic link:
 * nothing outside the sink is ever read. Anything else is "no such message".
 */
async function readStoredFile(folder: string, id: string): Promise<StoredFile> {
  if (!OUTBOX_ID_PATTERN.test(id)) throw new NotFoundError("There is no message with this id in the outbox.");
  const file = path.resolve(folder, `${id}${EML}`);
  if (path.dirname(file) !== path.resolve(folder))
    throw new NotFoundError("There is no message with this id in the outbox.");
  const handle = await open(file, constants.O_RDONLY | constants.O_NOFOLLOW).catch(() => null);
  if (!handle) throw new NotFoundError(`There is no message ${id} in the outbox.`);
  try {
    const stat = await handle.stat();
    if (!stat.isFile()) throw new NotFoundError(`There is no message ${id} in the outbox.`);
    const base = { id, size: stat.size, storedAt: stat.mtime };
    if (stat.size > MAX_MESSAGE_BYTES)
      return {
        ...base,
        bytes: null,
        problem: `The file is larger than ${MAX_MESSAGE_BYTES / 1024 / 1024} MB; open it by hand.`,
      };
    return { ...base, bytes: await handle.readFile(), problem: null };
  } finally {
    await handle.close();
  }
}

const mailboxes = (field: AddressObject | AddressObject[] | undefined) =>
  (Array.isArray(field) ? field : field ? [field] : [])
    .flatMap((a) => a.value)
    .flatMap((v) => (v.group ? v.group : [v]));

/** Each address of a header as a person writes it: `Name <address>`, or the address alone. */
const addressLines = (field: AddressObject | AddressObject[] | undefined): string[] =>
  mailboxes(field)
    .map((v) => (v.name && v.address ? `${v.name} <${v.address}>` : (v.address ?? v.name)))
    .filter((a) => a.length > 0);

/** The bare addresses of a header (the recipients). */
const addresses = (field: AddressObject | AddressObject[] | undefined): string[] =>
  mailboxes(field)
    .map((v) => v.address ?? v.name)
    .filter((a) => a.length > 0);

const sha256 = (bytes: Buffer) => createHash("sha256").update(bytes).digest("hex");

function attachmentsOf(mail: ParsedMail): OutboxAttachment[] {
  return mail.attachments.map((a, index) => ({
    index,
    filename: a.filename ?? null,
    contentType: a.contentType,
    size: a.content.length,
    sha256: sha256(a.content),
  }));
}

type Parsed = { ok: true; mail: ParsedMail } | { ok: false; problem: string };

/** Parses a stored file as a message; a file the sink would not have written (no From or To) is unreadable. */
async function parseMessage(file: StoredFile): Promise<Parsed> {
  if (!file.bytes) return { ok: false, problem: file.problem ?? "The file could not be read." };
  if (file.bytes.length === 0) return { ok: false, problem: "The file is empty." };
  try {
    const mail = await simpleParser(file.bytes, { skipImageLinks: true, skipTextToHtml: true });
    const keys = new Set(mail.headerLines.map((h) => h.key));
    if (!keys.has("from") && !keys.has("to"))
      return { ok: false, problem: "The file has no From or To header: it is not an e-mail message." };
    return { ok: true, mail };
  } catch (err) {
    return { ok: false, problem: `The message could not be parsed (${(err as Error).message.slice(0, 160)}).` };
  }
}

function summaryOf(file: StoredFile, parsed: Parsed): OutboxMessage {
  const base = { id: file.id, size: file.size, storedAt: file.storedAt.toISOString() };
  if (!parsed.ok) return { ...base, readable: false, problem: parsed.problem };
  const { mail } = parsed;
  return {
    ...base,
    readable: true,
    from: addressLines(mail.from)[0] ?? null,
    to: addresses(mail.to),
    subject: mail.subject ?? null,
    date: mail.date && !Number.isNaN(mail.date.getTime()) ? mail.date.toISOString() : null,
    messageId: mail.messageId ?? null,
    attachments: attachmentsOf(mail),
  };
}

/** The folder's message files (regular .eml files whose names fit the pattern), newest first. */
async function messageFiles(folder: string): Promise<{ id: string; storedAt: Date }[]> {
  let entries: Dirent[];
  try {
    entries = await readdir(folder, { withFileTypes: true });
  } catch (err) {
    // No folder yet: the sink makes it when it starts, or with its first message.
    if ((err as NodeJS.ErrnoException).code === "ENOENT") return [];
    throw err;
  }
  const ids = entries
    .filter((e) => e.isFile() && e.name.endsWith(EML))
    .map((e) => e.name.slice(0, -EML.length))
    .filter((id) => OUTBOX_ID_PATTERN.test(id));
  const files: { id: string; storedAt: Date }[] = [];
  for (const id of ids) {
    // A file removed between the listing and this look is simply gone.
    const stat = await lstat(path.join(folder, `${id}${EML}`)).catch(() => null);
    if (stat?.isFile()) files.push({ id, storedAt: stat.mtime });
  }
  // The sink names each file after the moment it arrived, so the name breaks a tie of file times.
  return files.sort((a, b) => b.storedAt.getTime() - a.storedAt.getTime() || b.id.localeCompare(a.id));
}

/** What the local sink holds, newest first: each message's envelope and its attachments' SHA-256. */
export async function listOutbox(): Promise<OutboxList> {
  const folder = assertOutboxAvailable();
  const files = await messageFiles(folder);
  const messages: OutboxMessage[] = [];
  for (const { id } of files.slice(0, OUTBOX_LIST_LIMIT)) {
    const file = await readStoredFile(folder, id).catch((err) =>
      err instanceof NotFoundError ? null : Promise.reject(err),
    );
    if (file) messages.push(summaryOf(file, await parseMessage(file)));
  }
  return { folder, total: files.length, messages };
}

/** One message with its plain-text body. */
export async function readOutboxMessage(id: string): Promise<OutboxMessageDetail> {
  const file = await readStoredFile(assertOutboxAvailable(), id);
  const parsed = await parseMessage(file);
  const message = summaryOf(file, parsed);
  if (!message.readable) return message;
  return { ...message, text: parsed.ok ? (parsed.mail.text ?? null) : null };
}

/** The bytes of one attachment, exactly as the message carried them, with its type and hash. */
export async function readOutboxAttachment(
  id: string,
  index: number,
): Promise<{ filename: string; contentType: string; sha256: string; bytes: Buffer }> {
  const file = await readStoredFile(assertOutboxAvailable(), id);
  const parsed = await parseMessage(file);
  if (!parsed.ok)
    throw new NotFoundError(`Message ${id} cannot be read, so neither can its attachments: ${parsed.problem}`);
  const attachment = parsed.mail.attachments[index];
  if (!attachment)
    throw new NotFoundError(
      `Message ${id} has no attachment number ${index} (it has ${parsed.mail.attachments.length}).`,
    );
  return {
    filename: safeFileName(attachment.filename, `attachment-${index}`),
    // A type that is not a plain type/subtype is served as bytes and nothing more.
    contentType: /^[\w.+-]+\/[\w.+-]+$/.test(attachment.contentType)
      ? attachment.contentType
      : "application/octet-stream",
    sha256: sha256(attachment.content),
    bytes: attachment.content,
  };
}

/** A download name without folders or control characters. */
function safeFileName(name: string | undefined, fallback: string): string {
  const folderless = path.basename((name ?? "").replace(/\\/g, "/"));
  // eslint-disable-next-line no-control-regex -- control characters are exactly what is removed
  const base = folderless.replace(/[\u0000-\u001f\u007f"]/g, "").trim();
  return base && base !== "." && base !== ".." ? base.slice(0, 200) : fallback;
}
