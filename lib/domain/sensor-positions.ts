/**
 * Where each temperature probe sat in the chamber, and which test pack or load was run: what a thermometric report
 * must state beside its figures (DOMAIN.md §2.3, "Probes and placement"). The ids are stable (stored in mappings and
 * cycles, and used by qualification studies' load maps); the labels are words for people.
 */

/** The positions the trade names (common practice); "other" asks for the note. */
export const SENSOR_POSITIONS = ["reference-drain", "pack-centre", "pack-top", "pack-bottom", "pack-side", "free-space", "load-item", "chamber-wall", "door", "near-pressure-sensor", "other"] as const;
export type SensorPosition = (typeof SENSOR_POSITIONS)[number];

export const SENSOR_POSITION_LABELS: Record<SensorPosition, string> = {
  "reference-drain": "Reference point (chamber drain)",
  "pack-centre": "Test pack, centre",
  "pack-top": "Test pack, top",
  "pack-bottom": "Test pack, bottom",
  "pack-side": "Test pack, side",
  "free-space": "Free chamber space",
  "load-item": "Load item (centre of the slowest item)",
  "chamber-wall": "Chamber wall",
  door: "Door",
  "near-pressure-sensor": "Beside the chamber pressure sensor",
  other: "Other (see the note)",
};

export const isSensorPosition = (value: unknown): value is SensorPosition => typeof value === "string" && (SENSOR_POSITIONS as readonly string[]).includes(value);

/** The words for a stored position id; one this version does not know is spelt out from its id. */
export function sensorPositionLabel(position: string): string {
  if (isSensorPosition(position)) return SENSOR_POSITION_LABELS[position];
  const words = position.replace(/[-_]+/g, " ").trim();
  return words.charAt(0).toUpperCase() + words.slice(1);
}

export const SENSOR_NOTE_MAX_CHARS = 200;

/** One temperature channel's place in the chamber, and a free-text note ("sheet 19 of 38, on the vertical axis"). */
export type ChannelPlacement = { position: SensorPosition; note?: string };
/** Placements by channel header, exactly as in the file (trimmed): the key the mapping uses for every column. */
export type ChannelPlacements = Record<string, ChannelPlacement>;

/** The test pack or load that was run (common practice; EN 285 standard test pack, EN 13060 hollow load). */
export const LOAD_TYPES = ["standard-test-pack", "hollow-load-test", "empty-chamber", "fluids-load", "wrapped-instruments", "unwrapped-instruments", "textiles", "other"] as const;
export type LoadType = (typeof LOAD_TYPES)[number];

export const LOAD_TYPE_LABELS: Record<LoadType, string> = {
  "standard-test-pack": "Standard test pack (textile)",
  "hollow-load-test": "Hollow-load test device",
  "empty-chamber": "Empty chamber",
  "fluids-load": "Fluids load (bottles)",
  "wrapped-instruments": "Wrapped instruments",
  "unwrapped-instruments": "Unwrapped instruments",
  textiles: "Textiles",
  other: "Other (see the load description)",
};

export const isLoadType = (value: unknown): value is LoadType => typeof value === "string" && (LOAD_TYPES as readonly string[]).includes(value);

export function loadTypeLabel(loadType: string | null | undefined): string {
  if (!loadType) return "not recorded";
  if (isLoadType(loadType)) return LOAD_TYPE_LABELS[loadType];
  const words = loadType.replace(/[-_]+/g, " ").trim();
  return words.charAt(0).toUpperCase() + words.slice(1);
}

export const LOAD_LOT_MAX_CHARS = 60;

/** Test kinds whose approval needs every temperature channel placed: not air leakage (pressure only), not Bowie-Dick (judged by its sheet). */
const UNPLACED_KINDS: readonly string[] = ["air-leakage", "bowie-dick"];
export const needsSensorPositions = (testKind: string): boolean => !UNPLACED_KINDS.includes(testKind);

const GUESSES: Array<[RegExp, SensorPosition]> = [
  [/drain|\bref/i, "reference-drain"],
  [/free[\s_-]?space/i, "free-space"],
  [/centre|center|middle|mitte/i, "pack-centre"],
  [/\btop\b|upper|oben/i, "pack-top"],
  [/bottom|lower|unten/i, "pack-bottom"],
  [/wall/i, "chamber-wall"],
  [/door/i, "door"],
];

/** A first choice for the intake form from the column's header ("Drain (°C)" → reference point); null when the header says nothing. The user confirms it. */
export function guessSensorPosition(header: string): SensorPosition | null {
  return GUESSES.find(([re]) => re.test(header))?.[1] ?? null;
}

/**
 * What keeps the placements from supporting an approval: the temperature channels without a position, and whether the
 * reference channel is missing from the drain (the plateau and the saturation check are read there). Empty when complete.
 */
export function placementGaps(input: { temperatureChannels: readonly string[]; referenceChannel: string | null; placements: ChannelPlacements | null | undefined }) {
  const placements = input.placements ?? {};
  const placed = (header: string) => Object.hasOwn(placements, header) && isSensorPosition(placements[header]?.position);
  const unplaced = input.temperatureChannels.filter((h) => !placed(h));
  const reference = input.referenceChannel;
  const referenceAtDrain = reference !== null && placed(reference) && placements[reference].position === "reference-drain";
  return { unplaced, referenceAtDrain };
}

const quoted = (headers: readonly string[]) => {
  const names = headers.map((h) => `"${h}"`);
  return names.length > 1 ? `${names.slice(0, -1).join(", ")} and ${names[names.length - 1]}` : names[0];
};

/** The plain sentence that refuses an approval for missing placements, or null when they are complete. */
export function placementRefusal(input: Parameters<typeof placementGaps>[0]): string | null {
  const { unplaced, referenceAtDrain } = placementGaps(input);
  const sentences: string[] = [];
  if (unplaced.length > 0) {
    const one = unplaced.length === 1;
    sentences.push(`${one ? "The position of temperature channel" : "The positions of temperature channels"} ${quoted(unplaced)} ${one ? "is" : "are"} not recorded.`);
  }
  if (!referenceAtDrain && input.referenceChannel && !unplaced.includes(input.referenceChannel)) {
    sentences.push(`The reference channel "${input.referenceChannel}" is not placed at the reference point (chamber drain).`);
  }
  if (sentences.length === 0) return null;
  return `${sentences.join(" ")} A thermometric test is evidence only when the report says where each probe sat; return the cycle so the positions are recorded as a correction.`;
}
