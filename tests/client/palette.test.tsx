import axe from "axe-core";
import { palette, chartColours } from "@/styles/palette";

// The contrast ratio as axe-core computes it in the browser journeys (WCAG 2.1, "contrast ratio"
// and "relative luminance" definitions): one formula for this table and for the pages.
// axe-core ships commons.color at run time but leaves it out of its type definitions.
type AxeColour = { parseString(css: string): void };
const { Color, getContrast } = (
  axe.commons as unknown as {
    color: { Color: new () => AxeColour; getContrast(bg: AxeColour, fg: AxeColour): number };
  }
).color;

function contrast(fg: string, bg: string): number {
  const parse = (hex: string) => {
    const c = new Color();
    c.parseString(hex);
    return c;
  };
  return getContrast(parse(bg), parse(fg));
}

const pages = [palette.paper.DEFAULT, palette.paper.raised, palette.paper.sunk];
const tints = [palette.accent.soft, palette.notice.soft, palette.danger.soft];

describe("the palette meets WCAG 2.1 AA contrast (1.4.3 text 4.5:1, 1.4.11 graphical objects 3:1)", () => {
  it("when the two inks the issue named are measured, then their old values fail and the new ones pass on the page", () => {
    // The values before this change, as axe-core measured them on the Sign in … Filings screens.
    expect(contrast("#66728a", palette.paper.DEFAULT)).toBeLessThan(4.5);
    expect(contrast("#8d96a8", palette.paper.DEFAULT)).toBeLessThan(3);
    expect(contrast(palette.ink.muted, palette.paper.DEFAULT)).toBeGreaterThanOrEqual(4.5);
    expect(contrast(palette.ink.faint, palette.paper.DEFAULT)).toBeGreaterThanOrEqual(4.5);
  });

  it.each(Object.entries(palette.ink))("when ink %s sets text on any paper tone, then it reads at 4.5:1", (_, ink) => {
    for (const bg of pages) expect(contrast(ink, bg), `${ink} on ${bg}`).toBeGreaterThanOrEqual(4.5);
  });

  it("when muted, soft or full ink sets text on the accent, notice or danger tints, then it reads at 4.5:1", () => {
    for (const ink of [palette.ink.DEFAULT, palette.ink.soft, palette.ink.muted])
      for (const bg of tints) expect(contrast(ink, bg), `${ink} on ${bg}`).toBeGreaterThanOrEqual(4.5);
  });

  it("when the accent, danger and notice colours set text (links, errors, notices), then they read at 4.5:1 on the page tones", () => {
    for (const fg of [palette.accent.DEFAULT, palette.accent.hover, palette.danger.DEFAULT, palette.notice.DEFAULT])
      for (const bg of pages) expect(contrast(fg, bg), `${fg} on ${bg}`).toBeGreaterThanOrEqual(4.5);
    expect(contrast(palette.danger.DEFAULT, palette.danger.soft)).toBeGreaterThanOrEqual(4.5);
  });

  it.each(["green", "yellow", "red"] as const)(
    "when the %s zone badge writes its name on its soft tone, then it reads at 4.5:1, and its colour stands at 3:1 on the page as a chart line or bar",
    (zone) => {
      expect(contrast(palette.zone[zone], palette.zone[`${zone}-soft`])).toBeGreaterThanOrEqual(4.5);
      for (const bg of pages) expect(contrast(chartColours.zone[zone], bg)).toBeGreaterThanOrEqual(3);
    },
  );

  it("when a chart draws its labels and lines, then labels read at 4.5:1 and the lines at 3:1 on the chart's paper", () => {
    expect(contrast(chartColours.label, chartColours.paper)).toBeGreaterThanOrEqual(4.5);
    expect(contrast(chartColours.ink, chartColours.paper)).toBeGreaterThanOrEqual(3);
    expect(contrast(chartColours.accent, chartColours.paper)).toBeGreaterThanOrEqual(3);
  });

  it("when the focus ring (accent) surrounds a control on any paper tone, then it stands at 3:1", () => {
    for (const bg of pages) expect(contrast(palette.accent.DEFAULT, bg)).toBeGreaterThanOrEqual(3);
  });
});
