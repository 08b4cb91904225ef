// Constructed logger files for black-box tests of the analyze command: an elapsed-seconds time
// column, temperature channels, one chamber pressure column whose abs/gauge marker the test
// chooses, blank cells and gaps where the test puts them.
import psychrolib from "psychrolib";

psychrolib.SetUnitSystem(psychrolib.SI);

/** 101.325 kPa, the standard atmosphere [memory, DOMAIN.md §4]. */
export const STANDARD_ATMOSPHERE_KPA = 101.325;

/**
 * Saturation pressure of water at tC, kPa abs, from psychrolib (ASHRAE's Hyland–Wexler
 * formulation), so constructed files do not lean on lib/steam. From 100 to 140 °C it lies within
 * 0.02 % of IF97, about 0.006 K in temperature [computed: python3-iapws IAPWS97 at 121.1 and 134.6 °C].
 */
export function saturationKpa(tC: number): number {
  return psychrolib.GetSatVapPres(tC) / 1000;
}

/** A reading in the file's unit; null leaves the cell blank. */
export type Reading = number | null;
export type Channel = (t: number) => Reading;

/** Sample times from 0 to untilS every everyS seconds, leaving out the times strictly inside each gap [after, resume]. */
export function sampleTimes(untilS: number, everyS = 1, gaps: Array<[number, number]> = []): number[] {
  const times: number[] = [];
  for (let t = 0; t <= untilS + 1e-9; t += everyS) {
    const time = Math.round(t * 1000) / 1000;
    if (!gaps.some(([after, resume]) => time > after && time < resume)) times.push(time);
  }
  return times;
}

/**
 * A channel that climbs 1 K/s to reach tsC at reachS, reads levelC from reachS to exhaustS, then
 * falls at fallKPerS (°C).
 */
export function plateauChannel(options: { tsC: number; reachS: number; levelC: number; exhaustS: number; fallKPerS?: number }): (t: number) => number {
  const { tsC, reachS, levelC, exhaustS, fallKPerS = 1 } = options;
  return (t) => {
    if (t < reachS) return tsC - (reachS - t);
    if (t <= exhaustS) return levelC;
    return levelC - fallKPerS * (t - exhaustS);
  };
}

/** °C to °F, for channels written in Fahrenheit. */
export const fahrenheit = (c: number) => (c * 9) / 5 + 32;

export type PressureMarker = "abs" | "gauge" | "none";

export type LoggerCsvSpec = {
  times: number[];
  /** temperature channels by name; the header reads `${name} (${temperatureUnit})` */
  channels: Record<string, Channel>;
  temperatureUnit?: "°C" | "°F";
  pressure: {
    /** the header's marker: "Chamber (kPa abs)", "Chamber (kPa g)" or, with none, "Chamber (kPa)" */
    marker: PressureMarker;
    /** what the numbers are; by default gauge when the marker says gauge, else absolute */
    reads?: "absolute" | "gauge";
    /** subtracted from the absolute pressure when the numbers are gauge (default 101.325 kPa) */
    atmosphereKpa?: number;
    /** absolute chamber pressure at t, kPa */
    kpaAbsAt: (t: number) => Reading;
  };
  /** times at which every channel, pressure included, is blank (the time cell stays) */
  blankRows?: number[];
  /** decimals written (default 4) */
  digits?: number;
};

export const PRESSURE_HEADER: Record<PressureMarker, string> = { abs: "Chamber (kPa abs)", gauge: "Chamber (kPa g)", none: "Chamber (kPa)" };

const cell = (value: Reading, digits: number) => (value === null ? "" : String(Number(value.toFixed(digits))));

/** The file's text: comma-separated, "." decimals, LF line ends, one header line. */
export function loggerCsv(spec: LoggerCsvSpec): string {
  const unit = spec.temperatureUnit ?? "°C";
  const digits = spec.digits ?? 4;
  const names = Object.keys(spec.channels);
  const reads = spec.pressure.reads ?? (spec.pressure.marker === "gauge" ? "gauge" : "absolute");
  const offset = reads === "gauge" ? (spec.pressure.atmosphereKpa ?? STANDARD_ATMOSPHERE_KPA) : 0;
  const blank = new Set(spec.blankRows ?? []);
  const lines = [["Time (s)", ...names.map((n) => `${n} (${unit})`), PRESSURE_HEADER[spec.pressure.marker]].join(",")];
  for (const t of spec.times) {
    if (blank.has(t)) {
      lines.push([String(t), ...names.map(() => ""), ""].join(","));
      continue;
    }
    const kpaAbs = spec.pressure.kpaAbsAt(t);
    const pressure = kpaAbs === null ? null : kpaAbs - offset;
    lines.push([String(t), ...names.map((n) => cell(spec.channels[n](t), digits)), cell(pressure, digits)].join(","));
  }
  return lines.join("\n") + "\n";
}

/** A channel with blank cells at the given times. */
export function withBlanks(channel: Channel, blankAt: (t: number) => boolean): Channel {
  return (t) => (blankAt(t) ? null : channel(t));
}

/** Ts of the constructed 134 °C cycles, and the command-line limits that go with them (3 min hold). */
export const TS_C = 134;
export const LIMITS_134 = ["--sterilization-temp", "134", "--holding-time", "180"];

/**
 * A sound 134 °C cycle, one sample a second for 400 s: the drain reaches Ts at 30 s, the packs at
 * 32 s, all read 134.6 °C until 330 s and then fall 1 K/s; the chamber pressure is saturated at the
 * drain's temperature. Expected by the definitions (DESIGN.md): plateau from 30 s, equilibration
 * 2 s, holding 32–330 s = 298 s, pass.
 */
export function soundCycle(): { times: number[]; drain: (t: number) => number; pack: (t: number) => number; channels: Record<string, Channel>; kpaAbsAt: (t: number) => number } {
  const drain = plateauChannel({ tsC: TS_C, reachS: 30, levelC: 134.6, exhaustS: 330 });
  const pack = plateauChannel({ tsC: TS_C, reachS: 32, levelC: 134.6, exhaustS: 330 });
  return {
    times: sampleTimes(400),
    drain,
    pack,
    channels: { Drain: drain, "Pack 1": pack, "Pack 2": pack },
    kpaAbsAt: (t) => saturationKpa(drain(t)),
  };
}
