import type { Recording } from "../logger-files/types";
import { CHECK_LABELS } from "./checks";
import type { PlateauTiming } from "./equilibration";
import type { AcceptanceLimits, Check, Diagnosis } from "./types";
import { describeDuration, fmt, round, seconds } from "./words";

export function checkHolding(recording: Recording, timing: PlateauTiming, limits: AcceptanceLimits, basis: string): { check: Check; diagnoses: Diagnosis[] } {
  const { holdingTime } = timing;
  const passed = holdingTime !== null && holdingTime >= limits.holdingTimeS;
  const diagnoses: Diagnosis[] = [];
  if (holdingTime !== null && !passed) {
    diagnoses.push({
      checkId: "holding-time",
      text:
        `All channels stayed at or above ${limits.sterilizationTempC} °C for ${describeDuration(round(holdingTime, 1))}, short of the ${describeDuration(limits.holdingTimeS)} required. ${whyTheHoldEnded(recording, timing)} ` +
        "Check the controller's holding time and set point.",
    });
  }
  const check: Check = {
    id: "holding-time",
    label: CHECK_LABELS["holding-time"],
    passed,
    measured: holdingTime === null ? null : round(holdingTime, 3),
    limit: limits.holdingTimeS,
    comparison: "at-least",
    unit: "s",
    basis,
  };
  return { check, diagnoses };
}

function whyTheHoldEnded(recording: Recording, timing: PlateauTiming): string {
  const { timesS, temperatures } = recording;
  const stop = timing.holdBreak;
  if (stop?.kind === "dip") {
    const referenceStillUp = stop.channels.every((k) => k !== recording.referenceIndex);
    return (
      `The hold ended at ${seconds(timesS[stop.index])} when ${stop.channels.map((k) => `"${temperatures[k].header}" fell to ${fmt(temperatures[k].values[stop.index], 2)} °C`).join(", ")}` +
      (referenceStillUp ? " while the reference was still up: a cold spot in the load or a dip in the steam supply." : ".")
    );
  }
  if (stop?.kind === "gap") {
    return `The hold ended at ${seconds(timesS[stop.index - 1])}: the record has no sample until ${seconds(timesS[stop.index])}, and the hold is not counted across a gap.`;
  }
  if (stop?.kind === "missing") {
    const names = stop.channels.map((k) => `"${temperatures[k].header}"`).join(", ");
    return `The hold ended at ${seconds(timesS[stop.index - 1])}: ${names} had no reading from ${seconds(timesS[stop.index])} for longer than the record's gap limit, and the hold is not counted across a gap.`;
  }
  if (timing.regionEndIndex === timesS.length - 1) return "The record ends while the temperatures are still up: the logger may have stopped too early.";
  return "The cycle moved on to exhaust before the holding time was complete.";
}
