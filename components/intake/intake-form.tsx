"use client";

import { useEffect, useId, useRef, useState, type FormEvent } from "react";
import { useRouter } from "next/navigation";
import type { CreateCycleResponse, InspectResponse, MappingOverrides } from "@/lib/cycles/contracts";
import { createCycleFieldsSchema, mappingProblems, type CreateCycleField } from "@/lib/validations/intake";
import { formatBytes } from "@/lib/format";
import { Panel } from "@/components/ui/panel";
import { LoggerDropzone } from "./logger-dropzone";
import { MappingTable, changeColumn, settleReference, type MappedColumn } from "./mapping-table";
import { sendForm, type SendProgress } from "./send-form";
import { formatDuration, TEST_KINDS, testKindLabel, type TestKind } from "@/lib/domain";

export type IntakeSterilizer = { id: string; name: string; serialNumber: string; chamberVolumeL: number; defaultProfileId: string | null };
export type IntakeProfile = { id: string; name: string; sterilizationTempC: number; holdingTimeS: number; bandK: number };
export type IntakeInstrument = { id: string; name: string; serialNumber: string; kind: string; hasSavedMapping: boolean };

type Fields = { sterilizerId: string; profileId: string; instrumentId: string; cycleNumber: string; load: string; testKind: TestKind };
type Busy = { label: string; progress: SendProgress; cancel: () => void } | null;

const FIELD_NAMES: readonly string[] = ["sterilizerId", "profileId", "instrumentId", "cycleNumber", "load", "testKind"];

const DELIMITER_WORDS: Record<string, string> = { ",": "comma", ";": "semicolon", "\t": "tab" };
const TIME_FORMAT_WORDS: Record<string, string> = {
  iso: "year-month-day dates",
  dmy: "day.month.year dates",
  mdy: "month/day/year dates",
  "mdy-ampm": "month/day/year dates with AM/PM",
  "dmy-ampm": "day/month/year dates with AM/PM",
  clock: "clock times",
  "elapsed-seconds": "elapsed time",
};

function columnsFrom(inspect: InspectResponse): MappedColumn[] {
  return inspect.columns.map((c) => ({ index: c.index, header: c.header, role: c.role, unit: c.unit, gauge: c.gauge, unsure: c.unsure, edited: false }));
}

/** The confirmed mapping as the server takes it: every column named, nothing left to guess. */
export function toMappingOverrides(columns: readonly MappedColumn[], referenceColumn: string | null): MappingOverrides {
  const time = columns.find((c) => c.role === "time");
  const pressure = columns.find((c) => c.role === "pressure");
  const overrides: MappingOverrides = { columns: {} };
  for (const c of columns) {
    if (c.header === "" && c.role === "ignored") continue;
    if (c.role === "temperature") overrides.columns![c.header] = { role: "temperature", unit: c.unit ?? "C" };
    else if (c.role === "pressure") overrides.columns![c.header] = { role: "pressure", unit: c.unit ?? "kPa", gauge: c.gauge };
    else if (c.role === "time") overrides.columns![c.header] = c.unit ? { role: "time", unit: c.unit } : { role: "time" };
    else overrides.columns![c.header] = { role: "ignored" };
  }
  if (time) overrides.timeColumn = time.header;
  if (pressure) {
    overrides.pressureColumn = pressure.header;
    if (pressure.unit) overrides.pressureUnit = pressure.unit as MappingOverrides["pressureUnit"];
    overrides.pressureGauge = pressure.gauge;
  }
  if (referenceColumn) overrides.referenceColumn = referenceColumn;
  return overrides;
}

