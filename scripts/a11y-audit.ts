/**
 * `npm run a11y:audit`: against a running Quartermark with the demo data (`npm start`), signs in as
 * each demo role in headless Chromium, opens every screen that role may open, and prints the number
 * of elements breaking axe-core's WCAG 2.0/2.1 A and AA rules per screen, by rule; ends with one
 * JSON line. It measures; the browser journeys (tests/e2e) are what fail on a violation.
 *
 *   npm run a11y:audit -- [--base http://127.0.0.1:3000] [--details]
 */
import { chromium, type Page } from "playwright-core";
import { mkdtempSync, rmSync } from "node:fs";
import { tmpdir } from "node:os";
import path from "node:path";
import { axeViolations, countFailingNodes, describeViolations } from "../tests/e2e/axe";

const args = process.argv.slice(2);
const base = args.includes("--base")
  ? args[args.indexOf("--base") + 1]
  : `http://127.0.0.1:${process.env.PORT ?? 3000}`;
const details = args.includes("--details");
const password = process.env.DEMO_PASSWORD ?? "quartermark-demo";

/** Each screen's address, by the name the report gives it. */
const PATHS = {
  Overview: "/",
  Backtest: "/backtest",
  Data: "/data",
  "Quarter close": "/quarters",
  Capital: "/capital",
  Filings: "/filings",
  "API tokens": "/tokens",
  Users: "/admin/users",
  Entities: "/admin/entities",
  Entity: "/admin/entities/LKS-UK",
  "Regulator access": "/admin/assignments",
  "Audit log": "/admin/audit",
  Outbox: "/admin/outbox",
};
type ScreenName = keyof typeof PATHS;
const analystScreens: ScreenName[] = ["Overview", "Backtest", "Data", "Quarter close", "Capital", "Filings"];
/** The screens each demo role may open; each signs in as <role>@larkspur.test. */
const SCREENS: Record<string, ScreenName[]> = {
  analyst: analystScreens,
  cro: analystScreens,
  treasury: ["Overview", "Quarter close", "Capital", "API tokens"],
  regulator: ["Overview", "Filings"],
  admin: ["Overview", "Users", "Entities", "Entity", "Regulator access", "Audit log", "Outbox"],
};
const roles = Object.entries(SCREENS).map(([role, names]) => ({
  role,
  email: `${role}@larkspur.test`,
  screens: names.map((name) => ({ name, path: PATHS[name] })),
}));

/** Settled: no request in flight, no "Loading…" placeholder left, lazy charts drawn. */
async function settle(page: Page) {
  await page.waitForLoadState("networkidle");
  await page.waitForFunction(() => !/Loading|Opening Quartermark/.test(document.body.innerText), null, {
    timeout: 20_000,
  });
  await page.waitForTimeout(300);
}

async function main() {
  const userDataDir = mkdtempSync(path.join(tmpdir(), "qm-a11y-audit-"));
  const context = await chromium.launchPersistentContext(userDataDir, {
    executablePath: "/usr/bin/chromium",
    headless: true,
    viewport: { width: 1360, height: 900 },
    args: ["--no-sandbox", "--disable-gpu", "--no-first-run", "--disable-dev-shm-usage"],
  });
  const counts: Record<string, number> = {};
  const record = async (page: Page, label: string) => {
    const violations = await axeViolations(page);
    counts[label] = countFailingNodes(violations);
    const byRule = violations.map((v) => `${v.id} ${v.nodes.length}`).join(", ");
    console.log(`${label.padEnd(32)} ${String(counts[label]).padStart(4)}  ${byRule}`);
    if (details && violations.length) console.log(describeViolations(violations, label));
  };
  try {
    const page = await context.newPage();
    await page.goto(`${base}/sign-in`);
    await settle(page);
    await record(page, "signed out: Sign in");
    for (const r of roles) {
      await context.clearCookies();
      await page.goto(`${base}/sign-in`);
      await page.getByLabel(/e-mail/i).fill(r.email);
      await page.getByLabel(/password/i).fill(password);
      await page.getByRole("button", { name: /^sign in$/i }).click();
      await page.getByRole("heading", { name: /overview/i }).waitFor({ timeout: 20_000 });
      for (const s of r.screens) {
        await page.goto(`${base}${s.path}`);
        await settle(page);
        await record(page, `${r.role}: ${s.name}`);
      }
    }
  } finally {
    await context.close();
    rmSync(userDataDir, { recursive: true, force: true });
  }
  const total = Object.values(counts).reduce((a, b) => a + b, 0);
  console.log(JSON.stringify({ audit: "wcag21aa", base, total, counts }));
}

main().catch((err) => {
  console.error(err instanceof Error ? err.stack : String(err));
  process.exit(1);
});
