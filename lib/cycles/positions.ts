/**
 * Where each temperature channel's probe sat, as the record, the report, the sign-off gate and the API read it: the
 * positions in the mapping the current analysis read, one row per temperature channel of that analysis.
 */
import { isSensorPosition, needsSensorPositions, placementRefusal, type ChannelPlacements, type SensorPosition } from "@/lib/domain";
import { thermometricOf, type CycleAnalysis } from "@/lib/analysis/types";

/** One temperature channel and its position; position null when nobody recorded it. */
export type ChannelPosition = { header: string; position: SensorPosition | null; note: string | null };

/** The analysis' temperature channels with their positions (a thermometric analysis lists every channel; otherwise those placed). */
export function channelPositionsOf(analysis: CycleAnalysis | null, placements: ChannelPlacements | null | undefined): ChannelPosition[] {
  const thermometric = thermometricOf(analysis);
  const headers = thermometric ? thermometric.channels.map((c) => c.header) : Object.keys(placements ?? {});
  return headers.map((header) => {
    const placement = placements && Object.hasOwn(placements, header) ? placements[header] : undefined;
    return { header, position: placement && isSensorPosition(placement.position) ? placement.position : null, note: placement?.note?.trim() || null };
  });
}

/** Why the record cannot be approved for its positions, or null: only thermometric tests need them. */
export function positionRefusalOf(detail: { testKind: string; analysis: CycleAnalysis | null; positions: ChannelPosition[] }): string | null {
  const thermometric = thermometricOf(detail.analysis);
  if (!thermometric || !needsSensorPositions(detail.testKind)) return null;
  const placements: ChannelPlacements = {};
  for (const p of detail.positions) if (p.position) placements[p.header] = { position: p.position };
  return placementRefusal({ temperatureChannels: detail.positions.map((p) => p.header), referenceChannel: thermometric.referenceChannel, placements });
}

/** The placements of a channel list, in channel order, leaving out the unplaced: what a correction sends as `positions`. */
export function canonicalPlacements(positions: readonly ChannelPosition[]): ChannelPlacements {
  const placements: ChannelPlacements = {};
  for (const p of positions) if (p.position) placements[p.header] = p.note ? { position: p.position, note: p.note } : { position: p.position };
  return placements;
}