function ProgressLine({ busy }: { busy: NonNullable<Busy> }) {
  const uploading = busy.progress.stage === "uploading";
  const fraction = busy.progress.stage === "uploading" ? busy.progress.fraction : 1;
  return (
    <div className="rounded-md border border-steam-100 bg-steam-50 px-4 py-3" role="status" aria-live="polite" data-testid="intake-progress">
      <div className="flex items-center justify-between gap-3 text-sm">
        <span className="font-medium text-steam-700">
          {uploading ? `Uploading… ${Math.round(fraction * 100)} %` : busy.label === "Reading the file" ? "Reading the file…" : busy.label === "Opening the record" ? "Analysed. Opening the record…" : "Analysing…"}
        </span>
        {uploading && (
          <button type="button" className="text-xs text-steam-700 underline" onClick={busy.cancel}>
            Cancel
          </button>
        )}
      </div>
      <div className="mt-2 h-1.5 overflow-hidden rounded-full bg-steam-100" aria-hidden="true">
        <div
          className={`h-full rounded-full bg-steam-500 transition-[width] ${uploading ? "" : "animate-pulse"}`}
          style={{ width: `${Math.max(3, Math.round(fraction * 100))}%` }}
        />
      </div>
      {!uploading && busy.label === "Analysing" && <p className="mt-1 text-xs text-ink-muted">The server is checking every sample; a day-long file takes a few seconds.</p>}
    </div>
  );
}

