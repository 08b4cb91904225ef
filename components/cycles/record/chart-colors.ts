/**
 * Colours for the record's charts. Canvas and SVG need literal values, so these repeat the
 * Tailwind tokens (tailwind.config.ts). The two saturation-flag tints are a blue-teal and an
 * amber: they stay apart for red–green colour-blind readers, and each span is also labelled.
 */
export const CHART = {
  ink: "#1f2328",
  inkSoft: "#3d444d",
  inkMuted: "#656d76",
  inkFaint: "#8c959f",
  line: "#d8d4ca",
  grid: "rgba(31,35,40,0.08)",
  paper: "#f7f5f0",
  raised: "#ffffff",
  pressure: "#8a5515", // brass-600
  saturation: "#6d3fa0",
  bandFill: "rgba(29,122,77,0.10)", // pass-500
  bandEdge: "rgba(29,122,77,0.55)",
  plateau: "#17616a", // steam-600
  airFill: "rgba(31,122,133,0.18)", // steam-500: colder than saturation
  airEdge: "#114a51", // steam-700
  superheatFill: "rgba(161,92,0,0.18)", // caution-500: hotter than saturation
  superheatEdge: "#6f3f00", // caution-700
  onLine: "#135536", // pass-700
  liquidSide: "#17616a", // steam-600
  vapourSide: "#a15c00", // caution-500
  path: "#8c959f",
} as const;

// Load channels: a colour-blind-aware categorical set (after Okabe & Ito), darkened for paper.
const LOAD_COLOURS = ["#0072b2", "#d55e00", "#009e73", "#cc79a7", "#56a0d3", "#e69f00", "#44546a", "#c4473a", "#5a6f1e", "#2f8f8a"];

export function loadColour(index: number): string {
  return LOAD_COLOURS[index % LOAD_COLOURS.length];
}
