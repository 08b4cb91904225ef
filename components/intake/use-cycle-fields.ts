"use client";

import { useState } from "react";
import type { FieldErrors, IntakeFields, IntakeInstrument, IntakeSterilizer } from "./intake-request";

type Options = {
  sterilizers: readonly IntakeSterilizer[];
  instruments: readonly IntakeInstrument[];
  /** called whenever the user changes something, so that a stale error summary goes away */
  onEdit: () => void;
};

/** The cycle's details (sterilizer, profile, logger, number, kind of test, load) and their errors. */
export function useCycleFields({ sterilizers, instruments, onEdit }: Options) {
  const onlySterilizer = sterilizers.length === 1 ? sterilizers[0] : undefined;
  const [fields, setFields] = useState<IntakeFields>({
    sterilizerId: onlySterilizer?.id ?? "",
    profileId: onlySterilizer?.defaultProfileId ?? "",
    instrumentId: "",
    cycleNumber: "",
    loadType: "",
    loadLot: "",
    load: "",
    testKind: "thermometric-small-load",
    startedAt: "",
    leakT1: "",
    duplicateReason: "",
  });
  const [fieldErrors, setFieldErrors] = useState<FieldErrors>({});
  const [saveMapping, setSaveMapping] = useState(false);

  function setField<K extends keyof IntakeFields>(name: K, value: IntakeFields[K]) {
    setFields((f) => ({ ...f, [name]: value }));
    setFieldErrors((e) => ({ ...e, [name]: undefined }));
    onEdit();
  }

  /** A sterilizer brings its default acceptance profile along. */
  function chooseSterilizer(id: string) {
    const sterilizer = sterilizers.find((s) => s.id === id);
    setFields((f) => ({ ...f, sterilizerId: id, profileId: sterilizer?.defaultProfileId ?? f.profileId }));
    setFieldErrors((e) => ({ ...e, sterilizerId: undefined, profileId: undefined }));
    onEdit();
  }

  /** Sets the logger; returns it when it has a saved mapping to apply to the file. */
  function chooseInstrument(id: string): IntakeInstrument | undefined {
    setField("instrumentId", id);
    const chosen = instruments.find((i) => i.id === id);
    if (!chosen) setSaveMapping(false);
    return chosen?.hasSavedMapping ? chosen : undefined;
  }

  return {
    fields,
    fieldErrors,
    setFieldErrors,
    setField,
    chooseSterilizer,
    chooseInstrument,
    saveMapping,
    setSaveMapping,
    instrument: instruments.find((i) => i.id === fields.instrumentId),
    sterilizer: sterilizers.find((s) => s.id === fields.sterilizerId),
  };
}

export type CycleFields = ReturnType<typeof useCycleFields>;
