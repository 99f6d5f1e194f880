import { mkdir, open, readFile } from "node:fs/promises";
import path from "node:path";
import { config } from "../config";

/**
 * The mailer's own record of each hand-over to the SMTP server, kept outside the database
 * (`config.mailJournal`, one JSON line each, flushed to disk before going on): "handing" before a
 * message goes out, then what the server said. When the database stops between the server's "250"
 * and the write that records it, reconciliation reads the answer here instead of sending again.
 */
export type JournalEvent = "handing" | "accepted" | "refused" | "failed" | "unclear";

export interface JournalEntry {
  at: string;
  messageId: string;
  recipient: string;
  attempt: number;
  event: JournalEvent;
  detail?: string | null;
}

export async function noteInJournal(entry: Omit<JournalEntry, "at">): Promise<void> {
  await mkdir(path.dirname(config.mailJournal), { recursive: true });
  const file = await open(config.mailJournal, "a", 0o600);
  try {
    await file.write(`${JSON.stringify({ at: new Date().toISOString(), ...entry })}\n`);
    await file.sync();
  } finally {
    await file.close();
  }
}

/** The last thing the journal says about one attempt to one recipient, or null when it never got that far. */
export async function lastJournalEntry(
  messageId: string,
  recipient: string,
  attempt: number,
): Promise<JournalEntry | null> {
  let text: string;
  try {
    text = await readFile(config.mailJournal, "utf8");
  } catch (err) {
    if ((err as NodeJS.ErrnoException).code === "ENOENT") return null;
    throw err;
  }
  let found: JournalEntry | null = null;
  for (const line of text.split("\n")) {
    if (!line.includes(messageId)) continue;
    try {
      const entry = JSON.parse(line) as JournalEntry;
      if (entry.messageId === messageId && entry.recipient === recipient && entry.attempt === attempt) found = entry;
    } catch {
      // a line cut short by a crash says nothing
    }
  }
  return found;
}
