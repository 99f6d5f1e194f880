import { chromium, type BrowserContext, type Page } from "playwright-core";
import { mkdtempSync, mkdirSync, rmSync } from "node:fs";
import { tmpdir } from "node:os";
import path from "node:path";
import type { AddressInfo } from "node:net";
import type { Server } from "node:http";
import { afterAll, beforeAll } from "vitest";
import { createApp } from "../../server/app";
import { sequelize } from "../../server/db/sequelize";
import { TEST_PASSWORD } from "../server/helpers";

export const screenshotDir = path.resolve(import.meta.dirname, "..", "..", "test-results", "screenshots");

/**
 * Debian's Chromium, headless, through a persistent context in a fresh dir (playwright refuses
 * --user-data-dir in args).
 */
export async function launchBrowser(): Promise<{ context: BrowserContext; close: () => Promise<void> }> {
  const userDataDir = mkdtempSync(path.join(tmpdir(), "qm-chromium-"));
  const context = await chromium.launchPersistentContext(userDataDir, {
    executablePath: "/usr/bin/chromium",
    headless: true,
    viewport: { width: 1360, height: 900 },
    args: [
      "--no-sandbox",
      "--disable-gpu",
      "--disable-quic",
      "--no-first-run",
      "--disable-background-networking",
      "--disable-component-update",
      "--disable-sync",
      "--disable-dev-shm-usage",
    ],
  });
  return {
    context,
    close: async () => {
      await context.close();
      rmSync(userDataDir, { recursive: true, force: true });
    },
  };
}

/** The real app (API + built client) on an ephemeral loopback port. */
export async function startAppServer(): Promise<{ baseUrl: string; close: () => Promise<void> }> {
  const server: Server = createApp({ serveClient: true }).listen(0, "127.0.0.1");
  await new Promise<void>((resolve) => server.once("listening", () => resolve()));
  const { port } = server.address() as AddressInfo;
  return { baseUrl: `http://127.0.0.1:${port}`, close: () => new Promise<void>((r) => server.close(() => r())) };
}

/** Signs in through the sign-in screen and waits for the Overview. */
export async function signInAs(page: Page, baseUrl: string, email: string, password = TEST_PASSWORD): Promise<void> {
  await page.goto(`${baseUrl}/sign-in`);
  await page.getByLabel(/e-mail/i).fill(email);
  await page.getByLabel(/password/i).fill(password);
  await page.getByRole("button", { name: /^sign in$/i }).click();
  await page.getByRole("heading", { name: /overview/i }).waitFor({ timeout: 15_000 });
}

/** Collects console errors and failed page scripts into `errors`, so a journey can assert there were none. */
export function watchConsole(page: Page, errors: string[] = []): string[] {
  page.on("console", (msg) => {
    if (msg.type() === "error") errors.push(msg.text());
  });
  page.on("pageerror", (err) => errors.push(err.message));
  return errors;
}

export async function keepScreenshot(page: Page, name: string): Promise<string> {
  mkdirSync(screenshotDir, { recursive: true });
  const file = path.join(screenshotDir, `${name}.png`);
  await page.screenshot({ path: file, fullPage: true });
  return file;
}

/**
 * The app and a browser for one test file: started before its tests, closed after them (with
 * the database pool). `before` runs first, e.g. to load the rows the journeys need.
 */
export function browserSuite(before?: () => Promise<void>) {
  const suite = {} as { app: Awaited<ReturnType<typeof startAppServer>>; context: BrowserContext };
  let browser: Awaited<ReturnType<typeof launchBrowser>> | undefined;
  beforeAll(async () => {
    await before?.();
    suite.app = await startAppServer();
    browser = await launchBrowser();
    suite.context = browser.context;
  });
  afterAll(async () => {
    await browser?.close();
    await suite.app?.close();
    await sequelize.close();
  });
  return suite;
}

/**
 * A new page of the suite's browser, its console watched (into `errors`, a fresh list unless given), signed in as
 * `email` and, with `path`, at that address of the app.
 */
export async function pageSignedInAs(
  suite: ReturnType<typeof browserSuite>,
  email: string,
  path?: string,
  errors: string[] = [],
) {
  const page = await suite.context.newPage();
  watchConsole(page, errors);
  await signInAs(page, suite.app.baseUrl, email);
  if (path) await page.goto(`${suite.app.baseUrl}${path}`);
  return { page, errors };
}
