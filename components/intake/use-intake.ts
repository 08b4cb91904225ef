"use client";

import { useCallback, useRef, useState, useSyncExternalStore, type FormEvent } from "react";
import { useRouter } from "next/navigation";
import type { CreateCycleResponse } from "@/lib/cycles/contracts";
import { RequestError, uploadJson } from "@/lib/client/fetch-json";
import { FIELD_NAMES, cycleForm, draftProblems, hasProblems, type IntakeDraft, type IntakeInstrument, type IntakeSterilizer } from "./intake-request";
import { useCycleFields } from "./use-cycle-fields";
import { problemText, useLoggerFiles, type Busy } from "./use-logger-files";
import { intakeSheetProblems, sendIntakeSheet } from "@/components/bowie-dick/intake-sheet";

/** The message above the form; it takes the keyboard focus when it appears, so it is read out. */
function useErrorSummary() {
  const [message, setMessage] = useState<string | null>(null);
  const ref = useRef<HTMLDivElement>(null);
  const clear = useCallback(() => setMessage(null), []);
  const show = useCallback((text: string) => {
    setMessage(text);
    requestAnimationFrame(() => ref.current?.focus());
  }, []);
  return { message, ref, clear, show };
}

const noSubscription = () => () => {};

/** Set once the form is interactive (hydrated); browser tests wait for it. */
function useHydrated(): boolean {
  return useSyncExternalStore(
    noSubscription,
    () => true,
    () => false,
  );
}

/** Everything the intake form does: files and their mapping, the cycle's details, and the analysis request. */
export function useIntake({ sterilizers, instruments }: { sterilizers: readonly IntakeSterilizer[]; instruments: readonly IntakeInstrument[] }) {
  const router = useRouter();
  const ready = useHydrated();
  const [busy, setBusy] = useState<Busy>(null);
  const summary = useErrorSummary();
  const [sheetErrors, setSheetErrors] = useState<Record<string, string>>({});
  const logger = useLoggerFiles({ instruments, setBusy, onEdit: summary.clear });
  const details = useCycleFields({ sterilizers, instruments, onEdit: summary.clear });
  const instrumentId = details.fields.instrumentId;

  function chooseInstrument(id: string) {
    if (details.chooseInstrument(id)) logger.applySavedMapping(id);
  }

  /** Puts the server's refusal where it belongs: beside a field, under the columns, or on top. */
  function showRefusal(error: unknown) {
    const field = error instanceof RequestError ? error.field : undefined;
    if (field && FIELD_NAMES.includes(field)) {
      details.setFieldErrors({ [field]: problemText(error) });
      summary.show("The server could not accept one of the details; it is marked below.");
    } else if (field === "mapping") {
      logger.setMappingErrors([problemText(error)]);
      summary.show("The server could not apply the column mapping; see the columns below.");
    } else {
      summary.show(problemText(error));
    }
  }

  async function analyse(event: FormEvent<HTMLFormElement>) {
    event.preventDefault();
    summary.clear();
    const formElement = event.currentTarget;
    const bowieDick = details.fields.testKind === "bowie-dick";
    const sheetProblems = bowieDick ? intakeSheetProblems(formElement) : {};
    setSheetErrors(sheetProblems);
    const { files, inspect, columns, referenceColumn, freeSpaceColumn, placements } = logger;
    const draft: IntakeDraft = { files, inspect, columns, referenceColumn, freeSpaceColumn, placements, fields: details.fields, saveMapping: details.saveMapping };
    const problems = draftProblems(draft);
    details.setFieldErrors(problems.fieldErrors);
    logger.setMappingErrors(problems.mappingErrors);
    logger.setPressureReferenceError(problems.pressureReferenceError);
    if (problems.fileError) logger.setFileError(problems.fileError);
    if (hasProblems(problems) || Object.keys(sheetProblems).length > 0) {
      summary.show("Some details need attention before the cycle can be analysed; they are marked below.");
      return;
    }
    const controller = new AbortController();
    try {
      const created = await uploadJson<CreateCycleResponse>("/api/cycles", cycleForm(draft), {
        what: "the upload",
        signal: controller.signal,
        onProgress: (progress) => setBusy({ label: "Analysing", progress, cancel: () => controller.abort() }),
      });
      // A refused sheet still opens the record: the cycle is saved and its page asks for the sheet again.
      if (bowieDick) await sendIntakeSheet(created.id, formElement);
      setBusy({ label: "Opening the record", progress: { stage: "processing" }, cancel: () => {} });
      router.push(`/cycles/${created.id}`);
    } catch (error) {
      setBusy(null);
      showRefusal(error);
    }
  }

  return {
    ready,
    busy,
    summary,
    logger,
    details,
    sheetErrors,
    chooseInstrument,
    addFiles: (added: File[]) => logger.addFiles(added, instrumentId),
    removeFile: (index: number) => logger.removeFile(index, instrumentId),
    analyse,
  };
}
