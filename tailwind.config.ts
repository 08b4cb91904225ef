import type { Config } from "tailwindcss";

// Papin's look: an instrument panel on paper. Warm neutrals, brass for action, a steam teal
// for data, and status colours chosen to stay distinct for red–green colour-blind readers.
const config: Config = {
  content: ["./app/**/*.{ts,tsx}", "./components/**/*.{ts,tsx}"],
  theme: {
    extend: {
      colors: {
        paper: { DEFAULT: "#f7f5f0", raised: "#ffffff", sunk: "#efece4" },
        ink: {
          DEFAULT: "#1f2328",
          soft: "#3d444d",
          muted: "#555c64",
          faint: "#60676f",
          line: "#d8d4ca",
        },
        brass: { 50: "#fbf5ea", 100: "#f3e3c3", 500: "#a66a1f", 600: "#8a5515", 700: "#6d4210" },
        steam: { 50: "#ebf6f7", 100: "#c9e8ea", 500: "#1f7a85", 600: "#17616a", 700: "#114a51" },
        pass: { 50: "#e9f5ef", 500: "#1d7a4d", 700: "#135536" },
        fail: { 50: "#fbeceb", 500: "#b3261e", 700: "#7f1a15" },
        caution: { 50: "#fdf4e1", 500: "#a15c00", 700: "#6f3f00" },
      },
      fontFamily: {
        sans: ["var(--font-sans)", "system-ui", "sans-serif"],
        mono: ["var(--font-mono)", "ui-monospace", "monospace"],
      },
      fontSize: {
        "2xs": ["0.6875rem", { lineHeight: "1rem" }],
        xs: ["0.75rem", { lineHeight: "1.1rem" }],
        sm: ["0.875rem", { lineHeight: "1.35rem" }],
        base: ["0.9375rem", { lineHeight: "1.5rem" }],
        lg: ["1.125rem", { lineHeight: "1.65rem" }],
        xl: ["1.375rem", { lineHeight: "1.9rem" }],
        "2xl": ["1.75rem", { lineHeight: "2.2rem" }],
      },
      spacing: { gutter: "1.25rem", panel: "1.5rem" },
      borderRadius: { panel: "0.5rem" },
      boxShadow: { panel: "0 1px 0 rgba(31,35,40,0.04), 0 1px 3px rgba(31,35,40,0.08)" },
    },
  },
};

export default config;
