import { execFileSync } from "node:child_process";
import { mkdirSync, writeFileSync } from "node:fs";
import path from "node:path";
import { describe, expect, it } from "vitest";
import type { Page } from "playwright-core";
import { signOffBook, type Book } from "../server/snapshot-helpers";
import { browserSuite, screenshotDir, signInAs, watchConsole } from "./browser";

let book: Book;
const suite = browserSuite(async () => {
  book = await signOffBook();
});

/** The page printed by Chromium as its print stylesheet asks (A4 landscape), each page kept as a PNG. */
async function printed(page: Page, name: string) {
  await page.emulateMedia({ media: "print" });
  // The charts measure their box again for the page's width and redraw, as they do in a print preview.
  await page.waitForTimeout(1500);
  const pdf = await page.pdf({ preferCSSPageSize: true, printBackground: true });
  mkdirSync(screenshotDir, { recursive: true });
  const file = path.join(screenshotDir, `${name}.pdf`);
  writeFileSync(file, pdf);
  execFileSync("pdftoppm", ["-png", "-r", "50", file, path.join(screenshotDir, name)]);
  const info = execFileSync("pdfinfo", ["-f", "1", "-l", "99", file]).toString();
  const sizes = [...info.matchAll(/Page\s+\d+ size:\s+([\d.]+) x ([\d.]+) pts/g)].map((m) => [
    Number(m[1]),
    Number(m[2]),
  ]);
  const text = execFileSync("pdftotext", ["-layout", file, "-"]).toString("utf8");
  return { sizes, text };
}

/** A4 landscape in points: 297 × 210 mm (ISO 216). */
const A4_LANDSCAPE = [841.89, 595.28];

describe("Backtest and Capital print on A4 landscape", () => {
  it("when the analyst prints the Backtest and the Capital screens, then every page is A4 landscape with the figures, the charts' captions and the caution, and no navigation or buttons", async () => {
    const page = await suite.context.newPage();
    const errors = watchConsole(page);
    await page.setViewportSize({ width: 1360, height: 900 });
    await signInAs(page, suite.app.baseUrl, book.analyst.email);

    await page.goto(`${suite.app.baseUrl}/backtest/${book.portfolio.code}`);
    await page.getByRole("figure", { name: /Counted exceptions in the trailing window/ }).waitFor({ timeout: 30_000 });
    await page.waitForLoadState("networkidle");
    const backtest = await printed(page, "print-backtest");
    expect(backtest.sizes.length).toBeGreaterThan(0);
    for (const [w, h] of backtest.sizes) {
      expect(w).toBeCloseTo(A4_LANDSCAPE[0], 0);
      expect(h).toBeCloseTo(A4_LANDSCAPE[1], 0);
    }
    expect(backtest.text).toMatch(/Multiplier in force/i);
    expect(backtest.text).toMatch(/Counted exceptions in the trailing window/);
    expect(backtest.text).toMatch(/What next: exceptions and their reviews/);
    expect(backtest.text).toMatch(/Figures are decision support/);
    expect(backtest.text).not.toMatch(/Sign out|Quarter close|Download the exceptions/);

    await page.emulateMedia({ media: "screen" });
    await page.goto(`${suite.app.baseUrl}/capital?entity=${book.entity.code}`);
    await page.getByRole("heading", { level: 1 }).first().waitFor({ timeout: 20_000 });
    await page.waitForLoadState("networkidle");
    await page.waitForFunction(() => !/Loading…|Drawing the chart…/.test(document.body.innerText));
    const capital = await printed(page, "print-capital");
    for (const [w, h] of capital.sizes) {
      expect(w).toBeCloseTo(A4_LANDSCAPE[0], 0);
      expect(h).toBeCloseTo(A4_LANDSCAPE[1], 0);
    }
    expect(capital.text).toMatch(/Figures are decision support/);
    expect(capital.text).not.toMatch(/Sign out/);
    expect(errors).toEqual([]);
    await page.close();
  }, 180_000);
});
