import { CHECK_LABELS, bandTopC } from "./checks";
import type { SaturationScan } from "./saturation";
import { describeAtmosphere, type FlagWords } from "./saturation-words";
import { EDGE_TOLERANCE_K, type AcceptanceLimits, type Check, type Diagnosis } from "./types";
import { fmt, round, seconds } from "./words";

/**
 * During holding (up to the exhaust) the saturation temperature of the chamber pressure lies inside
 * the band like every probe (EN 285 thermometric criterion, DOMAIN.md §2.3 b, from memory). Measured
 * is the saturation temperature furthest outside the band, or nearest an edge when none was; limit
 * is that edge. Without a hold there is nothing to judge, and the check fails.
 */
export function checkSaturationBand(scan: SaturationScan, limits: AcceptanceLimits, words: FlagWords, basis: string): { check: Check; diagnoses: Diagnosis[] } {
  const ts = limits.sterilizationTempC;
  const top = bandTopC(limits);
  const check = (passed: boolean, measured: number | null, limit: number, comparison: Check["comparison"]): Check => ({
    id: "saturation-band",
    label: CHECK_LABELS["saturation-band"],
    passed,
    measured,
    limit,
    comparison,
    unit: "°C",
    basis,
  });
  const { tsatLow: low, tsatHigh: high } = scan;
  if (!low || !high) {
    const text = "There was no holding time before the exhaust with a pressure reading, so the saturation temperature during holding cannot be judged.";
    return { check: check(false, null, ts, "at-least"), diagnoses: [{ checkId: "saturation-band", text }] };
  }
  const belowK = ts - low.c;
  const aboveK = high.c - top;
  const passed = belowK <= EDGE_TOLERANCE_K && aboveK <= EDGE_TOLERANCE_K;
  const result = belowK >= aboveK ? check(passed, round(low.c, 3), ts, "at-least") : check(passed, round(high.c, 3), round(top, 3), "at-most");
  const diagnoses: Diagnosis[] = [];
  const gauge = words.pressureReference.kind === "gauge" ? `, or gauge readings made absolute with the wrong atmospheric pressure (${describeAtmosphere(words.atmosphere)})` : "";
  if (belowK > EDGE_TOLERANCE_K) {
    diagnoses.push({
      checkId: "saturation-band",
      text:
        `During holding the chamber pressure gave a saturation temperature as low as ${fmt(low.c, 2)} °C (at ${seconds(low.atS)}), below the sterilization temperature of ${ts} °C: ` +
        `the pressure was too low for saturated steam in the band. Look at superheat (the probes hotter than saturation), the controller's pressure set point, ` +
        `and an offset of the pressure transducer or of the temperature probes (check their calibration)${gauge}.`,
    });
  }
  if (aboveK > EDGE_TOLERANCE_K) {
    diagnoses.push({
      checkId: "saturation-band",
      text:
        `During holding the chamber pressure gave a saturation temperature as high as ${fmt(high.c, 2)} °C (at ${seconds(high.atS)}), above the band's top of ${fmt(top, 2)} °C: ` +
        `the pressure was too high for saturated steam in the band. Look at air or other non-condensable gas adding to the pressure, the controller's set point, ` +
        `and an offset of the pressure transducer or of the temperature probes (check their calibration)${gauge}.`,
    });
  }
  return { check: result, diagnoses };
}
