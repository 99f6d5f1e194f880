import type { Config } from "tailwindcss";
import { palette } from "./src/styles/palette";

// The palette (and its contrast ratios) lives in src/styles/palette.ts, shared with the charts.
export default {
  content: ["./index.html", "./src/**/*.{ts,tsx}"],
  theme: {
    extend: {
      colors: palette,
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
