import { parsePressureLabel, parseTemperatureUnit, type PressureUnit, type TemperatureUnit } from "../steam";

export type HeaderUnit = { kind: "temperature"; unit: TemperatureUnit } | { kind: "pressure"; unit: PressureUnit; gauge: boolean | null } | null;

const BRACKETED = /[([{]([^)\]}]*)[)\]}]\s*$/;

/** Reads a unit from a header such as "TC1 (°C)", "Drain [degC]", "P_chamber_kPa_abs", "Pressure bar(g)". */
export function unitFromHeader(header: string): HeaderUnit {
  const candidates: string[] = [];
  const bracket = BRACKETED.exec(header);
  if (bracket) candidates.push(bracket[1]);
  const tokens = header
    .replace(BRACKETED, (m) => " " + m)
    .split(/[\s_/]+/)
    .filter(Boolean);
  if (tokens.length >= 2) candidates.push(tokens.slice(-2).join(" "));
  if (tokens.length >= 3) candidates.push(tokens.slice(-3).join(" "));
  if (tokens.length >= 1) candidates.push(tokens[tokens.length - 1]);
  // "Chamber (abs) kPa" and the like: the unit may sit just before a marker.
  const temperatureInline = /(°\s*[CFK]|deg\s*[CF]|℃|℉)(?![a-z])/i.exec(header);
  for (const c of candidates) {
    const t = parseTemperatureUnit(c);
    // A bare "K" or "C" token is too weak on its own unless it stood in brackets.
    if (t && (c === bracket?.[1] || c.length > 1)) return { kind: "temperature", unit: t };
    const p = parsePressureLabel(c);
    if (p) {
      const words = header.toLowerCase();
      let gauge = p.gauge;
      if (gauge === null && /\b(gauge|gage|relative|rel)\b/.test(words)) gauge = true;
      if (gauge === null && /\b(abs|absolute)\b/.test(words)) gauge = false;
      return { kind: "pressure", unit: p.unit, gauge };
    }
  }
  if (temperatureInline) {
    const t = parseTemperatureUnit(temperatureInline[1]);
    if (t) return { kind: "temperature", unit: t };
  }
  return null;
}
