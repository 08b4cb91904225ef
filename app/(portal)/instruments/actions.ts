"use server";

import { revalidatePath } from "next/cache";
import { formAction } from "@/lib/actions";
import { addCertificateSchema, clearMappingSchema, createInstrumentSchema } from "@/lib/validations/equipment";
import { addCalibrationCertificate, clearSavedMapping, createInstrument } from "@/lib/services/instruments";

export const createInstrumentAction = formAction("equipment:manage", createInstrumentSchema, async (input, actor) => {
  await createInstrument({ actor, input });
  revalidatePath("/instruments");
  return `${input.name} was added. Record its calibration certificate next.`;
});

export const addCertificateAction = formAction("equipment:manage", addCertificateSchema, async (input, actor) => {
  await addCalibrationCertificate({ actor, input });
  revalidatePath("/instruments");
  revalidatePath(`/instruments/${input.instrumentId}`);
  return `Certificate ${input.certificateNumber} was recorded.`;
});

export const clearMappingAction = formAction("equipment:manage", clearMappingSchema, async ({ instrumentId, reason }, actor) => {
  await clearSavedMapping({ actor, instrumentId, reason });
  revalidatePath(`/instruments/${instrumentId}`);
  revalidatePath("/instruments");
  return "The saved channel mapping was cleared. The next file from this instrument will be mapped from its headers again.";
});
