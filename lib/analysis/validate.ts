import type { Recording } from "../logger-files/types";
import { AnalysisError, type AcceptanceLimits } from "./types";

export function validateLimits(limits: AcceptanceLimits): void {
  const entries: Array<[keyof AcceptanceLimits, boolean]> = [
    ["sterilizationTempC", limits.sterilizationTempC > 0 && limits.sterilizationTempC < 374],
    ["holdingTimeS", limits.holdingTimeS > 0],
    ["bandK", limits.bandK > 0],
    ["maxEquilibrationS", limits.maxEquilibrationS >= 0],
    ["maxSpreadK", limits.maxSpreadK > 0],
    ["saturationLimitK", limits.saturationLimitK > 0],
    ["f0ReferenceC", Number.isFinite(limits.f0ReferenceC)],
    ["f0ZK", limits.f0ZK > 0],
  ];
  const optional: Array<keyof AcceptanceLimits> = ["maxSampleIntervalS", "freeSpaceEarlyK", "freeSpaceEarlyS", "freeSpaceK"];
  for (const name of optional) if (limits[name] !== undefined) entries.push([name, (limits[name] as number) > 0]);
  for (const [name, ok] of entries) {
    if (!ok || !Number.isFinite(limits[name])) throw new AnalysisError(`The acceptance limit ${name} = ${limits[name]} is not a usable value`);
  }
}

export function validateRecording(recording: Recording): void {
  const n = recording.timesS.length;
  if (n < 2) throw new AnalysisError("The recording needs at least two samples");
  if (recording.temperatures.length === 0) throw new AnalysisError("The recording has no temperature channel");
  for (const channel of recording.temperatures) {
    if (channel.values.length !== n) throw new AnalysisError(`Channel "${channel.header}" has ${channel.values.length} samples where the time axis has ${n}`);
  }
  if (recording.pressure.values.length !== n) throw new AnalysisError(`The pressure channel has ${recording.pressure.values.length} samples where the time axis has ${n}`);
  if (!(recording.referenceIndex >= 0 && recording.referenceIndex < recording.temperatures.length)) {
    throw new AnalysisError(`Reference index ${recording.referenceIndex} does not name a temperature channel`);
  }
  const freeSpace = recording.freeSpaceIndex ?? -1;
  if (freeSpace !== -1 && !(freeSpace >= 0 && freeSpace < recording.temperatures.length && freeSpace !== recording.referenceIndex)) {
    throw new AnalysisError(`Free-space index ${freeSpace} does not name a temperature channel other than the reference`);
  }
}
