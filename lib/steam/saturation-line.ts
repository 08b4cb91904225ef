import { CRITICAL_POINT, TRIPLE_POINT } from "./constants";
import { SteamRangeError } from "./errors";
import { saturationPressureKpa, saturationTemperatureC } from "./if97";

export type SaturationLine = { temperatureC: number[]; pressureKpa: number[] };

/** Points along the liquid–vapour line, evenly spaced in log(pressure), for drawing the phase diagram. */
export function saturationLine(points: number, fromC: number = TRIPLE_POINT.temperatureC, toC: number = CRITICAL_POINT.temperatureC): SaturationLine {
  if (!Number.isInteger(points) || points < 2) {
    throw new SteamRangeError(`A saturation line needs a whole number of at least 2 points, not ${points}`);
  }
  if (!(fromC < toC)) {
    throw new SteamRangeError(`The saturation line's start (${fromC} °C) must be below its end (${toC} °C)`);
  }
  const logFrom = Math.log(saturationPressureKpa(fromC));
  const logTo = Math.log(saturationPressureKpa(toC));
  const temperatureC: number[] = [];
  const pressureKpa: number[] = [];
  for (let i = 0; i < points; i++) {
    const p = i === 0 ? Math.exp(logFrom) : i === points - 1 ? Math.exp(logTo) : Math.exp(logFrom + ((logTo - logFrom) * i) / (points - 1));
    const clamped = Math.min(Math.max(p, TRIPLE_POINT.pressureKpa), CRITICAL_POINT.pressureKpa);
    pressureKpa.push(clamped);
    temperatureC.push(i === 0 ? fromC : i === points - 1 ? toC : saturationTemperatureC(clamped));
  }
  return { temperatureC, pressureKpa };
}
