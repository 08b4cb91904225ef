/** Papin's palette (tailwind.config.ts) as hex for the PDF, and the report's type scale. */
export const colour = {
  paper: "#f7f5f0",
  paperRaised: "#ffffff",
  paperSunk: "#efece4",
  ink: "#1f2328",
  inkSoft: "#3d444d",
  inkMuted: "#656d76",
  inkFaint: "#8c959f",
  inkLine: "#d8d4ca",
  brass50: "#fbf5ea",
  brass100: "#f3e3c3",
  brass500: "#a66a1f",
  brass600: "#8a5515",
  brass700: "#6d4210",
  steam50: "#ebf6f7",
  steam100: "#c9e8ea",
  steam500: "#1f7a85",
  steam600: "#17616a",
  steam700: "#114a51",
  pass50: "#e9f5ef",
  pass500: "#1d7a4d",
  pass700: "#135536",
  fail50: "#fbeceb",
  fail500: "#b3261e",
  fail700: "#7f1a15",
  caution50: "#fdf4e1",
  caution500: "#a15c00",
  caution700: "#6f3f00",
} as const;

/**
 * Line colours for the load channels. The reference is drawn in ink; loads take the steam and
 * brass hues first, then muted partners, with a dash pattern added on the second round so that
 * sixteen channels stay apart in print.
 */
const LOAD_HUES = [colour.steam500, colour.brass500, "#4f6d9a", colour.steam700, "#8a6a9e", colour.brass700, "#5c8a3a", "#9a4f6d"];
const DASHES = [undefined, "3 1.5", "1 1.2"];

export function loadChannelStyle(index: number): { stroke: string; dash: string | undefined } {
  return { stroke: LOAD_HUES[index % LOAD_HUES.length], dash: DASHES[Math.floor(index / LOAD_HUES.length) % DASHES.length] };
}

export const seriesStyle = {
  reference: { stroke: colour.ink, width: 1.1 },
  pressure: { stroke: colour.caution500, width: 0.9, dash: "4 2" },
  saturation: { stroke: colour.fail500, width: 0.8, dash: "1.4 1.2" },
  load: { width: 0.6 },
} as const;

export const FONT_SANS = "Inter";
export const FONT_MONO = "JetBrains Mono";

export const A4 = { width: 595.28, height: 841.89 } as const;
export const PAGE_MARGIN = { top: 46, bottom: 46, side: 40 } as const;
export const CONTENT_WIDTH = A4.width - 2 * PAGE_MARGIN.side;
