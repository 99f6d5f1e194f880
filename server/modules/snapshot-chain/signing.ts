import { createHash, createHmac, timingSafeEqual } from "node:crypto";
import stableStringify from "fast-json-stable-stringify";
import { config } from "../../config";

/**
 * Signatures that someone with write access to the database cannot recompute: HMAC-SHA256 with
 * the chain key, which lives outside the database (CHAIN_KEY, or .data/chain-key generated once).
 * Each use names its purpose, so that a signature made for one kind of record never passes as
 * another's.
 */
export type Purpose = "snapshot-link" | "snapshot-head" | "audit-event" | "audit-link" | "audit-head";

/** Tells keys apart in the signed records without revealing anything about the key. */
export const KEY_ID = createHash("sha256")
  .update(`quartermark chain key id\n${config.chainKey}`)
  .digest("hex")
  .slice(0, 12);

/** The one canonical text of a value (keys sorted), the text every signature is over. */
export const canonical = (value: unknown): string => stableStringify(value);

export const sha256 = (text: string | Buffer): string => createHash("sha256").update(text).digest("hex");

export function sign(purpose: Purpose, text: string): string {
  return createHmac("sha256", config.chainKey).update(`${purpose}\n${text}`).digest("hex");
}

export function signatureMatches(purpose: Purpose, text: string, mac: string | null | undefined): boolean {
  if (!mac || !/^[0-9a-f]{64}$/.test(mac)) return false;
  return timingSafeEqual(Buffer.from(sign(purpose, text), "hex"), Buffer.from(mac, "hex"));
}
