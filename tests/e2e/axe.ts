import { readFileSync } from "node:fs";
import { createRequire } from "node:module";
import type { Page } from "playwright-core";
import type { AxeResults, Result } from "axe-core";

/** The WCAG 2.0 and 2.1 success criteria at levels A and AA, as axe-core tags its rules. */
export const WCAG_21_AA_TAGS = ["wcag2a", "wcag2aa", "wcag21a", "wcag21aa"] as const;

// axe-core from the registry (devDependency), read once and evaluated in the page: through the
// DevTools protocol, so the app's Content-Security-Policy (script-src 'self') does not stop it.
const axeSource = readFileSync(createRequire(import.meta.url).resolve("axe-core/axe.min.js"), "utf8");

export type AxeViolation = Pick<Result, "id" | "impact" | "help" | "helpUrl"> & {
  nodes: { target: string; html: string; summary: string }[];
};

export type AxeCheckOptions = {
  /** CSS selectors of regions to leave out (use sparingly, and say why beside the call). */
  exclude?: string[];
};

/**
 * Runs axe-core's WCAG 2.0/2.1 A and AA rules on the page as it stands now (open dialogs, shown
 * errors and all) and returns the violations, each with its failing nodes.
 */
export async function axeViolations(page: Page, options: AxeCheckOptions = {}): Promise<AxeViolation[]> {
  const loaded = await page.evaluate(() => typeof (window as { axe?: unknown }).axe === "object");
  if (!loaded) await page.evaluate(axeSource);
  const results = (await page.evaluate(
    async ({ tags, exclude }) => {
      const axe = (window as unknown as { axe: typeof import("axe-core") }).axe;
      const context = exclude.length ? { include: [document], exclude: exclude.map((s) => [s]) } : document;
      return axe.run(context as never, {
        runOnly: { type: "tag", values: tags },
        resultTypes: ["violations"],
      });
    },
    { tags: [...WCAG_21_AA_TAGS], exclude: options.exclude ?? [] },
  )) as AxeResults;
  return results.violations.map((v) => ({
    id: v.id,
    impact: v.impact,
    help: v.help,
    helpUrl: v.helpUrl,
    nodes: v.nodes.map((n) => ({
      target: n.target.map(String).join(" "),
      html: n.html.length > 200 ? `${n.html.slice(0, 200)}…` : n.html,
      summary: (n.failureSummary ?? "").replace(/\s+/g, " ").trim(),
    })),
  }));
}

/** The number of failing elements (a node failing two rules counts twice), as a per-screen figure. */
export function countFailingNodes(violations: AxeViolation[]): number {
  return violations.reduce((n, v) => n + v.nodes.length, 0);
}

/** One readable block per violation: rule id, impact, help text and link, then each node with why it fails. */
export function describeViolations(violations: AxeViolation[], where: string): string {
  const lines = [`${where}: ${countFailingNodes(violations)} element(s) break WCAG 2.1 A/AA rules`];
  for (const v of violations) {
    lines.push(`- ${v.id} (${v.impact ?? "no impact given"}): ${v.help} — ${v.helpUrl}`);
    for (const n of v.nodes) lines.push(`    ${n.target}  ${n.html}\n      ${n.summary}`);
  }
  return lines.join("\n");
}

/**
 * Fails (throws) when the page as it stands breaks any WCAG 2.0/2.1 A or AA rule axe-core checks;
 * the message names each rule, its help text and every failing node. Call it in a journey after
 * the screen (or dialog, or error) has finished drawing: `await expectAccessible(page, "Data, upload refused")`.
 */
export async function expectAccessible(page: Page, where: string, options: AxeCheckOptions = {}): Promise<void> {
  const violations = await axeViolations(page, options);
  if (violations.length > 0) throw new Error(describeViolations(violations, where));
}
