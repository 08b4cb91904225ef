"use client";

import { useState } from "react";
import type { InspectResponse } from "@/lib/cycles/contracts";
import { RequestError, uploadJson, type UploadProgress } from "@/lib/client/fetch-json";
import type { EditableColumn } from "@/lib/validations/intake";
import { changeColumn, settleFreeSpace, settleReference, type MappedColumn, type RoleChoice } from "./mapping-table";
import { columnsFrom, initialPlacements, inspectForm, type IntakeInstrument } from "./intake-request";
import type { ChannelPlacement, ChannelPlacements } from "@/lib/domain";

export const MAX_FILES = 10;

export type Busy = { label: "Reading the file" | "Analysing" | "Opening the record"; progress: UploadProgress; cancel: () => void } | null;

/** A failed request as the sentence to show; a cancelled upload says so. */
export function problemText(error: unknown): string {
  if (error instanceof DOMException && error.name === "AbortError") return "The upload was cancelled; nothing was saved.";
  if (error instanceof RequestError) return error.message;
  return "The request failed unexpectedly. Nothing was saved; please try again.";
}

type Options = {
  instruments: readonly IntakeInstrument[];
  setBusy: (busy: Busy) => void;
  /** called whenever the user changes something, so that a stale error summary goes away */
  onEdit: () => void;
};

/**
 * The files of the cycle and the column mapping of the first one: the server reads that file
 * (with the instrument's saved mapping when there is one) and the user confirms or corrects its
 * guess column by column.
 */
export function useLoggerFiles({ instruments, setBusy, onEdit }: Options) {
  const [files, setFiles] = useState<File[]>([]);
  const [rejections, setRejections] = useState<string[]>([]);
  const [inspect, setInspect] = useState<InspectResponse | null>(null);
  const [columns, setColumns] = useState<MappedColumn[]>([]);
  const [referenceColumn, setReferenceColumn] = useState<string | null>(null);
  const [freeSpaceColumn, setFreeSpaceColumn] = useState<string | null>(null);
  const [placements, setPlacements] = useState<ChannelPlacements>({});
  const [pressureReferenceError, setPressureReferenceError] = useState<string | null>(null);
  const [mappingNotice, setMappingNotice] = useState<string | null>(null);
  const [fileError, setFileError] = useState<string | null>(null);
  const [mappingErrors, setMappingErrors] = useState<string[]>([]);

  const instrumentName = (id: string, otherwise: string) => instruments.find((i) => i.id === id)?.name ?? otherwise;

  async function readFile(file: File, instrumentId: string): Promise<{ body: InspectResponse; notice: string | null }> {
    const controller = new AbortController();
    const run = (withInstrument: string) =>
      uploadJson<InspectResponse>("/api/logger-files/inspect", inspectForm(file, withInstrument), {
        what: "the upload",
        signal: controller.signal,
        onProgress: (progress) => setBusy({ label: "Reading the file", progress, cancel: () => controller.abort() }),
      });
    try {
      const body = await run(instrumentId);
      const notice = body.savedMapping ? `The mapping saved for ${instrumentName(instrumentId, "the instrument")} was applied. Check it against the preview.` : null;
      return { body, notice };
    } catch (error) {
      // The instrument's saved mapping may name columns this file does not have.
      if (!(error instanceof RequestError && error.status === 422 && instrumentId)) throw error;
      const body = await run("");
      return { body, notice: `The mapping saved for ${instrumentName(instrumentId, "this instrument")} does not fit this file (${error.message}). The guessed mapping is shown instead.` };
    }
  }

  async function inspectFile(file: File, instrumentId: string, options: { keepOnFailure: boolean }) {
    setFileError(null);
    onEdit();
    try {
      const { body, notice } = await readFile(file, instrumentId);
      const next = columnsFrom(body);
      const reference = body.referenceColumn ?? settleReference(next, null, body.freeSpaceColumn);
      setInspect(body);
      setColumns(next);
      setReferenceColumn(reference);
      setPlacements(initialPlacements(body, next, reference));
      setFreeSpaceColumn(body.freeSpaceColumn);
      setMappingErrors([]);
      setPressureReferenceError(null);
      setMappingNotice(notice);
    } catch (error) {
      if (options.keepOnFailure && inspect) setMappingNotice(problemText(error));
      else {
        setInspect(null);
        setColumns([]);
        setFileError(problemText(error));
      }
    } finally {
      setBusy(null);
    }
  }

  function addFiles(added: File[], instrumentId: string) {
    const next = [...files, ...added].slice(0, MAX_FILES);
    setFiles(next);
    if (files.length === 0 && next[0]) void inspectFile(next[0], instrumentId, { keepOnFailure: false });
  }

  function removeFile(index: number, instrumentId: string) {
    const next = files.filter((_, i) => i !== index);
    setFiles(next);
    if (index !== 0) return;
    setInspect(null);
    setColumns([]);
    setFreeSpaceColumn(null);
    setMappingNotice(null);
    setFileError(null);
    if (next[0]) void inspectFile(next[0], instrumentId, { keepOnFailure: false });
  }

  /** Reads the first file again with the chosen instrument's saved mapping; the current mapping stays if that fails. */
  function applySavedMapping(instrumentId: string) {
    if (files[0]) void inspectFile(files[0], instrumentId, { keepOnFailure: true });
  }

  function updateColumn(index: number, patch: Partial<EditableColumn>) {
    const next = changeColumn(columns, index, patch);
    const freeSpace = settleFreeSpace(next, freeSpaceColumn);
    setColumns(next);
    setFreeSpaceColumn(freeSpace);
    setReferenceColumn((r) => settleReference(next, r, freeSpace));
    setMappingErrors([]);
    if (patch.gauge !== undefined) setPressureReferenceError(null);
    onEdit();
  }

  function chooseReference(header: string) {
    setReferenceColumn(header);
    // The reference channel is the drain probe unless the user has placed it elsewhere.
    setPlacements((p) => (Object.hasOwn(p, header) ? p : { ...p, [header]: { position: "reference-drain" } }));
    setMappingErrors([]);
  }

  function placeChannel(header: string, next: ChannelPlacement | undefined) {
    setPlacements((p) => {
      const { [header]: _old, ...rest } = p;
      return next ? { ...rest, [header]: next } : rest;
    });
    onEdit();
  }

  /** A column's role from the table; "free-space" makes it a temperature column and the one free-space sensor. */
  function chooseRole(index: number, role: RoleChoice) {
    const column = columns.find((c) => c.index === index);
    if (!column) return;
    const next = role === "free-space" ? (column.role === "temperature" ? columns : changeColumn(columns, index, { role: "temperature" })) : changeColumn(columns, index, { role });
    const wasFreeSpace = column.header === freeSpaceColumn;
    const freeSpace = role === "free-space" ? column.header : wasFreeSpace ? null : settleFreeSpace(next, freeSpaceColumn);
    setColumns(next);
    setFreeSpaceColumn(freeSpace);
    setReferenceColumn((r) => settleReference(next, r, freeSpace));
    setMappingErrors([]);
    setPressureReferenceError(null);
    onEdit();
  }

  return {
    files,
    rejections,
    setRejections,
    inspect,
    columns,
    referenceColumn,
    freeSpaceColumn,
    placements,
    placeChannel,
    pressureReferenceError,
    setPressureReferenceError,
    mappingNotice,
    fileError,
    setFileError,
    mappingErrors,
    setMappingErrors,
    addFiles,
    removeFile,
    applySavedMapping,
    updateColumn,
    chooseReference,
    chooseRole,
  };
}

export type LoggerFiles = ReturnType<typeof useLoggerFiles>;
