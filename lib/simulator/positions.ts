import type { ChannelPlacement, ChannelPlacements } from "../domain/sensor-positions";

/**
 * Where the simulator's probes sit, as a technician would record them for an EN 285 small-load test (DOMAIN.md §2.3,
 * common practice): the drain probe at the reference point, the pack probes down the pack's vertical axis, one at its
 * side. Keyed by the headers the file carries ("Drain (°C)", "Pack 3 (degC)").
 */
const PACK_PLACES: ChannelPlacement[] = [
  { position: "pack-top", note: "Vertical axis, about 20 mm below the top sheet" },
  { position: "pack-centre", note: "Vertical axis, upper third" },
  { position: "pack-centre", note: "Geometric centre of the pack" },
  { position: "pack-centre", note: "Vertical axis, lower third" },
  { position: "pack-bottom", note: "Vertical axis, about 20 mm above the bottom sheet" },
  { position: "pack-side", note: "Long side, half height" },
];

export function simulatedPlacements(temperatureHeaders: readonly string[]): ChannelPlacements {
  const placements: ChannelPlacements = {};
  for (const header of temperatureHeaders) {
    const pack = /^pack\s*(\d+)/i.exec(header);
    if (/^drain/i.test(header)) placements[header] = { position: "reference-drain", note: "In the chamber drain, upstream of the drain valve" };
    else if (/^(chamber|free)/i.test(header)) placements[header] = { position: "free-space", note: "Free space above the centre of the pack" };
    else if (pack) placements[header] = PACK_PLACES[(Number(pack[1]) - 1) % PACK_PLACES.length];
  }
  return placements;
}
