"use server";

import { revalidatePath } from "next/cache";
import { formAction } from "@/lib/actions";
import { AppError } from "@/lib/errors";
import { SteamRangeError } from "@/lib/steam";
import { airLeakageSchema, bowieDickSchema, drynessSchema, nonCondensableGasSchema, superheatSchema } from "@/lib/validations/periodic-tests";
import { recordPeriodicTest } from "@/db/queries/periodic-tests";
import { evaluateAirLeakage, evaluateBowieDick, evaluateDryness, evaluateNonCondensableGas, evaluateSuperheat } from "@/lib/periodic-tests";
import { testKindLabel, type Actor, type PeriodicTestKind } from "@/lib/domain";

/** The server recomputes every result from the raw readings; the preview in the form is only a preview. */
function compute<T>(field: string | ((message: string) => string), fn: () => T): T {
  try {
    return fn();
  } catch (error) {
    if (error instanceof RangeError || error instanceof SteamRangeError) {
      throw new AppError(422, error.message, typeof field === "string" ? field : field(error.message));
    }
    throw error;
  }
}

async function save(
  actor: Actor,
  input: { sterilizerId: string; performedAt: string; notes: string | null },
  kind: PeriodicTestKind,
  passed: boolean,
  measurements: Record<string, unknown>,
) {
  const saved = await recordPeriodicTest({ actor, sterilizerId: input.sterilizerId, kind, performedAt: input.performedAt, result: passed ? "pass" : "fail", measurements, notes: input.notes });
  revalidatePath("/periodic-tests");
  revalidatePath(`/sterilizers/${input.sterilizerId}`);
  revalidatePath("/");
  return `${testKindLabel(kind)} for ${saved.sterilizerName} recorded: ${passed ? "PASS" : "FAIL"}.${passed ? "" : " Take the sterilizer out of use until the cause is found and a repeat test passes."}`;
}

export const recordAirLeakageAction = formAction("periodic-test:record", airLeakageSchema, async (input, actor) => {
  const r = compute((m) => (/^p[123]/.test(m) ? m.slice(0, 2) : "p3"), () => evaluateAirLeakage({ p1: input.p1, p2: input.p2, p3: input.p3, unit: input.unit }));
  return save(actor, input, "air-leakage", r.passed, {
    unit: input.unit,
    p1: input.p1,
    p2: input.p2,
    p3: input.p3,
    p1Kpa: r.p1Kpa,
    p2Kpa: r.p2Kpa,
    p3Kpa: r.p3Kpa,
    leakRateKpaPerMin: r.leakRateKpaPerMin,
    stabilisationRiseKpa: r.stabilisationRiseKpa,
    condensateSuspected: r.condensateSuspected,
    limitKpaPerMin: r.limitKpaPerMin,
    warnings: r.warnings,
    basis: r.basis,
  });
});

export const recordBowieDickAction = formAction("periodic-test:record", bowieDickSchema, async (input, actor) => {
  const r = evaluateBowieDick(input.outcome);
  return save(actor, input, "bowie-dick", r.passed, { indicator: input.outcome === "uniform" ? "uniform change" : "non-uniform change", indicatorLot: input.indicatorLot, basis: r.basis });
});

export const recordNonCondensableGasAction = formAction("periodic-test:record", nonCondensableGasSchema, async (input, actor) => {
  const r = compute("condensateVolumeMl", () => evaluateNonCondensableGas(input));
  return save(actor, input, "steam-non-condensable-gas", r.passed, {
    gasVolumeMl: input.gasVolumeMl,
    condensateVolumeMl: input.condensateVolumeMl,
    percent: r.percent,
    limitPercent: r.limitPercent,
    basis: r.basis,
  });
});

export const recordSuperheatAction = formAction("periodic-test:record", superheatSchema, async (input, actor) => {
  const atmosphere = input.atmosphereSource === "pressure" ? { kind: "pressure" as const, atmosphereKpa: input.atmosphereKpa! } : { kind: "altitude" as const, altitudeM: input.altitudeM! };
  const r = compute(input.atmosphereSource === "pressure" ? "atmosphereKpa" : "altitudeM", () => evaluateSuperheat({ expansionTempC: input.expansionTempC, atmosphere }));
  return save(actor, input, "steam-superheat", r.passed, {
    expansionTempC: input.expansionTempC,
    atmosphereSource: input.atmosphereSource,
    atmosphereKpa: r.atmosphereKpa,
    altitudeM: input.atmosphereSource === "altitude" ? input.altitudeM : null,
    boilingPointC: r.boilingPointC,
    superheatK: r.superheatK,
    limitK: r.limitK,
    warnings: r.warnings,
    basis: r.basis,
  });
});

export const recordDrynessAction = formAction("periodic-test:record", drynessSchema, async (input, actor) => {
  const fieldOf = (message: string) =>
    /condensate mass/.test(message) ? "condensateMassKg" : /water mass/.test(message) ? "waterMassKg" : /steam temperature/.test(message) ? "steamTempC" : "finalWaterTempC";
  const r = compute(fieldOf, () => evaluateDryness(input));
  return save(actor, input, "steam-dryness", r.passed, {
    initialWaterTempC: input.initialWaterTempC,
    finalWaterTempC: input.finalWaterTempC,
    waterMassKg: input.waterMassKg,
    condensateMassKg: input.condensateMassKg,
    steamTempC: input.steamTempC,
    load: input.load,
    dryness: r.dryness,
    liquidEnthalpyKjPerKg: r.liquidEnthalpyKjPerKg,
    latentHeatKjPerKg: r.latentHeatKjPerKg,
    limit: r.limit,
    aboveOne: r.aboveOne,
    warnings: r.warnings,
    basis: r.basis,
  });
});
