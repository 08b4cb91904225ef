import { encodeWindows1252 } from "../logger-files/decode";
import { STANDARD_ATMOSPHERE_KPA, fromAbsoluteKpa, fromCelsius, type PressureUnit, type TemperatureUnit } from "../steam";
import type { SimulatedCycle } from "./cycle";

export type CsvTimeFormat = "iso" | "iso-t" | "dmy" | "mdy-ampm" | "clock" | "elapsed-seconds";

export type CsvDialect = {
  delimiter?: "," | ";" | "\t";
  decimal?: "." | ",";
  timeFormat?: CsvTimeFormat;
  encoding?: "utf-8" | "utf-8-bom" | "windows-1252";
  lineEnding?: "lf" | "crlf";
  preamble?: string[];
  pressureUnit?: PressureUnit;
  gauge?: boolean;
  atmosphereKpa?: number;
  temperatureUnit?: TemperatureUnit;
  /** spelling of the temperature unit in headers, e.g. "°C" or "degC"; default from temperatureUnit */
  temperatureLabel?: string;
};

const PRESSURE_DECIMALS: Record<PressureUnit, number> = { Pa: 0, kPa: 2, MPa: 5, bar: 4, mbar: 1, psi: 3, mmHg: 1, inHg: 3 };
const TEMPERATURE_LABEL: Record<TemperatureUnit, string> = { C: "°C", F: "°F", K: "K" };

const pad = (n: number, width = 2) => String(n).padStart(width, "0");

function timeText(startedAt: Date, seconds: number, format: CsvTimeFormat): string {
  if (format === "elapsed-seconds") return String(seconds);
  const d = new Date(startedAt.getTime() + seconds * 1000);
  const Y = d.getUTCFullYear();
  const M = pad(d.getUTCMonth() + 1);
  const D = pad(d.getUTCDate());
  const h = d.getUTCHours();
  const clock = `${pad(h)}:${pad(d.getUTCMinutes())}:${pad(d.getUTCSeconds())}`;
  switch (format) {
    case "iso":
      return `${Y}-${M}-${D} ${clock}`;
    case "iso-t":
      return `${Y}-${M}-${D}T${clock}`;
    case "dmy":
      return `${D}.${M}.${Y} ${clock}`;
    case "clock":
      return clock;
    case "mdy-ampm": {
      const hour12 = h % 12 === 0 ? 12 : h % 12;
      return `${M}/${D}/${Y} ${hour12}:${pad(d.getUTCMinutes())}:${pad(d.getUTCSeconds())} ${h < 12 ? "AM" : "PM"}`;
    }
  }
}

/** Writes a simulated cycle as a logger file in one of the supported generic CSV dialects. */
export function toLoggerCsv(sim: SimulatedCycle, dialect: CsvDialect = {}): Uint8Array {
  const delimiter = dialect.delimiter ?? ",";
  const decimal = dialect.decimal ?? ".";
  if (delimiter === "," && decimal === ",") throw new RangeError("A comma cannot be both the delimiter and the decimal mark");
  const timeFormat = dialect.timeFormat ?? "iso";
  const eol = dialect.lineEnding === "crlf" ? "\r\n" : "\n";
  const pressureUnit = dialect.pressureUnit ?? "kPa";
  const gauge = dialect.gauge ?? false;
  const atmosphereKpa = dialect.atmosphereKpa ?? STANDARD_ATMOSPHERE_KPA;
  const temperatureUnit = dialect.temperatureUnit ?? "C";
  const temperatureLabel = dialect.temperatureLabel ?? TEMPERATURE_LABEL[temperatureUnit];
  const pressureDecimals = PRESSURE_DECIMALS[pressureUnit];

  const headers = [timeFormat === "elapsed-seconds" ? "Time (s)" : "Time"];
  for (const c of sim.channels) {
    const name = c.header.replace(/\s*\([^)]*\)\s*$/, "");
    headers.push(c.kind === "temperature" ? `${name} (${temperatureLabel})` : `${name} (${pressureUnit} ${gauge ? "g" : "abs"})`);
  }
  const columns = sim.channels.map((c) => {
    const out = new Array<string>(c.values.length);
    for (let i = 0; i < c.values.length; i++) {
      const v = c.kind === "temperature" ? fromCelsius(c.values[i], temperatureUnit) : fromAbsoluteKpa(c.values[i], pressureUnit, { gauge, atmosphereKpa });
      const text = v.toFixed(c.kind === "temperature" ? 2 : pressureDecimals);
      out[i] = decimal === "," ? text.replace(".", ",") : text;
    }
    return out;
  });
  const lines: string[] = [...(dialect.preamble ?? []), headers.join(delimiter)];
  const n = sim.timesS.length;
  for (let i = 0; i < n; i++) {
    let line = timeText(sim.startedAt, sim.timesS[i], timeFormat);
    if (timeFormat === "elapsed-seconds" && decimal === ",") line = line.replace(".", ",");
    for (let k = 0; k < columns.length; k++) line += delimiter + columns[k][i];
    lines.push(line);
  }
  const text = lines.join(eol) + eol;
  if (dialect.encoding === "windows-1252") return encodeWindows1252(text);
  const utf8 = new TextEncoder().encode(text);
  if (dialect.encoding !== "utf-8-bom") return utf8;
  const withBom = new Uint8Array(utf8.length + 3);
  withBom.set([0xef, 0xbb, 0xbf]);
  withBom.set(utf8, 3);
  return withBom;
}
