import { execFileSync } from "node:child_process";
import { mkdirSync, mkdtempSync, readdirSync, rmSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import path from "node:path";
import request from "supertest";
import { expect } from "vitest";
import type { createApp } from "../../server/app";

/** What the tests that read PDFs back share: the bytes of a download, and their text through poppler. */

/** Where the pages of the packs the tests read are kept as PNGs, to be looked at. */
const PAGES_DIR = path.resolve(import.meta.dirname, "..", "..", "test-results", "pack-pages");

/** A response body kept as raw bytes (a PDF, an attachment) rather than parsed. */
export function asBytes(call: request.Test) {
  return call.buffer(true).parse((r, done) => {
    const chunks: Buffer[] = [];
    r.on("data", (c: Buffer) => chunks.push(c));
    r.on("end", () => done(null, Buffer.concat(chunks)));
  });
}

/** A file the office downloads, as bytes; the download must answer 200. */
export async function download(app: ReturnType<typeof createApp>, url: string, cookie: string): Promise<Buffer> {
  const res = await asBytes(request(app).get(url).set("Cookie", cookie));
  expect(res.status).toBe(200);
  return res.body as Buffer;
}

/** The bytes written to a fresh temporary file, for poppler's tools. */
export function pdfFile(bytes: Buffer): string {
  const file = path.join(mkdtempSync(path.join(tmpdir(), "qm-pack-")), "pack.pdf");
  writeFileSync(file, bytes);
  return file;
}

/** The text of a whole PDF file, read back with poppler's pdftotext. */
export const fileText = (file: string) => execFileSync("pdftotext", ["-layout", file, "-"]).toString("utf8");

/** The text of a whole PDF, read back with poppler's pdftotext. */
export const pdfText = (bytes: Buffer) => fileText(pdfFile(bytes));

const pageCount = (file: string) => Number(/Pages:\s+(\d+)/.exec(execFileSync("pdfinfo", [file]).toString())![1]);

/** The text of each page, read back with poppler's pdftotext. */
export function pagesText(bytes: Buffer): string[] {
  const file = pdfFile(bytes);
  return Array.from({ length: pageCount(file) }, (_, i) =>
    execFileSync("pdftotext", ["-layout", "-f", String(i + 1), "-l", String(i + 1), file, "-"]).toString("utf8"),
  );
}

/** Every page as a PNG under test-results/pack-pages/<name>-N.png; returns how many were written. */
export function keepPages(bytes: Buffer, name: string): number {
  mkdirSync(PAGES_DIR, { recursive: true });
  for (const f of readdirSync(PAGES_DIR)) if (f.startsWith(`${name}-`)) rmSync(path.join(PAGES_DIR, f));
  execFileSync("pdftoppm", ["-png", "-r", "80", pdfFile(bytes), path.join(PAGES_DIR, name)]);
  return readdirSync(PAGES_DIR).filter((f) => f.startsWith(`${name}-`) && f.endsWith(".png")).length;
}

/** Text with every run of white space folded to one space (pdftotext -layout spaces columns out). */
export const flat = (s: string) => s.replace(/\s+/g, " ");
