import type { AtmosphereUsed, PressureReference } from "../logger-files/types";
import { fmt, seconds } from "./words";

/** What a flag's diagnosis names besides the figures: the reference channel and how the pressure was read. */
export type FlagWords = { reference: string; pressureReference: PressureReference; atmosphere: AtmosphereUsed };

const ATMOSPHERE_SOURCE: Record<AtmosphereUsed["source"], string> = {
  option: "given as an option of the analysis",
  mapping: "taken from the saved column mapping",
  site: "taken from the site's settings",
  standard: "the standard atmosphere, since no other was given",
};

/** The atmospheric pressure used and where it came from, in words: "95.5 kPa, given as an option of the analysis". */
export function describeAtmosphere(atmosphere: AtmosphereUsed): string {
  return `${atmosphere.kpa} kPa, ${ATMOSPHERE_SOURCE[atmosphere.source]}`;
}

const SHARED_CAUSES = "an offset of the temperature probe or of the pressure transducer (check their calibration)";

/**
 * Every likely cause of a flag, in plain words (issue 9, rule 8). Below: air or other
 * non-condensable gas, condensate at the drain, a probe or transducer offset, and for gauge readings
 * an atmospheric pressure higher than the site's. Above: superheat, a probe or transducer offset, and
 * for gauge readings an atmospheric pressure lower than the site's, or gauge readings taken as absolute.
 */
export function flagDiagnosis(kind: "below" | "above", worst: number, start: number, end: number, words: FlagWords): string {
  const span = `From ${seconds(start)} to ${seconds(end)}`;
  const gauge = words.pressureReference.kind === "gauge";
  const atmosphere = describeAtmosphere(words.atmosphere);
  if (kind === "below") {
    const causes = [
      "part of that pressure was air or another non-condensable gas, which shields the load from steam: look at air removal (vacuum depth and number of pulses, the vacuum pump), " +
        "at leaks (door seal, valves, sensor glands: run an air-leakage test) and at non-condensable gases in the steam supply",
      "condensate pooling at the drain and cooling the reference probe (look at the drain line, its strainer and trap)",
      SHARED_CAUSES,
    ];
    if (gauge) causes.push(`the gauge readings were made absolute with an atmospheric pressure of ${atmosphere}: if the site's is lower, every saturation temperature reads too high`);
    return `${span} "${words.reference}" read up to ${fmt(Math.abs(worst))} K colder than saturated steam at the chamber pressure. Likely causes: ${causes.join("; ")}.`;
  }
  const causes = [
    "the steam was superheated, and superheated steam sterilizes like hot air, far less well: look at the steam supply's pressure-reducing valve (too close to the chamber, or a large pressure drop across it), " +
      "at a jacket hotter than the chamber, at over-dry supply steam, and at over-dried textiles taking up moisture",
    SHARED_CAUSES,
  ];
  if (gauge) causes.push(`the gauge readings were made absolute with an atmospheric pressure of ${atmosphere}: if the site's is higher, every saturation temperature reads too low`);
  if (words.pressureReference.source === "assumed") {
    causes.push("the pressure column has no abs/gauge marker and was read as absolute: if the logger records gauge pressure, confirm gauge and analyse again");
  }
  return `${span} "${words.reference}" read up to ${fmt(Math.abs(worst))} K hotter than saturated steam at the chamber pressure. Likely causes: ${causes.join("; ")}.`;
}
