import "server-only";
import type { Actor } from "@/db/queries/users";
import { AppError } from "@/lib/errors";
import {
  PRESSURE_UNITS,
  SteamRangeError,
  atmosphereAtAltitudeKpa,
  fromAbsoluteKpa,
  fromCelsius,
  parsePressureLabel,
  parseTemperatureUnit,
  saturationPressureKpa,
  saturationTemperatureC,
  toAbsoluteKpa,
  toCelsius,
  type PressureUnit,
  type TemperatureUnit,
} from "@/lib/steam";
import { getSiteAtmosphere } from "./site";

type AtmosphereSource = "request" | "altitude" | "site" | "site-altitude" | "standard";

/** A saturation question as the route parsed it: exactly one of temperature and pressure. */
export type SaturationQuery = {
  temperature?: number;
  pressure?: number;
  unitText: string;
  gauge?: boolean;
  atmosphereKpa?: number;
  altitudeM?: number;
};

async function atmosphereFor(query: SaturationQuery, actor: Actor): Promise<{ atmosphereKpa: number; atmosphereSource: AtmosphereSource; altitudeM: number | null }> {
  if (query.atmosphereKpa !== undefined) return { atmosphereKpa: query.atmosphereKpa, atmosphereSource: "request", altitudeM: null };
  if (query.altitudeM !== undefined) return { atmosphereKpa: atmosphereAtAltitudeKpa(query.altitudeM), atmosphereSource: "altitude", altitudeM: query.altitudeM };
  const site = await getSiteAtmosphere({ actor });
  return { atmosphereKpa: site.atmosphereKpa, atmosphereSource: site.source, altitudeM: site.altitudeM };
}

function pressuresIn(pressureKpaAbs: number, atmosphereKpa: number) {
  const out = {} as Record<PressureUnit, { absolute: number; gauge: number }>;
  for (const unit of PRESSURE_UNITS) {
    out[unit] = {
      absolute: fromAbsoluteKpa(pressureKpaAbs, unit, { gauge: false }),
      gauge: fromAbsoluteKpa(pressureKpaAbs, unit, { gauge: true, atmosphereKpa }),
    };
  }
  return out;
}

type Atmosphere = Awaited<ReturnType<typeof atmosphereFor>>;

function answer(input: { quantity: "temperature" | "pressure"; value: number; unit: string; gauge?: boolean }, temperatureC: number, pressureKpaAbs: number, atmosphere: Atmosphere) {
  const { atmosphereKpa, atmosphereSource, altitudeM } = atmosphere;
  return {
    input,
    temperatureC,
    temperatureF: fromCelsius(temperatureC, "F"),
    temperatureK: fromCelsius(temperatureC, "K"),
    pressureKpaAbs,
    pressureKpaGauge: pressureKpaAbs - atmosphereKpa,
    pressureBarAbs: pressureKpaAbs / 100,
    pressurePsig: fromAbsoluteKpa(pressureKpaAbs, "psi", { gauge: true, atmosphereKpa }),
    pressurePsia: fromAbsoluteKpa(pressureKpaAbs, "psi", { gauge: false }),
    pressures: pressuresIn(pressureKpaAbs, atmosphereKpa),
    atmosphereKpa,
    atmosphereSource,
    altitudeM,
    basis: "IAPWS-IF97 region 4 (saturation line), valid from the triple point (0.01 °C, 0.611657 kPa) to the critical point (373.946 °C, 22.064 MPa)",
  };
}

/**
 * Saturated steam, IAPWS-IF97 region 4 both ways. Gauge readings are made absolute with the
 * atmosphere given, the one at the altitude given, or the actor's site's.
 */
export async function saturationFor({ actor, query }: { actor: Actor; query: SaturationQuery }) {
  const atmosphere = await atmosphereFor(query, actor);
  const { unitText, temperature, pressure } = query;
  try {
    if (temperature !== undefined) {
      const unit: TemperatureUnit | null = unitText === "" ? "C" : parseTemperatureUnit(unitText);
      if (!unit) throw new AppError(400, `"${unitText}" is not a temperature unit; choose °C, °F or K.`, "unit");
      if (query.gauge !== undefined) throw new AppError(400, "Gauge or absolute applies to a pressure, not to a temperature.", "gauge");
      const temperatureC = toCelsius(temperature, unit);
      return answer({ quantity: "temperature", value: temperature, unit }, temperatureC, saturationPressureKpa(temperatureC), atmosphere);
    }
    const label = unitText === "" ? { unit: "kPa" as PressureUnit, gauge: null } : parsePressureLabel(unitText);
    if (!label) throw new AppError(400, `"${unitText}" is not a pressure unit; choose one of ${PRESSURE_UNITS.join(", ")}.`, "unit");
    if (label.gauge !== null && query.gauge !== undefined && label.gauge !== query.gauge) {
      throw new AppError(400, `The unit "${unitText}" says ${label.gauge ? "gauge" : "absolute"} but the pressure was marked ${query.gauge ? "gauge" : "absolute"}; give one or the other.`, "gauge");
    }
    const gauge = query.gauge ?? label.gauge ?? false;
    const pressureKpaAbs = toAbsoluteKpa(pressure!, label.unit, { gauge, atmosphereKpa: atmosphere.atmosphereKpa });
    return answer({ quantity: "pressure", value: pressure!, unit: label.unit, gauge }, saturationTemperatureC(pressureKpaAbs), pressureKpaAbs, atmosphere);
  } catch (error) {
    if (error instanceof SteamRangeError) throw new AppError(422, `${error.message}.`.replace(/\.\.$/, "."));
    throw error;
  }
}
