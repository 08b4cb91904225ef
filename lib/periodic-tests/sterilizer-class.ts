/**
 * Size class and equilibration limit of a sterilizer from its chamber volume (DOMAIN.md §2.3 a,
 * §2.10): EN 13060 covers chambers under 60 l; EN 285 the larger ones, where the equilibration
 * time may be at most 15 s up to 800 l and 30 s above.
 */
const SMALL_STERILIZER_LIMIT_L = 60;
const LARGE_CHAMBER_LIMIT_L = 800;

export type SizeClass = { standard: "EN 13060" | "EN 285"; label: string; maxEquilibrationS: number | null; note: string };

export function sizeClassOf(chamberVolumeL: number): SizeClass {
  if (chamberVolumeL < SMALL_STERILIZER_LIMIT_L) {
    return {
      standard: "EN 13060",
      label: "Small (EN 13060, under 60 l)",
      maxEquilibrationS: null,
      note: "EN 13060 sets no equilibration limit that Papin could confirm; the acceptance profile's limit applies.",
    };
  }
  const maxEquilibrationS = chamberVolumeL <= LARGE_CHAMBER_LIMIT_L ? 15 : 30;
  return {
    standard: "EN 285",
    label: "Large (EN 285, 60 l and over)",
    maxEquilibrationS,
    note: `EN 285 / HTM 2010: equilibration time ≤ ${maxEquilibrationS} s for a chamber ${chamberVolumeL <= LARGE_CHAMBER_LIMIT_L ? "up to" : "over"} ${LARGE_CHAMBER_LIMIT_L} l.`,
  };
}

export type DefaultScheduledTest = { kind: "bowie-dick" | "hollow-load" | "air-leakage"; intervalDays: number; requiredBeforeUse: boolean };

/**
 * The schedule a new sterilizer starts with. One that removes air by vacuum (porous-load, type B) needs a steam
 * penetration (Bowie-Dick) test each day and an air leakage test each week before it is used (DOMAIN.md §2.5, §2.12;
 * HTM 01-01 Part C, common practice). A fluids or non-vacuum (type N) sterilizer gets neither; the engineer adds what
 * the site's written scheme asks for. A small (EN 13060) vacuum sterilizer, type B, proves steam penetration with the
 * hollow load (helix) test of its own standard instead of the porous-load Bowie-Dick test (common practice).
 */
export function defaultScheduleFor({ vacuumAirRemoval, chamberVolumeL }: { vacuumAirRemoval: boolean; chamberVolumeL?: number }): DefaultScheduledTest[] {
  if (!vacuumAirRemoval) return [];
  const small = chamberVolumeL !== undefined && sizeClassOf(chamberVolumeL).standard === "EN 13060";
  return [
    { kind: small ? "hollow-load" : "bowie-dick", intervalDays: 1, requiredBeforeUse: true },
    { kind: "air-leakage", intervalDays: 7, requiredBeforeUse: true },
  ];
}
