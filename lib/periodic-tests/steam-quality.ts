import { atmosphereAtAltitudeKpa, latentHeat, saturatedLiquidEnthalpy, saturationTemperatureC } from "@/lib/steam";
import { atLeast, atMost, DRYNESS, NON_CONDENSABLE_GAS, SUPERHEAT } from "./limits";

export type NonCondensableGasResult = { percent: number; limitPercent: number; passed: boolean; basis: string };

/** NCG % = 100 · V_g / V_c (gas collected in the burette per condensate collected). */
export function evaluateNonCondensableGas({ gasVolumeMl, condensateVolumeMl }: { gasVolumeMl: number; condensateVolumeMl: number }): NonCondensableGasResult {
  if (!(condensateVolumeMl > 0)) throw new RangeError("The condensate volume must be more than 0 ml.");
  if (gasVolumeMl < 0) throw new RangeError("The gas volume cannot be negative.");
  const percent = (100 * gasVolumeMl) / condensateVolumeMl;
  return { percent, limitPercent: NON_CONDENSABLE_GAS.maxPercent, passed: atMost(percent, NON_CONDENSABLE_GAS.maxPercent), basis: NON_CONDENSABLE_GAS.basis };
}

export type AtmosphereSource = { kind: "pressure"; atmosphereKpa: number } | { kind: "altitude"; altitudeM: number };

export type SuperheatResult = {
  atmosphereKpa: number;
  boilingPointC: number;
  superheatK: number;
  limitK: number;
  /** the expansion temperature at which the limit is reached */
  limitTemperatureC: number;
  passed: boolean;
  warnings: string[];
  basis: string;
};

/** Superheat = T_expansion − T_boil(local atmospheric pressure), the boiling point from IF97 region 4. */
export function evaluateSuperheat({ expansionTempC, atmosphere }: { expansionTempC: number; atmosphere: AtmosphereSource }): SuperheatResult {
  const atmosphereKpa = atmosphere.kind === "pressure" ? atmosphere.atmosphereKpa : atmosphereAtAltitudeKpa(atmosphere.altitudeM);
  if (!(atmosphereKpa >= 30 && atmosphereKpa <= 110)) {
    throw new RangeError(`An atmospheric pressure of ${atmosphereKpa.toFixed(2)} kPa is outside the range met on Earth's surface (30–110 kPa).`);
  }
  const boilingPointC = saturationTemperatureC(atmosphereKpa);
  const superheatK = expansionTempC - boilingPointC;
  const warnings: string[] = [];
  if (superheatK < 0) {
    warnings.push("The expansion temperature is below the local boiling point: the sensor may not have been in the steam flow, or the reading is wrong.");
  }
  return {
    atmosphereKpa,
    boilingPointC,
    superheatK,
    limitK: SUPERHEAT.maxK,
    limitTemperatureC: boilingPointC + SUPERHEAT.maxK,
    passed: atMost(superheatK, SUPERHEAT.maxK),
    warnings,
    basis: SUPERHEAT.basis,
  };
}

export type DrynessInput = {
  /** initial water temperature in the flask, °C */
  initialWaterTempC: number;
  /** final temperature of water + condensate, °C */
  finalWaterTempC: number;
  /** water initially in the flask, kg */
  waterMassKg: number;
  /** condensate collected, kg */
  condensateMassKg: number;
  /** average steam temperature in the supply pipe during sampling, °C */
  steamTempC: number;
  load: "metal" | "other";
};

export type DrynessResult = {
  dryness: number;
  liquidEnthalpyKjPerKg: number;
  latentHeatKjPerKg: number;
  limit: number;
  passed: boolean;
  /** D > 1 cannot be real wet steam: superheat or a measurement error */
  aboveOne: boolean;
  warnings: string[];
  basis: string;
};

/**
 * Calorimetric dryness value (EN 285 / HTM 2010; DOMAIN.md §2.8):
 * D = [ (T1 − T0)·(4.18·m_w + 0.24) / m_c + 4.18·T1 − h_s ] / L, with h_s and L at T_s from IF97.
 */
export function evaluateDryness(input: DrynessInput): DrynessResult {
  const { initialWaterTempC: t0, finalWaterTempC: t1, waterMassKg: mw, condensateMassKg: mc, steamTempC } = input;
  if (!(mc > 0)) throw new RangeError("The condensate mass must be more than 0 kg.");
  if (!(mw > 0)) throw new RangeError("The water mass must be more than 0 kg.");
  if (!(t1 > t0)) throw new RangeError("The final water temperature must be above the initial one: the steam has to warm the water.");
  if (!(steamTempC > t1)) throw new RangeError("The steam temperature must be above the final water temperature.");
  const hs = saturatedLiquidEnthalpy(steamTempC);
  const latent = latentHeat(steamTempC);
  const cw = DRYNESS.waterHeatCapacity;
  const dryness = (((t1 - t0) * (cw * mw + DRYNESS.flaskHeatCapacity)) / mc + cw * t1 - hs) / latent;
  const limit = input.load === "metal" ? DRYNESS.minMetal : DRYNESS.minOther;
  const aboveOne = dryness > 1;
  const warnings: string[] = [];
  if (aboveOne) {
    warnings.push(
      `A dryness value above 1 (${dryness.toFixed(3)}) is not possible for wet steam: it means superheated steam or a measurement error (masses, temperatures). Check the readings and the superheat test.`,
    );
  }
  return { dryness, liquidEnthalpyKjPerKg: hs, latentHeatKjPerKg: latent, limit, passed: atLeast(dryness, limit) && !aboveOne, aboveOne, warnings, basis: DRYNESS.basis };
}