export function IntakeForm({
  sterilizers,
  profiles,
  instruments,
  limitMb,
}: {
  sterilizers: IntakeSterilizer[];
  profiles: IntakeProfile[];
  instruments: IntakeInstrument[];
  limitMb: number;
}) {
  const ids = useId();
  const router = useRouter();
  const [files, setFiles] = useState<File[]>([]);
  const [rejections, setRejections] = useState<string[]>([]);
  const [inspect, setInspect] = useState<InspectResponse | null>(null);
  const [columns, setColumns] = useState<MappedColumn[]>([]);
  const [referenceColumn, setReferenceColumn] = useState<string | null>(null);
  const [mappingNotice, setMappingNotice] = useState<string | null>(null);
  const [busy, setBusy] = useState<Busy>(null);
  const [topError, setTopError] = useState<string | null>(null);
  const [fileError, setFileError] = useState<string | null>(null);
  const [fieldErrors, setFieldErrors] = useState<Partial<Record<CreateCycleField, string>>>({});
  const [mappingErrors, setMappingErrors] = useState<string[]>([]);
  const [saveMapping, setSaveMapping] = useState(false);
  const errorSummary = useRef<HTMLDivElement>(null);
  // Set once the form is interactive (hydrated); browser tests wait for it.
  const [ready, setReady] = useState(false);
  useEffect(() => setReady(true), []);

  const firstSterilizer = sterilizers.length === 1 ? sterilizers[0] : undefined;
  const [fields, setFields] = useState<Fields>({
    sterilizerId: firstSterilizer?.id ?? "",
    profileId: firstSterilizer?.defaultProfileId ?? "",
    instrumentId: "",
    cycleNumber: "",
    load: "",
    testKind: "thermometric-small-load",
  });

  const instrument = instruments.find((i) => i.id === fields.instrumentId);
  const profile = profiles.find((p) => p.id === fields.profileId);

  function setField<K extends keyof Fields>(name: K, value: Fields[K]) {
    setFields((f) => ({ ...f, [name]: value }));
    setFieldErrors((e) => ({ ...e, [name]: undefined }));
    setTopError(null);
  }

  async function inspectFile(file: File, instrumentId: string, options: { keepOnFailure: boolean }) {
    const controller = new AbortController();
    const run = (withInstrument: string) => {
      const form = new FormData();
      form.append("file", file);
      if (withInstrument) form.append("instrumentId", withInstrument);
      return sendForm<InspectResponse>("/api/logger-files/inspect", form, (progress) => setBusy({ label: "Reading the file", progress, cancel: () => controller.abort() }), controller.signal);
    };
    setFileError(null);
    setTopError(null);
    let result = await run(instrumentId);
    let notice: string | null = null;
    if (!result.ok && result.status === 422 && instrumentId) {
      // The instrument's saved mapping may name columns this file does not have.
      const firstProblem = result.error;
      result = await run("");
      if (result.ok) notice = `The mapping saved for ${instruments.find((i) => i.id === instrumentId)?.name ?? "this instrument"} does not fit this file (${firstProblem}). The guessed mapping is shown instead.`;
    }
    setBusy(null);
    if (!result.ok) {
      if (options.keepOnFailure && inspect) setMappingNotice(result.error);
      else {
        setInspect(null);
        setColumns([]);
        setFileError(result.error);
      }
      return;
    }
    const body = result.body;
    const next = columnsFrom(body);
    setInspect(body);
    setColumns(next);
    setReferenceColumn(body.referenceColumn ?? settleReference(next, null));
    setMappingErrors([]);
    if (!notice && body.savedMapping) notice = `The mapping saved for ${instruments.find((i) => i.id === instrumentId)?.name ?? "the instrument"} was applied. Check it against the preview.`;
    setMappingNotice(notice);
  }

  function addFiles(added: File[]) {
    const next = [...files, ...added].slice(0, 10);
    setFiles(next);
    if (files.length === 0 && next[0]) void inspectFile(next[0], fields.instrumentId, { keepOnFailure: false });
  }

  function removeFile(index: number) {
    const next = files.filter((_, i) => i !== index);
    setFiles(next);
    if (index === 0) {
      setInspect(null);
      setColumns([]);
      setMappingNotice(null);
      setFileError(null);
      if (next[0]) void inspectFile(next[0], fields.instrumentId, { keepOnFailure: false });
    }
  }

  function chooseSterilizer(id: string) {
    const sterilizer = sterilizers.find((s) => s.id === id);
    setFields((f) => ({ ...f, sterilizerId: id, profileId: sterilizer?.defaultProfileId ?? f.profileId }));
    setFieldErrors((e) => ({ ...e, sterilizerId: undefined, profileId: undefined }));
    setTopError(null);
  }

  function chooseInstrument(id: string) {
    setField("instrumentId", id);
    const chosen = instruments.find((i) => i.id === id);
    if (!chosen) setSaveMapping(false);
    if (chosen?.hasSavedMapping && files[0]) void inspectFile(files[0], id, { keepOnFailure: true });
  }

  function updateColumn(index: number, patch: Partial<MappedColumn>) {
    const next = changeColumn(columns, index, patch);
    setColumns(next);
    setReferenceColumn((r) => settleReference(next, r));
    setMappingErrors([]);
    setTopError(null);
  }

  async function analyse(event: FormEvent) {
    event.preventDefault();
    setTopError(null);
    const parsed = createCycleFieldsSchema.safeParse(fields);
    const errors: Partial<Record<CreateCycleField, string>> = {};
    if (!parsed.success) {
      for (const issue of parsed.error.issues) {
        const name = String(issue.path[0]) as CreateCycleField;
        errors[name] ??= issue.message;
      }
    }
    const problems = inspect ? mappingProblems(columns, referenceColumn) : [];
    setFieldErrors(errors);
    setMappingErrors(problems);
    if (!files[0] || !inspect) {
      setFileError(files[0] ? "The file could not be read; choose another one." : "Add the logger file first.");
    }
    if (!parsed.success || problems.length > 0 || !files[0] || !inspect) {
      setTopError("Some details need attention before the cycle can be analysed; they are marked below.");
      requestAnimationFrame(() => errorSummary.current?.focus());
      return;
    }

    const controller = new AbortController();
    const form = new FormData();
    for (const file of files) form.append("files", file);
    form.append("sterilizerId", fields.sterilizerId);
    form.append("profileId", fields.profileId);
    if (fields.instrumentId) form.append("instrumentId", fields.instrumentId);
    if (fields.cycleNumber.trim()) form.append("cycleNumber", fields.cycleNumber.trim());
    if (fields.load.trim()) form.append("load", fields.load.trim());
    form.append("testKind", fields.testKind);
    form.append("mapping", JSON.stringify(toMappingOverrides(columns, referenceColumn)));
    if (saveMapping && fields.instrumentId) form.append("saveMapping", "true");

    const result = await sendForm<CreateCycleResponse>("/api/cycles", form, (progress) => setBusy({ label: "Analysing", progress, cancel: () => controller.abort() }), controller.signal);
    if (result.ok) {
      setBusy({ label: "Opening the record", progress: { stage: "processing" }, cancel: () => {} });
      router.push(`/cycles/${result.body.id}`);
      return;
    }
    setBusy(null);
    if (result.field && FIELD_NAMES.includes(result.field)) {
      setFieldErrors({ [result.field]: result.error });
      setTopError("The server could not accept one of the details; it is marked below.");
    } else if (result.field === "mapping") {
      setMappingErrors([result.error]);
      setTopError("The server could not apply the column mapping; see the columns below.");
    } else {
      setTopError(result.error);
    }
    requestAnimationFrame(() => errorSummary.current?.focus());
  }

  const errorText = (name: CreateCycleField) =>
    fieldErrors[name] ? (
      <p id={`${ids}-${name}-error`} className="field-error" data-field-error={name}>
        {fieldErrors[name]}
      </p>
    ) : null;
  const describedBy = (name: CreateCycleField) => (fieldErrors[name] ? `${ids}-${name}-error` : undefined);

  return (
    <form onSubmit={analyse} noValidate className="space-y-gutter" aria-label="New test cycle" data-ready={ready ? "true" : "false"}>
      {topError && (
        <div ref={errorSummary} tabIndex={-1} role="alert" className="rounded-md border border-fail-500/40 bg-fail-50 px-4 py-3 text-sm text-fail-700" data-testid="intake-error">
          {topError}
        </div>
      )}

      <Panel title="1 · Logger file">
        {files.length === 0 ? (
          <LoggerDropzone limitMb={limitMb} disabled={Boolean(busy)} onFiles={addFiles} onRejected={setRejections} />
        ) : (
          <div className="grid items-start gap-4 lg:grid-cols-[1fr_16rem]">
            <ul className="divide-y divide-ink-line/60 rounded-md border border-ink-line" aria-label="Files for this cycle">
              {files.map((file, i) => (
                <li key={`${file.name}-${i}`} className="flex items-center justify-between gap-3 px-3 py-2 text-sm">
                  <div className="min-w-0">
                    <p className="mono truncate font-medium">{file.name}</p>
                    <p className="text-xs text-ink-muted">
                      {formatBytes(file.size)} · {i === 0 ? "analysed as this cycle's logger file" : "kept with the record, not analysed"}
                    </p>
                  </div>
                  <button type="button" className="btn-secondary px-2 py-1 text-xs" disabled={Boolean(busy)} onClick={() => removeFile(i)} aria-label={`Remove ${file.name}`}>
                    Remove
                  </button>
                </li>
              ))}
            </ul>
            <LoggerDropzone limitMb={limitMb} compact disabled={Boolean(busy) || files.length >= 10} onFiles={addFiles} onRejected={setRejections} />
          </div>
        )}
        <p className="mt-3 text-xs text-ink-muted">
          One cycle per upload. The first file is read and analysed; further files (a second logger&apos;s export, a printout saved as text)
          are stored with the record, unanalysed. The original bytes of every file are kept with their SHA-256.
        </p>
        {rejections.length > 0 && (
          <ul className="mt-3 space-y-1" role="alert" data-testid="dropzone-rejections">
            {rejections.map((r) => (
              <li key={r} className="field-error text-sm">{r}</li>
            ))}
          </ul>
        )}
        {fileError && (
          <p className="field-error mt-3 text-sm" role="alert" data-testid="file-error">
            {fileError}
          </p>
        )}
      </Panel>

      {busy?.label === "Reading the file" && <ProgressLine busy={busy} />}

      {inspect && (
        <Panel
          title="2 · Check the columns"
          action={
            <span className="text-xs text-ink-muted">
              {DELIMITER_WORDS[inspect.dialect.delimiter] ?? inspect.dialect.delimiter}-separated · decimal &ldquo;{inspect.dialect.decimal}&rdquo; · {inspect.dialect.encoding}
              {inspect.dialect.preambleLines > 0 ? ` · ${inspect.dialect.preambleLines} lines above the header` : ""} · {TIME_FORMAT_WORDS[inspect.dialect.timeFormat] ?? inspect.dialect.timeFormat}
            </span>
          }
        >
          <p className="mb-3 text-sm text-ink-soft">
            Papin guessed what each column holds. Correct anything that is wrong; marks <span className="text-caution-700">⚠</span> show what
            the guess was unsure of.
          </p>
          {mappingNotice && (
            <p className="mb-3 rounded-md border border-steam-100 bg-steam-50 px-3 py-2 text-sm text-steam-700" role="status" data-testid="mapping-notice">
              {mappingNotice}
            </p>
          )}
          {inspect.warnings.length > 0 && (
            <ul className="mb-3 space-y-1 text-sm text-caution-700">
              {inspect.warnings.map((w) => (
                <li key={w}>⚠ {w}</li>
              ))}
            </ul>
          )}
          <MappingTable
            idPrefix={ids}
            columns={columns}
            referenceColumn={referenceColumn}
            preview={inspect.preview}
            rowCount={inspect.rowCount}
            guessedReference={inspect.referenceColumn}
            onColumnChange={updateColumn}
            onReferenceChange={(h) => {
              setReferenceColumn(h);
              setMappingErrors([]);
            }}
          />
          {mappingErrors.length > 0 && (
            <ul className="mt-3 space-y-1" data-testid="mapping-errors">
              {mappingErrors.map((m) => (
                <li key={m} className="field-error text-sm">{m}</li>
              ))}
            </ul>
          )}
        </Panel>
      )}

      <Panel title={inspect ? "3 · Cycle details" : "2 · Cycle details"}>
        <div className="grid gap-4 md:grid-cols-2 xl:grid-cols-3">
          <div>
            <label className="field-label" htmlFor={`${ids}-sterilizer`}>Sterilizer</label>
            <select
              id={`${ids}-sterilizer`}
              name="sterilizerId"
              className="field-input"
              value={fields.sterilizerId}
              onChange={(e) => chooseSterilizer(e.target.value)}
              aria-invalid={Boolean(fieldErrors.sterilizerId)}
              aria-describedby={describedBy("sterilizerId")}
            >
              <option value="">Choose…</option>
              {sterilizers.map((s) => (
                <option key={s.id} value={s.id}>
                  {s.name} · {s.serialNumber} · {s.chamberVolumeL} L
                </option>
              ))}
            </select>
            {errorText("sterilizerId")}
            {sterilizers.length === 0 && <p className="mt-1 text-xs text-ink-muted">No sterilizer is registered on your site yet; an engineer adds them under Sterilizers.</p>}
          </div>
          <div>
            <label className="field-label" htmlFor={`${ids}-profile`}>Acceptance profile</label>
            <select
              id={`${ids}-profile`}
              name="profileId"
              className="field-input"
              value={fields.profileId}
              onChange={(e) => setField("profileId", e.target.value)}
              aria-invalid={Boolean(fieldErrors.profileId)}
              aria-describedby={describedBy("profileId") ?? `${ids}-profile-hint`}
            >
              <option value="">Choose…</option>
              {profiles.map((p) => (
                <option key={p.id} value={p.id}>{p.name}</option>
              ))}
            </select>
            {errorText("profileId")}
            {profile && (
              <p id={`${ids}-profile-hint`} className="mt-1 text-xs text-ink-muted">
                {profile.sterilizationTempC} °C to {profile.sterilizationTempC + profile.bandK} °C, holding at least {formatDuration(profile.holdingTimeS)}
                {sterilizers.find((s) => s.id === fields.sterilizerId)?.defaultProfileId === profile.id ? " · the sterilizer's default" : ""}
              </p>
            )}
          </div>
          <div>
            <label className="field-label" htmlFor={`${ids}-instrument`}>Logger (instrument)</label>
            <select
              id={`${ids}-instrument`}
              name="instrumentId"
              className="field-input"
              value={fields.instrumentId}
              onChange={(e) => chooseInstrument(e.target.value)}
              disabled={Boolean(busy)}
              aria-invalid={Boolean(fieldErrors.instrumentId)}
              aria-describedby={describedBy("instrumentId")}
            >
              <option value="">Not recorded</option>
              {instruments.map((i) => (
                <option key={i.id} value={i.id}>
                  {i.name} · {i.serialNumber}
                  {i.hasSavedMapping ? " · saved mapping" : ""}
                </option>
              ))}
            </select>
            {errorText("instrumentId")}
          </div>
          <div>
            <label className="field-label" htmlFor={`${ids}-cycle-number`}>Cycle number</label>
            <input
              id={`${ids}-cycle-number`}
              name="cycleNumber"
              className="field-input"
              value={fields.cycleNumber}
              maxLength={80}
              placeholder="From the sterilizer's display or printout"
              onChange={(e) => setField("cycleNumber", e.target.value)}
              aria-invalid={Boolean(fieldErrors.cycleNumber)}
              aria-describedby={describedBy("cycleNumber") ?? `${ids}-cycle-number-hint`}
            />
            {errorText("cycleNumber") ?? (
              <p id={`${ids}-cycle-number-hint`} className="mt-1 text-xs text-ink-muted">Left empty, Papin uses the serial number and the start time.</p>
            )}
          </div>
          <div>
            <label className="field-label" htmlFor={`${ids}-test-kind`}>Kind of test</label>
            <select
              id={`${ids}-test-kind`}
              name="testKind"
              className="field-input"
              value={fields.testKind}
              onChange={(e) => setField("testKind", e.target.value as TestKind)}
              aria-invalid={Boolean(fieldErrors.testKind)}
              aria-describedby={describedBy("testKind")}
            >
              {TEST_KINDS.map((k) => (
                <option key={k} value={k}>{testKindLabel(k)}</option>
              ))}
            </select>
            {errorText("testKind")}
          </div>
          <div className="md:col-span-2 xl:col-span-3">
            <label className="field-label" htmlFor={`${ids}-load`}>Load description</label>
            <textarea
              id={`${ids}-load`}
              name="load"
              rows={2}
              className="field-input"
              value={fields.load}
              placeholder="e.g. standard test pack, 6 probes; or trays and wrapped instruments"
              onChange={(e) => setField("load", e.target.value)}
              aria-invalid={Boolean(fieldErrors.load)}
              aria-describedby={describedBy("load")}
            />
            {errorText("load")}
          </div>
        </div>
        <label className={`mt-4 flex items-start gap-2 text-sm ${instrument ? "" : "text-ink-faint"}`}>
          <input type="checkbox" className="mt-1" checked={saveMapping} disabled={!instrument} onChange={(e) => setSaveMapping(e.target.checked)} />
          <span>
            Save this column mapping for the instrument
            {instrument ? ` ${instrument.name}` : ""}
            <span className="block text-xs text-ink-muted">
              {instrument ? "Its next files get this mapping automatically; you can still correct it." : "Choose the logger above to save its mapping."}
            </span>
          </span>
        </label>
      </Panel>

      {busy && busy.label !== "Reading the file" && <ProgressLine busy={busy} />}

      <div className="flex flex-wrap items-center gap-3">
        <button type="submit" className="btn-primary px-5" disabled={Boolean(busy)}>
          {busy?.label === "Analysing" || busy?.label === "Opening the record" ? "Analysing…" : "Analyse"}
        </button>
        <p className="text-xs text-ink-muted">
          The cycle is saved as a draft with its analysis. You submit it for review from its record.
        </p>
      </div>
    </form>
  );
}
