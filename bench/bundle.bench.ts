/**
 * Bundle benchmark (`npm run bench:bundle`): builds the client with vite, then weighs what the
 * sign-in page loads before any lazy route — the entry script, every modulepreload and every
 * stylesheet index.html references — gzipped at level 9. Prints a readable breakdown, then one
 * JSON line as the last line. Target (issue 5): sign-in JS ≤ 250 kB gzipped. Never an assertion.
 */
import { execFileSync } from "node:child_process";
import { readFileSync, statSync } from "node:fs";
import { join, resolve } from "node:path";
import { gzipSync } from "node:zlib";

const TARGET_KB = 250;
const root = resolve(import.meta.dirname, "..");
const outDir = join(root, "dist", "client");

execFileSync(join(root, "node_modules", ".bin", "vite"), ["build", "--logLevel", "warn"], {
  cwd: root,
  stdio: "inherit",
});

const html = readFileSync(join(outDir, "index.html"), "utf8");
const attr = (tag: string, name: string) => new RegExp(`\\b${name}\\s*=\\s*["']([^"']+)["']`, "i").exec(tag)?.[1];

type Asset = { kind: "entry" | "preload" | "css"; href: string };
const assets: Asset[] = [];
for (const tag of html.match(/<script\b[^>]*>/gi) ?? []) {
  const src = attr(tag, "src");
  if (src && /type\s*=\s*["']module["']/i.test(tag)) assets.push({ kind: "entry", href: src });
}
for (const tag of html.match(/<link\b[^>]*>/gi) ?? []) {
  const rel = attr(tag, "rel")?.toLowerCase();
  const href = attr(tag, "href");
  if (!href) continue;
  if (rel === "modulepreload") assets.push({ kind: "preload", href });
  else if (rel === "stylesheet") assets.push({ kind: "css", href });
}

const kb = (bytes: number) => Math.round((bytes / 1024) * 10) / 10;
let jsGzip = 0;
let cssGzip = 0;
const rows = assets.map((a) => {
  const file = join(outDir, a.href.replace(/^\//, "").split("?")[0]);
  const raw = readFileSync(file);
  const gz = gzipSync(raw, { level: 9 }).length;
  if (a.kind === "css") cssGzip += gz;
  else jsGzip += gz;
  return { ...a, raw: statSync(file).size, gz };
});

console.log("What the sign-in page loads before any lazy route (dist/client/index.html):");
for (const r of rows) {
  console.log(
    `  ${r.kind.padEnd(8)} ${r.href.padEnd(48)} ${String(kb(r.raw)).padStart(8)} kB raw ${String(kb(r.gz)).padStart(8)} kB gzip`,
  );
}
console.log(`  JavaScript ${kb(jsGzip)} kB gzip (target ≤ ${TARGET_KB} kB) · CSS ${kb(cssGzip)} kB gzip`);
console.log(
  JSON.stringify({
    bench: "bundle",
    signInJsGzipKb: kb(jsGzip),
    signInCssGzipKb: kb(cssGzip),
    targetKb: TARGET_KB,
    withinTarget: kb(jsGzip) <= TARGET_KB,
  }),
);
