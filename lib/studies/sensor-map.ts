/**
 * The sensor map of a study run: which channel of the cycle sat at which position of the loading pattern (issue 14).
 * Proposed from the cycle's recorded placements, confirmed by the person attaching; pure.
 */
import type { PatternPosition } from "@/lib/domain/studies";
import type { ChannelPlacements } from "@/lib/domain/sensor-positions";
import type { SensorMapProposal } from "./contracts";

const escape = (text: string) => text.replace(/[.*+?^${}()|[\]\\]/g, "\\$&");
const startsWithWord = (text: string, word: string) => new RegExp(`^${escape(word)}(?![\\p{L}\\p{N}])`, "iu").test(text.trim());
const namesWord = (text: string, word: string) => new RegExp(`(?<![\\p{L}\\p{N}])${escape(word)}(?![\\p{L}\\p{N}])`, "iu").test(text);
const same = (a: string, b: string) => a.trim().toLowerCase() === b.trim().toLowerCase();

/** The positions a channel names: by its header ("P3", "P3 (°C)", "P3 tray 2", or the label) or by its placement note. */
function namedPositions(header: string, note: string | undefined, positions: PatternPosition[]): PatternPosition[] {
  return positions.filter((p) => startsWithWord(header, p.id) || same(header, p.label) || (note ? namesWord(note, p.id) || same(note, p.label) : false));
}

/**
 * One proposal per temperature channel: the position the channel names, else the single pattern position with the
 * channel's chamber position. A channel that could be two positions, or two channels that claim one position, get none
 * (the person attaching decides). The reference channel becomes a load position only when the pattern has a position there.
 */
export function proposeSensorMap({ headers, placements, positions }: { headers: string[]; placements: ChannelPlacements | null | undefined; positions: PatternPosition[] }): SensorMapProposal {
  const guesses = headers.map((header) => {
    const placement = placements && Object.hasOwn(placements, header) ? placements[header] : undefined;
    const named = namedPositions(header, placement?.note, positions);
    let positionId: string | null = named.length === 1 ? named[0].id : null;
    if (named.length === 0 && placement) {
      const byPlace = positions.filter((p) => p.sensorPosition === placement.position);
      if (byPlace.length === 1) positionId = byPlace[0].id;
    }
    return { header, placement: placement?.position ?? null, positionId };
  });
  const claims = new Map<string, number>();
  for (const g of guesses) if (g.positionId) claims.set(g.positionId, (claims.get(g.positionId) ?? 0) + 1);
  const channels = guesses.map((g) => (g.positionId && claims.get(g.positionId)! > 1 ? { ...g, positionId: null } : g));
  const sensorMap: Record<string, string> = {};
  for (const c of channels) if (c.positionId) sensorMap[c.header] = c.positionId;
  const covered = new Set(Object.values(sensorMap));
  const missing = positions.filter((p) => !covered.has(p.id)).map((p) => p.id);
  return { channels, missing, complete: missing.length === 0 && positions.length > 0, sensorMap };
}

/**
 * Why a confirmed sensor map cannot be used, as a plain sentence, or null: every key a temperature channel of the cycle,
 * every value a position of the pattern, and every position covered (two channels at one position are read together).
 */
export function sensorMapProblem({ sensorMap, headers, positions }: { sensorMap: Record<string, string>; headers: string[]; positions: PatternPosition[] }): string | null {
  const unknownHeaders = Object.keys(sensorMap).filter((h) => !headers.includes(h));
  if (unknownHeaders.length)
    return `The sensor map names ${list(unknownHeaders.map(quote))}, which ${unknownHeaders.length > 1 ? "are not temperature channels" : "is not a temperature channel"} of this cycle.`;
  const ids = new Set(positions.map((p) => p.id));
  const unknownPositions = [...new Set(Object.values(sensorMap))].filter((id) => !ids.has(id));
  if (unknownPositions.length) return `The sensor map names ${list(unknownPositions.map(quote))}, which the loading pattern does not have.`;
  const byPosition = new Set(Object.values(sensorMap));
  const missing = positions.filter((p) => !byPosition.has(p.id));
  if (missing.length) return missingSentence(missing.map((p) => p.id));
  return null;
}

export function missingSentence(missing: string[]): string {
  return `No channel of this cycle is mapped to position${missing.length > 1 ? "s" : ""} ${list(missing)}; every position of the loading pattern needs a channel. Confirm the sensor map (sensorMap: channel → position).`;
}

const quote = (text: string) => `"${text}"`;
function list(items: string[]): string {
  return items.length > 1 ? `${items.slice(0, -1).join(", ")} and ${items[items.length - 1]}` : (items[0] ?? "");
}
