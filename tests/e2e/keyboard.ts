import { expect } from "vitest";
import type { Page } from "playwright-core";

/** What has the focus, and whether a sighted keyboard user can see where it is. */
export type FocusState = {
  onBody: boolean;
  /** The element's accessible name as the journey matches it: aria-label, its label, or its text. */
  name: string;
  tag: string;
  role: string | null;
  /** An outline or a ring is drawn around it. */
  indicator: boolean;
  /** It has a size, is not hidden, and lies inside the viewport. */
  visible: boolean;
};

export async function focusState(page: Page): Promise<FocusState> {
  return page.evaluate(() => {
    const el = document.activeElement as HTMLElement | null;
    if (!el || el === document.body || el === document.documentElement)
      return { onBody: true, name: "", tag: "body", role: null, indicator: false, visible: false };
    const cs = getComputedStyle(el);
    const r = el.getBoundingClientRect();
    const labels = (el as HTMLInputElement).labels;
    const name = (
      el.getAttribute("aria-label") ??
      (labels && labels.length ? labels[0].textContent : null) ??
      el.textContent ??
      ""
    )
      .replace(/\s+/g, " ")
      .trim();
    const outline = cs.outlineStyle !== "none" && parseFloat(cs.outlineWidth) >= 1;
    const ring = cs.boxShadow !== "none" && cs.boxShadow !== "";
    return {
      onBody: false,
      name,
      tag: el.tagName.toLowerCase(),
      role: el.getAttribute("role"),
      indicator: outline || ring,
      visible: r.width > 0 && r.height > 0 && el.checkVisibility() && r.bottom > 0 && r.top < window.innerHeight,
    };
  });
}

/** The focus is on an element (never lost to <body>), which shows a focus indicator and is on screen. */
export async function expectVisibleFocus(page: Page, step: string): Promise<FocusState> {
  let f = await focusState(page);
  // An outcome takes the focus when React has drawn it; on a busy machine that is a moment after the
  // control it replaces went away. Lost for good is what fails: still on <body> after two seconds.
  for (let waited = 0; f.onBody && waited < 2_000; waited += 100) {
    await page.waitForTimeout(100);
    f = await focusState(page);
  }
  expect(f.onBody, `${step}: the focus fell back to <body>`).toBe(false);
  expect(f.visible, `${step}: the focused ${f.tag} "${f.name}" is not on screen`).toBe(true);
  expect(f.indicator, `${step}: the focused ${f.tag} "${f.name}" shows no focus indicator`).toBe(true);
  return f;
}

/**
 * Presses Tab (or Shift+Tab) until the focused element's name matches, checking at every stop that
 * the focus is visible; fails after `max` presses.
 */
export async function tabTo(page: Page, name: RegExp, { backwards = false, max = 150 } = {}): Promise<FocusState> {
  const seen: string[] = [];
  for (let i = 0; i < max; i++) {
    await page.keyboard.press(backwards ? "Shift+Tab" : "Tab");
    const f = await expectVisibleFocus(page, `Tab stop ${i + 1} towards ${name}`);
    if (name.test(f.name)) return f;
    seen.push(`${f.tag}:${f.name.slice(0, 40)}`);
  }
  throw new Error(`${name} not reached with ${max} presses of Tab; the stops were: ${seen.join(" | ")}`);
}
