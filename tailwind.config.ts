import type { Config } from "tailwindcss";

// Tenthwise's own look: ink and paper like a shop traveller, a brass accent,
// and three plain verdict colours that also carry words and shapes (never
// colour alone) so a tag reads right in poor light or to a colour-blind eye.
// Every text colour meets WCAG 2 AA contrast (4.5:1) on every light surface below (paper, raised,
// sunk and each verdict's light tint): ink.faint, go and caution are dark enough for small text on
// the tints, brass.dark is the brass for text on light surfaces and brass.bright the brass for text
// on ink (brass itself, 3:1 on white, is for borders, bars and large text only). The browser test
// tests/e2e/legibility.e2e.test.ts runs axe-core over every page of every role to keep it so.
export default {
  content: ["./index.html", "./src/**/*.{ts,tsx}"],
  theme: {
    extend: {
      fontFamily: {
        sans: ['"Noto Sans"', "system-ui", "sans-serif"],
        mono: ['"Noto Sans Mono"', "ui-monospace", "monospace"],
      },
      colors: {
        ink: { DEFAULT: "#1f2f3d", soft: "#3b4d5e", faint: "#55626e" },
        paper: { DEFAULT: "#f5f3ee", raised: "#ffffff", sunk: "#e9e5dc", line: "#d6d0c4" },
        brass: { DEFAULT: "#b8862f", light: "#f3e3c0", dark: "#7a561a", bright: "#d4a24c" },
        go: { DEFAULT: "#276b43", light: "#dcefe3" },
        caution: { DEFAULT: "#8a5300", light: "#fbecc9" },
        stop: { DEFAULT: "#b3261e", light: "#f9dedc" },
        hold: { DEFAULT: "#5b4a8b", light: "#e7e2f4" },
      },
      borderRadius: { card: "0.6rem" },
      boxShadow: { card: "0 1px 2px rgba(31,47,61,0.08), 0 2px 8px rgba(31,47,61,0.06)" },
    },
  },
} satisfies Config;
