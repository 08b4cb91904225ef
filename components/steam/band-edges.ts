import { fromAbsoluteKpa, saturationPressureKpa } from "@/lib/steam";

/** The usual sterilization bands (Ts to Ts + 3 K): 121, 126 and 134 °C (common practice; EN 285 / ISO 17665). */
const USUAL_BANDS = [
  { label: "121 °C band", lowC: 121, highC: 124 },
  { label: "126 °C band", lowC: 126, highC: 129 },
  { label: "134 °C band", lowC: 134, highC: 137 },
] as const;

export type BandEdgeRow = {
  band: string;
  edge: "lower" | "upper";
  temperatureC: number;
  kpaAbs: number;
  barAbs: number;
  kpaGauge: number;
  psig: number;
};

/** Saturated-steam pressure at each edge of the usual bands, gauge figures at the given atmosphere. */
export function bandEdgePressures(atmosphereKpa: number): BandEdgeRow[] {
  return USUAL_BANDS.flatMap((band) =>
    (["lower", "upper"] as const).map((edge) => {
      const temperatureC = edge === "lower" ? band.lowC : band.highC;
      const kpaAbs = saturationPressureKpa(temperatureC);
      return {
        band: band.label,
        edge,
        temperatureC,
        kpaAbs,
        barAbs: kpaAbs / 100,
        kpaGauge: kpaAbs - atmosphereKpa,
        psig: fromAbsoluteKpa(kpaAbs, "psi", { gauge: true, atmosphereKpa }),
      };
    }),
  );
}
