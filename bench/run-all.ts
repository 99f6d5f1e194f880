/**
 * Runs every bench/*.bench.ts in turn (`npm run bench`), each in its own process under tsx so one
 * benchmark's heap and JIT state do not colour the next. Exits non-zero if any of them fails.
 */
import { spawnSync } from "node:child_process";
import { readdirSync } from "node:fs";
import { dirname, join, resolve } from "node:path";
import { fileURLToPath } from "node:url";

const here = dirname(fileURLToPath(import.meta.url));
const root = resolve(here, "..");
const tsx = join(root, "node_modules", ".bin", process.platform === "win32" ? "tsx.cmd" : "tsx");
const benches = readdirSync(here)
  .filter((f) => f.endsWith(".bench.ts"))
  .sort();

if (benches.length === 0) {
  console.log("No bench/*.bench.ts files found.");
  process.exit(0);
}

const failed: string[] = [];
for (const file of benches) {
  console.log(`\n▶ ${file}`);
  const started = Date.now();
  const run = spawnSync(tsx, [join(here, file)], { cwd: root, stdio: "inherit", env: process.env });
  const seconds = ((Date.now() - started) / 1000).toFixed(1);
  if (run.status !== 0) {
    failed.push(file);
    console.log(`✗ ${file} failed (exit ${run.status ?? run.signal}) after ${seconds} s`);
  } else {
    console.log(`✓ ${file} finished in ${seconds} s`);
  }
}

console.log(
  `\n${benches.length - failed.length} of ${benches.length} benchmarks finished${failed.length ? `; failed: ${failed.join(", ")}` : ""}.`,
);
process.exit(failed.length ? 1 : 0);
