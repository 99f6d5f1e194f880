/**
 * Quartermark's palette, in one place: tailwind.config.ts makes its utility classes from it and
 * the charts (SVG attributes, which take no classes) read the same values.
 *
 * Ink-navy on a warm paper page, one accent (a deep teal) for actions and links, hairline rules.
 * Contrast (WCAG 2.1, 1.4.3 and 1.4.11), checked by tests/client/palette.test.ts:
 * - every ink that sets text is at least 4.5:1 on each paper tone it sits on; `muted` also on the
 *   tinted notice, accent and danger surfaces;
 * - zone colours are at least 4.5:1 on their soft badge tone and 3:1 on the page, so a zone line,
 *   bar or label in a chart reads as a graphical object;
 * - `rule` and `rule-strong` are hairlines that separate; nothing is told by them alone.
 * Zone colours are used only by the zone badge and the zone charts; a notice that is not a zone
 * (four eyes, open findings, a pending filing, a short window) takes the neutral `notice` tone.
 */
export const palette = {
  ink: {
    DEFAULT: "#1b2638",
    soft: "#3c4a60",
    // Was #66728a (4.44:1 on the page): now 5.64:1 on the page, 5.00:1 on the danger tint.
    muted: "#566279",
    // Was #8d96a8 (2.73:1): the lightest ink that still reads at AA on every paper tone (5.00:1 on
    // the page, 4.58:1 on paper-sunk). Only for minor text on paper: placeholders, dashes, sort marks.
    faint: "#5e6a81",
  },
  paper: {
    DEFAULT: "#f8f5ee",
    raised: "#fcfaf6",
    sunk: "#f0ebe0",
  },
  rule: {
    DEFAULT: "#ddd6c8",
    strong: "#c4bba9",
  },
  accent: {
    DEFAULT: "#0e6571",
    hover: "#0a4f58",
    soft: "#e1eeee",
  },
  danger: {
    DEFAULT: "#9f2a1f",
    soft: "#f6e4e0",
  },
  // A muted slate blue-grey, apart from all three zone hues: text #3e4f6b is 7:1 on paper and
  // on notice-soft; body text on notice-soft stays ink.
  notice: {
    DEFAULT: "#3e4f6b",
    rule: "#6b7c98",
    soft: "#e8ecf2",
  },
  zone: {
    green: "#2e6f45",
    "green-soft": "#e3efe5",
    yellow: "#8a6210",
    "yellow-soft": "#f7ecd0",
    red: "#a3271d",
    "red-soft": "#f5dfdb",
  },
} as const;

/** The few values the charts draw with (SVG fill and stroke attributes). */
export const chartColours = {
  ink: palette.ink.DEFAULT,
  /** Axis ticks, axis titles and in-chart labels: text, so 4.5:1 on the chart's paper. */
  label: palette.ink.muted,
  grid: palette.rule.DEFAULT,
  accent: palette.accent.DEFAULT,
  paper: palette.paper.raised,
  zone: { green: palette.zone.green, yellow: palette.zone.yellow, red: palette.zone.red },
} as const;
