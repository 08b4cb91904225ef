import { NextResponse } from "next/server";
import { requireRole } from "@/lib/auth/guards";
import { AppError } from "@/lib/errors";
import { route } from "@/lib/http";
import { getSiteById } from "@/db/queries/sites";
import {
  PRESSURE_UNITS,
  STANDARD_ATMOSPHERE_KPA,
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
import type { Actor } from "@/lib/domain";

export const runtime = "nodejs";
export const dynamic = "force-dynamic";

type AtmosphereSource = "request" | "altitude" | "site" | "site-altitude" | "standard";

function readNumber(params: URLSearchParams, name: string, what: string, example: string): number | undefined {
  const raw = params.get(name);
  if (raw === null) return undefined;
  const text = raw.trim();
  const value = Number(text);
  if (text === "" || !Number.isFinite(value)) {
    throw new AppError(400, `${what} "${raw}" is not a number; write it with a decimal point, for example ${name}=${example}.`, name);
  }
  return value;
}

function readGauge(params: URLSearchParams): boolean | undefined {
  const raw = params.get("gauge");
  if (raw === null || raw === "") return undefined;
  const t = raw.trim().toLowerCase();
  if (t === "true" || t === "1" || t === "yes") return true;
  if (t === "false" || t === "0" || t === "no") return false;
  throw new AppError(400, `gauge must be true (pressure above atmosphere) or false (absolute pressure), not "${raw}".`, "gauge");
}

async function atmosphereFor(params: URLSearchParams, actor: Actor): Promise<{ atmosphereKpa: number; atmosphereSource: AtmosphereSource; altitudeM: number | null }> {
  const atmosphere = readNumber(params, "atmosphere", "The atmospheric pressure", "101.325");
  const altitude = readNumber(params, "altitude", "The altitude", "250");
  if (atmosphere !== undefined && altitude !== undefined) {
    throw new AppError(400, "Give either the atmospheric pressure (atmosphere, kPa) or the altitude (altitude, m), not both.", "atmosphere");
  }
  if (atmosphere !== undefined) {
    // Sea-level records are about 108 kPa; the summit of Everest about 34 kPa.
    if (atmosphere < 20 || atmosphere > 120) {
      throw new AppError(400, `An atmospheric pressure of ${atmosphere} kPa is not plausible; enter the site's barometric pressure in kPa absolute (20 to 120).`, "atmosphere");
    }
    return { atmosphereKpa: atmosphere, atmosphereSource: "request", altitudeM: null };
  }
  if (altitude !== undefined) {
    if (altitude < -500 || altitude > 9000) {
      throw new AppError(400, `An altitude of ${altitude} m is outside what the calculator accepts (−500 m to 9000 m above sea level).`, "altitude");
    }
    return { atmosphereKpa: atmosphereAtAltitudeKpa(altitude), atmosphereSource: "altitude", altitudeM: altitude };
  }
  const site = actor.siteId ? await getSiteById({ id: actor.siteId }) : undefined;
  if (site?.atmosphereKpa != null) return { atmosphereKpa: site.atmosphereKpa, atmosphereSource: "site", altitudeM: site.altitudeM ?? null };
  if (site?.altitudeM != null) return { atmosphereKpa: atmosphereAtAltitudeKpa(site.altitudeM), atmosphereSource: "site-altitude", altitudeM: site.altitudeM };
  return { atmosphereKpa: STANDARD_ATMOSPHERE_KPA, atmosphereSource: "standard", altitudeM: null };
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

/**
 * Saturated steam, IAPWS-IF97 region 4 both ways:
 * ?temperature=134&unit=C → the saturation pressure; ?pressure=2.04&unit=bar&gauge=true → the
 * saturation temperature. Gauge readings are made absolute with the atmosphere given, the one
 * at the altitude given, or the site's.
 */
export const GET = route(async (request: Request) => {
  const actor = await requireRole("steam:calculate", "use the steam calculator");
  const params = new URL(request.url).searchParams;
  const temperature = readNumber(params, "temperature", "The temperature", "134");
  const pressure = readNumber(params, "pressure", "The pressure", "304.2");
  if (temperature === undefined && pressure === undefined) {
    throw new AppError(400, "Give a temperature (temperature=134&unit=C) or a pressure (pressure=304.2&unit=kPa).");
  }
  if (temperature !== undefined && pressure !== undefined) {
    throw new AppError(400, "Give either a temperature or a pressure, not both: the calculator works out the other one.");
  }
  const gaugeParam = readGauge(params);
  const { atmosphereKpa, atmosphereSource, altitudeM } = await atmosphereFor(params, actor);
  const unitText = params.get("unit")?.trim() ?? "";

  try {
    if (temperature !== undefined) {
      const unit: TemperatureUnit | null = unitText === "" ? "C" : parseTemperatureUnit(unitText);
      if (!unit) throw new AppError(400, `"${unitText}" is not a temperature unit; use unit=C, F or K.`, "unit");
      if (gaugeParam !== undefined) throw new AppError(400, "gauge applies to a pressure, not to a temperature.", "gauge");
      const temperatureC = toCelsius(temperature, unit);
      const pressureKpaAbs = saturationPressureKpa(temperatureC);
      return NextResponse.json(answer({ quantity: "temperature", value: temperature, unit }, temperatureC, pressureKpaAbs, atmosphereKpa, atmosphereSource, altitudeM));
    }
    const label = unitText === "" ? { unit: "kPa" as PressureUnit, gauge: null } : parsePressureLabel(unitText);
    if (!label) throw new AppError(400, `"${unitText}" is not a pressure unit; use unit=${PRESSURE_UNITS.join(", ")}.`, "unit");
    if (label.gauge !== null && gaugeParam !== undefined && label.gauge !== gaugeParam) {
      throw new AppError(400, `The unit "${unitText}" says ${label.gauge ? "gauge" : "absolute"} but gauge=${gaugeParam}; give one or the other.`, "gauge");
    }
    const gauge = gaugeParam ?? label.gauge ?? false;
    const pressureKpaAbs = toAbsoluteKpa(pressure!, label.unit, { gauge, atmosphereKpa });
    const temperatureC = saturationTemperatureC(pressureKpaAbs);
    return NextResponse.json(
      answer({ quantity: "pressure", value: pressure!, unit: label.unit, gauge }, temperatureC, pressureKpaAbs, atmosphereKpa, atmosphereSource, altitudeM),
    );
  } catch (error) {
    if (error instanceof SteamRangeError) throw new AppError(422, `${error.message}.`.replace(/\.\.$/, "."));
    throw error;
  }
});

function answer(
  input: { quantity: "temperature" | "pressure"; value: number; unit: string; gauge?: boolean },
  temperatureC: number,
  pressureKpaAbs: number,
  atmosphereKpa: number,
  atmosphereSource: AtmosphereSource,
  altitudeM: number | null,
) {
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
