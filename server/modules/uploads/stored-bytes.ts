import { promisify } from "node:util";
import { gunzipSync, gzip, gzipSync } from "node:zlib";
import type { Transaction } from "sequelize";
import { connectionOf } from "../../db/raw-connection";

/**
 * Uploaded files and checked rows are kept gzip-compressed (a daily CSV shrinks about fivefold),
 * which makes the preview's single INSERT several times smaller. Level 1: fast, still small.
 */
export const PACK_LEVEL = 1;

export function packBytes(bytes: Buffer | string): Buffer {
  return gzipSync(bytes, { level: PACK_LEVEL });
}

export function unpackBytes(stored: Buffer): Buffer {
  return gunzipSync(stored);
}

const gzipAsync = promisify(gzip);

/**
 * The same, on libuv's worker threads, so that the caller's thread can go on (the preview parses
 * meanwhile). One output chunk for the whole file: with zlib's default 16 kB chunks every chunk
 * waits for the busy main thread, and the work would not really run alongside.
 */
export function packBytesInBackground(bytes: Buffer): Promise<Buffer> {
  return gzipAsync(bytes, { level: PACK_LEVEL, chunkSize: Math.max(64 * 1024, bytes.length + 1024) });
}

/**
 * Writes an upload's packed file into its row. It goes over the binary protocol: through
 * Sequelize the text protocol escapes the file byte by byte in JavaScript, about three times
 * slower for a 100,000-row file (bench/ingest.bench.ts).
 */
export async function storePackedFile(uploadId: number, packed: Buffer, transaction: Transaction): Promise<void> {
  await connectionOf(transaction).execute("UPDATE uploads SET content = ? WHERE id = ?", [packed, uploadId]);
}
