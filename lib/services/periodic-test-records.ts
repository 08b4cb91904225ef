import "server-only";
import type { z } from "zod";
import type { PeriodicTestKind } from "@/db/schema";
import type { Actor } from "@/db/queries/users";
import { getSterilizerForSite } from "@/db/queries/catalog";
import { insertPeriodicTest } from "@/db/queries/periodic-tests";
import { AppError } from "@/lib/errors";
import { evaluateAirLeakage, evaluateBowieDick, evaluateDryness, evaluateNonCondensableGas, evaluateSuperheat } from "@/lib/periodic-tests";
import { SteamRangeError } from "@/lib/steam";
import type { airLeakageSchema, bowieDickSchema, drynessSchema, nonCondensableGasSchema, superheatSchema } from "@/lib/validations/periodic-tests";
import { auditActor, siteIdOf } from "./site";
import { photoAttachment, readIndicatorPhoto } from "./bowie-dick";
import type { UploadedBlob } from "@/lib/validations/periodic-tests";

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

type Common = { sterilizerId: string; performedAt: string; notes: string | null };
export type RecordedTest = { id: string; sterilizerName: string; passed: boolean };

/**
 * Records one test on an in-use sterilizer of the actor's site, audited. It waits for an
 * engineer's signature ("submitted"): only a signed result counts for the schedule and status.
 */
async function record(actor: Actor, input: Common, kind: PeriodicTestKind, passed: boolean, measurements: Record<string, unknown>, photoUpload?: UploadedBlob): Promise<RecordedTest> {
  const siteId = siteIdOf(actor);
  const sterilizer = await getSterilizerForSite({ actor, id: input.sterilizerId });
  if (!sterilizer) throw new AppError(404, "That sterilizer was not found on your site.", "sterilizerId");
  if (!sterilizer.active) throw new AppError(409, `${sterilizer.name} is retired; tests cannot be recorded for it.`, "sterilizerId");
  const photo = photoUpload ? await readIndicatorPhoto(photoUpload) : undefined;
  const { sterilizerId, performedAt, notes } = input;
  const result = passed ? "pass" : "fail";
  const created = await insertPeriodicTest({
    values: { siteId, sterilizerId, kind, performedAt, performedBy: actor.id, result, status: "submitted", measurements, notes },
    photo: photo ? photoAttachment(actor, siteId, "periodic-test", photo) : undefined,
    audit: {
      ...auditActor(actor),
      siteId,
      action: "periodic-test.record",
      newValue: { sterilizer: sterilizer.name, sterilizerId, kind, performedAt, result, status: "submitted", measurements, notes },
    },
  });
  return { id: created.id, sterilizerName: sterilizer.name, passed };
}

export async function recordAirLeakage({ actor, input }: { actor: Actor; input: z.infer<typeof airLeakageSchema> }) {
  const r = compute(
    (m) => (/^p[123]/.test(m) ? m.slice(0, 2) : "p3"),
    () => evaluateAirLeakage({ p1: input.p1, p2: input.p2, p3: input.p3, unit: input.unit }),
  );
  return record(actor, input, "air-leakage", r.passed, {
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
}

/** A Bowie-Dick test judged by its indicator sheet; the photo of the sheet is kept with its SHA-256. */
export async function recordBowieDick({ actor, input }: { actor: Actor; input: Omit<z.infer<typeof bowieDickSchema>, "kind"> & { kind?: z.infer<typeof bowieDickSchema>["kind"] } }) {
  const kind = input.kind ?? "bowie-dick";
  const r = evaluateBowieDick(input.outcome, kind);
  const measurements = { indicator: input.outcome === "uniform" ? "uniform change" : "non-uniform change", indicatorLot: input.indicatorLot, basis: r.basis };
  return record(actor, input, kind, r.passed, measurements, input.photo);
}

export async function recordNonCondensableGas({ actor, input }: { actor: Actor; input: z.infer<typeof nonCondensableGasSchema> }) {
  const r = compute("condensateVolumeMl", () => evaluateNonCondensableGas(input));
  return record(actor, input, "steam-non-condensable-gas", r.passed, {
    gasVolumeMl: input.gasVolumeMl,
    condensateVolumeMl: input.condensateVolumeMl,
    percent: r.percent,
    limitPercent: r.limitPercent,
    basis: r.basis,
  });
}

export async function recordSuperheat({ actor, input }: { actor: Actor; input: z.infer<typeof superheatSchema> }) {
  const atmosphere = input.atmosphereSource === "pressure" ? { kind: "pressure" as const, atmosphereKpa: input.atmosphereKpa! } : { kind: "altitude" as const, altitudeM: input.altitudeM! };
  const r = compute(input.atmosphereSource === "pressure" ? "atmosphereKpa" : "altitudeM", () => evaluateSuperheat({ expansionTempC: input.expansionTempC, atmosphere }));
  return record(actor, input, "steam-superheat", r.passed, {
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
}

export async function recordDryness({ actor, input }: { actor: Actor; input: z.infer<typeof drynessSchema> }) {
  const fieldOf = (message: string) =>
    /condensate mass/.test(message) ? "condensateMassKg" : /water mass/.test(message) ? "waterMassKg" : /steam temperature/.test(message) ? "steamTempC" : "finalWaterTempC";
  const r = compute(fieldOf, () => evaluateDryness(input));
  return record(actor, input, "steam-dryness", r.passed, {
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
}
