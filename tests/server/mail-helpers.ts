import { readdirSync, readFileSync } from "node:fs";
import path from "node:path";
import { simpleParser } from "mailparser";

/** The run's mail sink (scripts/test.ts): every message the product sent, as .eml files. */
const sinkDir = () => process.env.MAIL_SINK_DIR!;

/** Every message the sink kept for `to`, oldest first, parsed (subject and plain text). */
export async function messagesTo(to: string): Promise<{ subject: string; text: string }[]> {
  const files = readdirSync(sinkDir())
    .filter((f) => f.endsWith(".eml"))
    .sort();
  const found: { subject: string; text: string }[] = [];
  for (const f of files) {
    const raw = readFileSync(path.join(sinkDir(), f));
    if (!raw.includes(to)) continue;
    const parsed = await simpleParser(raw);
    const recipients = [parsed.to].flat().flatMap((a) => a?.value.map((v) => v.address) ?? []);
    if (recipients.includes(to)) found.push({ subject: parsed.subject ?? "", text: parsed.text ?? "" });
  }
  return found;
}

/** The token of the newest set-password link sent to `to` (the part after `#`). */
export async function latestLinkTokenFor(to: string): Promise<string> {
  const messages = await messagesTo(to);
  const last = messages.at(-1);
  const token = last && /\/set-password#([A-Za-z0-9_-]{43})/.exec(last.text)?.[1];
  if (!token) throw new Error(`no set-password link sent to ${to} (${messages.length} messages)`);
  return token;
}
