import { gunzipSync, gzipSync } from "node:zlib";

/**
 * Uploaded files and checked rows are kept gzip-compressed (a daily CSV shrinks about fivefold),
 * which makes the preview's single INSERT several times smaller. Level 1: fast, still small.
 */
export function packBytes(bytes: Buffer | string): Buffer {
  return gzipSync(bytes, { level: 1 });
}

export function unpackBytes(stored: Buffer): Buffer {
  return gunzipSync(stored);
}
