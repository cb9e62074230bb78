import type { Config } from "tailwindcss";

/**
 * Inhibitrack's look: a cool slate ink on warm paper, one teal accent for action and focus,
 * and muted semantic colours for pass / warn / fail. Small, tight type for dense tables.
 */
const config: Config = {
  content: ["./src/**/*.{ts,tsx}"],
  theme: {
    extend: {
      colors: {
        paper: { DEFAULT: "#fbfaf7", raised: "#ffffff", sunk: "#f3f1ec" },
        ink: { DEFAULT: "#1d2630", soft: "#3c4956", muted: "#66737f", faint: "#98a2ab" },
        rule: { DEFAULT: "#e3e0d8", strong: "#cfcbc1" },
        accent: { DEFAULT: "#0f766e", strong: "#0b5d57", soft: "#e3f2ef" },
        pass: { DEFAULT: "#2f7d4f", soft: "#e6f2ea" },
        warn: { DEFAULT: "#a16207", soft: "#fbf1de" },
        fail: { DEFAULT: "#b42318", soft: "#fbe9e7" },
        info: { DEFAULT: "#35608f", soft: "#e7eef6" },
      },
      fontFamily: {
        sans: ["var(--font-sans)", "system-ui", "sans-serif"],
        mono: ["var(--font-mono)", "ui-monospace", "monospace"],
      },
      fontSize: {
        "2xs": ["0.6875rem", { lineHeight: "1rem" }],
        xs: ["0.75rem", { lineHeight: "1.1rem" }],
        sm: ["0.8125rem", { lineHeight: "1.25rem" }],
        base: ["0.875rem", { lineHeight: "1.35rem" }],
        lg: ["1rem", { lineHeight: "1.5rem" }],
        xl: ["1.25rem", { lineHeight: "1.75rem" }],
        "2xl": ["1.5rem", { lineHeight: "2rem" }],
      },
      borderRadius: { DEFAULT: "4px", md: "6px" },
      boxShadow: { card: "0 1px 0 rgba(29,38,48,0.04), 0 1px 2px rgba(29,38,48,0.06)" },
    },
  },
  plugins: [],
};
export default config;
