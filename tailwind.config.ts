import type { Config } from "tailwindcss";

// Quartermark's own palette: ink-navy on a warm paper page, one accent (a deep teal) for actions
// and links, hairline rules. Zone colours live apart and are used only by the zone badge (and the
// zone charts); a notice that is not a zone (four eyes, open findings, a pending filing, a short
// window) takes the neutral slate `notice` tone instead.
export default {
  content: ["./index.html", "./src/**/*.{ts,tsx}"],
  theme: {
    extend: {
      colors: {
        ink: {
          DEFAULT: "#1b2638",
          soft: "#3c4a60",
          muted: "#66728a",
          faint: "#8d96a8",
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
      },
      fontFamily: {
        sans: ['"IBM Plex Sans"', "system-ui", "sans-serif"],
      },
      fontSize: {
        "2xs": ["0.6875rem", { lineHeight: "1rem" }],
      },
      borderWidth: {
        hair: "0.5px",
      },
    },
  },
} satisfies Config;
