"use server";

import { revalidatePath } from "next/cache";
import { formAction } from "@/lib/actions";
import { airLeakageSchema, bowieDickSchema, drynessSchema, nonCondensableGasSchema, superheatSchema } from "@/lib/validations/periodic-tests";
import { recordAirLeakage, recordBowieDick, recordDryness, recordNonCondensableGas, recordSuperheat, type RecordedTest } from "@/lib/services/periodic-test-records";
import { testKindLabel, type RecordableKind } from "@/lib/domain";

function saved(kind: RecordableKind, sterilizerId: string, { sterilizerName, passed }: RecordedTest) {
  revalidatePath("/periodic-tests");
  revalidatePath("/review");
  revalidatePath(`/sterilizers/${sterilizerId}`);
  revalidatePath("/");
  return `${testKindLabel(kind)} for ${sterilizerName} recorded: ${passed ? "PASS" : "FAIL"}. It counts once an engineer has signed it.${passed ? "" : " Take the sterilizer out of use until the cause is found and a repeat test passes."}`;
}

export const recordAirLeakageAction = formAction("periodic-test:record", airLeakageSchema, async (input, actor) => saved("air-leakage", input.sterilizerId, await recordAirLeakage({ actor, input })));

export const recordBowieDickAction = formAction("periodic-test:record", bowieDickSchema, async (input, actor) => saved(input.kind, input.sterilizerId, await recordBowieDick({ actor, input })));

export const recordNonCondensableGasAction = formAction("periodic-test:record", nonCondensableGasSchema, async (input, actor) =>
  saved("steam-non-condensable-gas", input.sterilizerId, await recordNonCondensableGas({ actor, input })),
);

export const recordSuperheatAction = formAction("periodic-test:record", superheatSchema, async (input, actor) => saved("steam-superheat", input.sterilizerId, await recordSuperheat({ actor, input })));

export const recordDrynessAction = formAction("periodic-test:record", drynessSchema, async (input, actor) => saved("steam-dryness", input.sterilizerId, await recordDryness({ actor, input })));
