/**
 * The demo data `npm start` seeds is figures in force like any other: every stored figure of every
 * Larkspur portfolio equals a fresh computation from the seeded data (a seeder that writes records
 * the figures depend on must refresh them in its transaction, as every write in the product does).
 */
import { spawnSync } from "node:child_process";
import path from "node:path";
import { describe, expect, it } from "vitest";

const root = path.resolve(import.meta.dirname, "..", "..");

describe("the seeded demo data", () => {
  it("when the demo is seeded into a fresh database, then every stored figure equals a fresh recompute", () => {
    const run = spawnSync(
      process.execPath,
      ["--import", "tsx", path.join(root, "tests", "server", "support", "demo-seed-check.ts")],
      {
        cwd: root,
        env: { ...process.env, DB_NAME: `${process.env.DB_NAME ?? "quartermark_test"}_demo`, LOG_LEVEL: "error" },
        encoding: "utf8",
        timeout: 240_000,
      },
    );
    const line = run.stdout.trim().split("\n").pop() ?? "";
    expect(run.status, `${run.stdout}\n${run.stderr}`).toBe(0);
    const result = JSON.parse(line) as { seeded: number; compared: number; differences: string[] };
    expect(result.seeded).toBeGreaterThan(5);
    expect(result.compared).toBeGreaterThan(20);
    expect(result.differences).toEqual([]);
  }, 300_000);
});
