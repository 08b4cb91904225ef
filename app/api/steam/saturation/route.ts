import { NextResponse } from "next/server";
import { requireRole } from "@/lib/auth/guards";
import { AppError } from "@/lib/errors";
import { route } from "@/lib/http";
import { saturationFor, type SaturationQuery } from "@/lib/services/steam";

export const runtime = "nodejs";
export const dynamic = "force-dynamic";

function readNumber(params: URLSearchParams, name: string, what: string, example: string): number | undefined {
  const raw = params.get(name);
  if (raw === null) return undefined;
  const text = raw.trim();
  const value = Number(text);
  if (text === "") throw new AppError(400, `Enter ${what.toLowerCase()}, for example ${example}.`, name);
  if (!Number.isFinite(value)) throw new AppError(400, `${what} "${raw}" is not a number; write it in figures with a decimal point, for example ${example}.`, name);
  return value;
}

function readGauge(params: URLSearchParams): boolean | undefined {
  const raw = params.get("gauge");
  if (raw === null || raw === "") return undefined;
  const t = raw.trim().toLowerCase();
  if (t === "true" || t === "1" || t === "yes") return true;
  if (t === "false" || t === "0" || t === "no") return false;
  throw new AppError(400, `Say whether the pressure is gauge (above the atmosphere) or absolute; "${raw}" is neither.`, "gauge");
}

function readAtmosphere(params: URLSearchParams): Pick<SaturationQuery, "atmosphereKpa" | "altitudeM"> {
  const atmosphere = readNumber(params, "atmosphere", "The atmospheric pressure", "101.325");
  const altitude = readNumber(params, "altitude", "The altitude", "250");
  if (atmosphere !== undefined && altitude !== undefined) {
    throw new AppError(400, "Give either the atmospheric pressure (kPa) or the altitude (m), not both.", "atmosphere");
  }
  // Sea-level records are about 108 kPa; the summit of Everest about 34 kPa.
  if (atmosphere !== undefined && (atmosphere < 20 || atmosphere > 120)) {
    throw new AppError(400, `An atmospheric pressure of ${atmosphere} kPa is not plausible; enter the site's barometric pressure in kPa absolute (20 to 120).`, "atmosphere");
  }
  if (altitude !== undefined && (altitude < -500 || altitude > 9000)) {
    throw new AppError(400, `An altitude of ${altitude} m is outside what the calculator accepts (−500 m to 9000 m above sea level).`, "altitude");
  }
  return { atmosphereKpa: atmosphere, altitudeM: altitude };
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
    throw new AppError(400, "Give a temperature (for example 134 °C) or a pressure (for example 304.2 kPa).");
  }
  if (temperature !== undefined && pressure !== undefined) {
    throw new AppError(400, "Give either a temperature or a pressure, not both: the calculator works out the other one.");
  }
  const gauge = readGauge(params);
  const query: SaturationQuery = { temperature, pressure, gauge, unitText: params.get("unit")?.trim() ?? "", ...readAtmosphere(params) };
  return NextResponse.json(await saturationFor({ actor, query }));
});
