import { testKindLabel } from "@/lib/domain";

const num = (v: unknown) => (typeof v === "number" && Number.isFinite(v) ? v : null);

/** The one figure that tells a reader what a recorded test measured. */
export function keyFigure(kind: string, measurements: unknown): string {
  const m = (measurements ?? {}) as Record<string, unknown>;
  switch (kind) {
    case "air-leakage": {
      const rate = num(m.leakRateKpaPerMin);
      return rate === null ? "—" : `${rate.toFixed(3)} kPa/min (limit 0.13)`;
    }
    case "bowie-dick":
      return typeof m.indicator === "string" ? `Indicator: ${m.indicator}` : "—";
    case "steam-non-condensable-gas": {
      const p = num(m.percent);
      return p === null ? "—" : `${p.toFixed(2)} % NCG (limit 3.5 %)`;
    }
    case "steam-superheat": {
      const k = num(m.superheatK);
      return k === null ? "—" : `${k.toFixed(1)} K superheat (limit 25 K)`;
    }
    case "steam-dryness": {
      const d = num(m.dryness);
      const limit = num(m.limit);
      return d === null ? "—" : `D = ${d.toFixed(3)}${limit !== null ? ` (limit ≥ ${limit.toFixed(2)})` : ""}`;
    }
    default:
      return testKindLabel(kind);
  }
}

const LABELS: Record<string, string> = {
  unit: "Unit entered",
  p1: "p1 (start)",
  p2: "p2 (after 5 min)",
  p3: "p3 (after further 10 min)",
  p1Kpa: "p1, kPa abs",
  p2Kpa: "p2, kPa abs",
  p3Kpa: "p3, kPa abs",
  leakRateKpaPerMin: "Leak rate, kPa/min",
  stabilisationRiseKpa: "Rise during the 5 min wait, kPa",
  condensateSuspected: "Condensate suspected",
  limitKpaPerMin: "Limit, kPa/min",
  indicator: "Indicator",
  indicatorLot: "Indicator lot",
  gasVolumeMl: "Gas volume V_g, ml",
  condensateVolumeMl: "Condensate volume V_c, ml",
  percent: "Non-condensable gases, %",
  limitPercent: "Limit, %",
  expansionTempC: "Expansion temperature, °C",
  atmosphereSource: "Atmospheric pressure from",
  atmosphereKpa: "Atmospheric pressure, kPa",
  altitudeM: "Altitude, m",
  boilingPointC: "Local boiling point, °C",
  superheatK: "Superheat, K",
  limitK: "Limit, K",
  initialWaterTempC: "T0, °C",
  finalWaterTempC: "T1, °C",
  waterMassKg: "m_w, kg",
  condensateMassKg: "m_c, kg",
  steamTempC: "T_s, °C",
  load: "Load",
  dryness: "Dryness value D",
  liquidEnthalpyKjPerKg: "h_s at T_s, kJ/kg (IF97)",
  latentHeatKjPerKg: "L at T_s, kJ/kg (IF97)",
  limit: "Limit",
  aboveOne: "D above 1",
  basis: "Basis",
};

export function measurementRows(measurements: unknown): Array<[string, string]> {
  const m = (measurements ?? {}) as Record<string, unknown>;
  const rows: Array<[string, string]> = [];
  for (const [k, v] of Object.entries(m)) {
    if (v === null || v === undefined || k === "warnings") continue;
    const text = typeof v === "number" ? String(+v.toPrecision(6)) : typeof v === "boolean" ? (v ? "yes" : "no") : String(v);
    rows.push([LABELS[k] ?? k, text]);
  }
  const warnings = Array.isArray(m.warnings) ? (m.warnings as string[]) : [];
  for (const w of warnings) rows.push(["Warning", w]);
  return rows;
}
