import type { Recording } from "../logger-files/types";
import { CHECK_LABELS, freeSpaceLimits } from "./checks";
import type { PlateauTiming } from "./equilibration";
import { EDGE_TOLERANCE_K, type AcceptanceLimits, type Check, type Diagnosis } from "./types";
import { fmt, round, seconds } from "./words";

/**
 * EN 285 small-load test: over the plateau period, the sensor in free space above the pack may
 * exceed the reference by at most 5 K in the plateau's first 60 s and 2 K after (DOMAIN.md §2.3 e,
 * from memory; the profile may set other figures). At exactly 60 s the later limit applies.
 * Measured is the excess at the sample furthest over its limit (or nearest it), limit that limit.
 */
export function checkFreeSpace(recording: Recording, timing: PlateauTiming, limits: AcceptanceLimits, basis: string): { check: Check; diagnoses: Diagnosis[] } | null {
  const index = recording.freeSpaceIndex ?? -1;
  if (index < 0) return null;
  const { earlyK, earlyS, laterK } = freeSpaceLimits(limits);
  const { timesS } = recording;
  const freeSpace = recording.temperatures[index];
  const reference = recording.temperatures[recording.referenceIndex].values;
  let worst: { excessK: number; limitK: number; i: number } | null = null;
  for (let i = timing.startIndex; i <= timing.periodEndIndex; i++) {
    const excessK = freeSpace.values[i] - reference[i];
    if (excessK !== excessK) continue;
    const limitK = timesS[i] - timing.startS < earlyS ? earlyK : laterK;
    if (!worst || excessK - limitK > worst.excessK - worst.limitK) worst = { excessK, limitK, i };
  }
  const passed = worst !== null && worst.excessK <= worst.limitK + EDGE_TOLERANCE_K;
  const diagnoses: Diagnosis[] = [];
  if (worst && !passed) {
    const intoS = round(timesS[worst.i] - timing.startS, 1);
    diagnoses.push({
      checkId: "free-space",
      text:
        `"${freeSpace.header}" read ${fmt(worst.excessK, 2)} K above the reference at ${seconds(round(timesS[worst.i], 1))}, ${seconds(intoS)} into the plateau ` +
        `(limit ${earlyK} K in the first ${seconds(earlyS)}, ${laterK} K after): the steam in the chamber was superheated. ` +
        "Look at the steam supply's pressure-reducing valve, at a jacket hotter than the chamber and at over-dry supply steam; or an offset of either probe (check their calibration).",
    });
  }
  if (!worst) diagnoses.push({ checkId: "free-space", text: `"${freeSpace.header}" has no reading during the plateau, so the free-space criterion cannot be shown.` });
  const check: Check = {
    id: "free-space",
    label: CHECK_LABELS["free-space"],
    passed,
    measured: worst ? round(worst.excessK, 3) : null,
    limit: worst ? worst.limitK : laterK,
    comparison: "at-most",
    unit: "K",
    basis,
  };
  return { check, diagnoses };
}
