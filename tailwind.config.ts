import type { Config } from "tailwindcss";

// Tankbook's own palette: warm paper, graphite ink and one copper accent. Verdict colours only
// reinforce the word and icon that carry each verdict, and stay apart in greyscale.
export default {
  content: ["./app/**/*.{ts,tsx}", "./components/**/*.{ts,tsx}"],
  theme: {
    extend: {
      colors: {
        paper: { DEFAULT: "#f6f4ef", raised: "#fffdf9", sunk: "#ece8df" },
        ink: { DEFAULT: "#1f2327", soft: "#4a5058", faint: "#62676f" },
        rule: { DEFAULT: "#d9d4c8", strong: "#bdb6a6" },
        copper: { DEFAULT: "#a4501c", dark: "#7f3d14", light: "#f3e2d4" },
        verdict: {
          pass: "#2f6b3a",
          passBg: "#e3efe2",
          fail: "#a3262a",
          failBg: "#f6e0df",
          warn: "#8a5a00",
          warnBg: "#f6ecd2",
          idle: "#55606b",
          idleBg: "#e7e8ea",
        },
        trace: { a: "#1f5f99", b: "#c2571a", c: "#5b8c2a", d: "#7a4fa0" },
      },
      fontFamily: {
        sans: ["var(--font-inter)", "system-ui", "sans-serif"],
        mono: ["var(--font-mono)", "ui-monospace", "monospace"],
      },
      spacing: { gutter: "1.25rem" },
    },
  },
} satisfies Config;
