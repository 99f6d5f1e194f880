/** A file's SHA-256 as lowercase hex, computed in the browser: nothing leaves the reader's machine. */
export async function sha256OfFile(file: Blob): Promise<string> {
  // A Uint8Array view rather than the bare ArrayBuffer: some runtimes refuse a buffer made in another realm.
  const digest = await globalThis.crypto.subtle.digest("SHA-256", new Uint8Array(await file.arrayBuffer()));
  return Array.from(new Uint8Array(digest), (b) => b.toString(16).padStart(2, "0")).join("");
}

/** Web Crypto only exists in a secure context (HTTPS, or the machine itself). */
export function canHashFiles(): boolean {
  return typeof globalThis.crypto?.subtle?.digest === "function";
}

export const sameSha256 = (a: string, b: string) => a.trim().toLowerCase() === b.trim().toLowerCase();
