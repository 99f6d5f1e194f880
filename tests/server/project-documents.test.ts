/**
 * The project's own documents stay true to the tree: every path the README's architecture and the
 * layout table of docs/architecture.md name exists, every folder of the code has a row in that
 * table, and nothing cites a document that is not in the repository (the brief the project was
 * written from is outside it; the code cites `docs/…`, see DEVELOPERS.md).
 */
import { execFileSync } from "node:child_process";
import { readFileSync } from "node:fs";
import path from "node:path";

const root = path.resolve(__dirname, "../..");
const tracked = execFileSync("git", ["ls-files"], { cwd: root, encoding: "utf8" }).split("\n").filter(Boolean);
const trackedDirs = new Set(
  tracked.flatMap((f) =>
    f
      .split("/")
      .slice(0, -1)
      .map((_, i, p) => p.slice(0, i + 1).join("/")),
  ),
);

function read(file: string): string {
  return readFileSync(path.join(root, file), "utf8");
}

function section(text: string, heading: string): string {
  const start = text.indexOf(`\n${heading}\n`);
  expect(start, `${heading} is missing`).toBeGreaterThanOrEqual(0);
  const next = text.indexOf("\n## ", start + heading.length + 2);
  return text.slice(start, next < 0 ? undefined : next);
}

/** Backticked names that look like paths (a slash or a source extension), minus globs and placeholders. */
function pathsIn(text: string): string[] {
  return [...text.matchAll(/`([^`\s]+)`/g)]
    .map((m) => m[1])
    .filter((t) => /\//.test(t) || /\.(ts|tsx|md|cjs)$/.test(t))
    .filter((t) => !t.startsWith("/api") && !t.includes("://"));
}

/** The fixed part of a path before any `*` or `<placeholder>`. */
function fixedPrefix(p: string): string {
  const cut = p.search(/[*<]/);
  return cut < 0 ? p : p.slice(0, cut);
}

/** A tracked file or folder whose path is, or ends with, the name given. */
function inTree(name: string): boolean {
  const bare = fixedPrefix(name).replace(/\/$/, "");
  if (bare === "") return true;
  return (
    tracked.some((f) => f === bare || f.endsWith(`/${bare}`)) ||
    [...trackedDirs].some((d) => d === bare || d.endsWith(`/${bare}`))
  );
}

describe("the README and docs/architecture.md describe the tree as it is", () => {
  it("names in the README's architecture exist", () => {
    const names = pathsIn(section(read("README.md"), "## Architecture in a few lines"));
    expect(names.length).toBeGreaterThan(10);
    expect(names.filter((n) => !inTree(n))).toEqual([]);
  });

  const table = section(read("docs/architecture.md"), "## Layout")
    .split("\n")
    .filter((l) => l.startsWith("| `"));
  const rows = table.flatMap((l) => pathsIn(l.split("|")[1]));

  it("every row of the layout table names a folder or file of the tree", () => {
    expect(rows.length).toBeGreaterThan(15);
    const missing = rows.filter((r) => {
      const fixed = fixedPrefix(r).replace(/\/$/, "");
      return !(tracked.includes(fixed) || trackedDirs.has(fixed));
    });
    expect(missing).toEqual([]);
  });

  it("every folder of the code has its row (or its parent's glob row)", () => {
    const folders = [...trackedDirs].filter((d) => /^(server|src|shared)\/[^/]+$/.test(d) || !d.includes("/"));
    const covered = (d: string) =>
      rows.some((r) => {
        const fixed = fixedPrefix(r);
        return `${d}/`.startsWith(fixed.endsWith("/") ? fixed : `${fixed}/`) || fixed.startsWith(`${d}/`);
      });
    const uncovered = folders.filter((d) => !d.startsWith(".") && !covered(d));
    expect(uncovered).toEqual([]);
  });
});

describe("nothing cites a document outside the repository", () => {
  // Built from parts so this file does not match itself.
  const briefFiles = ["DESIGN", "REFERENCE", "CONVENTIONS", "STACK", "RELIABILITY"].map((n) => `${n}.md`);
  const sectionCite = new RegExp(`DESIGN ${"§"}`);

  it("no tracked text file cites the brief's sections or files", () => {
    const text = tracked.filter((f) => /\.(ts|tsx|js|cjs|mjs|md|json|css|html)$/.test(f) && f !== "package-lock.json");
    const offending = text.flatMap((f) =>
      read(f)
        .split("\n")
        .map((line, i) => ({ f, i, line }))
        .filter(({ line }) => sectionCite.test(line) || briefFiles.some((b) => line.includes(b)))
        .map(({ f, i }) => `${f}:${i + 1}`),
    );
    expect(offending).toEqual([]);
  });
});
