"use client";

import type { ReactNode } from "react";
import type { TestKind } from "@/lib/domain";
import type { CreateCycleField } from "@/lib/validations/intake";
import { formatDuration, LOAD_LOT_MAX_CHARS, LOAD_TYPE_LABELS, LOAD_TYPES, PROFILE_BASIS_LABELS, TEST_KINDS, testKindLabel, formatVolume } from "@/lib/domain";
import { Panel } from "@/components/ui/panel";
import { OutOfUseNotice } from "@/components/equipment/sterilizer-status";
import type { IntakeFields, IntakeInstrument, IntakeProfile, IntakeSterilizer } from "./intake-request";
import type { CycleFields } from "./use-cycle-fields";

type Props = {
  idPrefix: string;
  step: number;
  details: CycleFields;
  sterilizers: readonly IntakeSterilizer[];
  profiles: readonly IntakeProfile[];
  instruments: readonly IntakeInstrument[];
  busy: boolean;
  onInstrumentChange: (id: string) => void;
  /** the file has no date of its own (elapsed times), so the cycle's start is asked for */
  askStartTime: boolean;
  timeZone: string;
};

type Wiring = ReturnType<typeof fieldWiring>;

/** Label, control and its error sentence, wired together for screen readers. */
function fieldWiring(idPrefix: string, details: CycleFields) {
  const { fieldErrors } = details;
  const errorId = (name: CreateCycleField) => `${idPrefix}-${name}-error`;
  return {
    invalid: (name: CreateCycleField) => ({ "aria-invalid": Boolean(fieldErrors[name]) }),
    describedBy: (name: CreateCycleField) => (fieldErrors[name] ? errorId(name) : undefined),
    errorText: (name: CreateCycleField): ReactNode =>
      fieldErrors[name] ? (
        <p id={errorId(name)} className="field-error" data-field-error={name}>
          {fieldErrors[name]}
        </p>
      ) : null,
  };
}

/** Step 2 or 3: which sterilizer, profile and logger the cycle belongs to, its number, kind and load. */
export function DetailsPanel(props: Props) {
  const wiring = fieldWiring(props.idPrefix, props.details);
  return (
    <Panel title={`${props.step} · Cycle details`}>
      <div className="grid gap-4 md:grid-cols-2 xl:grid-cols-3">
        <EquipmentFields {...props} wiring={wiring} />
        {(props.askStartTime || props.details.fieldErrors.startedAt) && <StartTimeField idPrefix={props.idPrefix} details={props.details} wiring={wiring} timeZone={props.timeZone} />}
        <CycleFacts idPrefix={props.idPrefix} details={props.details} wiring={wiring} />
        {(props.details.fieldErrors.duplicateReason || props.details.fields.duplicateReason) && <DuplicateReasonField idPrefix={props.idPrefix} details={props.details} wiring={wiring} />}
      </div>
      <SaveMappingBox details={props.details} />
    </Panel>
  );
}

function EquipmentFields({ idPrefix: ids, details, sterilizers, profiles, instruments, busy, onInstrumentChange, wiring, timeZone }: Props & { wiring: Wiring }) {
  const { fields, setField } = details;
  const chosen = details.sterilizer;
  const { invalid, describedBy, errorText } = wiring;
  const profile = profiles.find((p) => p.id === fields.profileId);
  return (
    <>
      <div>
        <label className="field-label" htmlFor={`${ids}-sterilizer`}>
          Sterilizer
        </label>
        <select
          id={`${ids}-sterilizer`}
          name="sterilizerId"
          className="field-input"
          value={fields.sterilizerId}
          onChange={(e) => details.chooseSterilizer(e.target.value)}
          {...invalid("sterilizerId")}
          aria-describedby={describedBy("sterilizerId")}
        >
          <option value="">Choose…</option>
          {sterilizers.map((s) => (
            <option key={s.id} value={s.id}>
              {s.name} · {s.serialNumber} · {formatVolume(s.chamberVolumeL)}
            </option>
          ))}
        </select>
        {errorText("sterilizerId")}
        {chosen?.status === "out-of-use" && <OutOfUseNotice name={chosen.name} reason={chosen.statusReason ?? ""} since={chosen.statusSince ?? ""} timeZone={timeZone} />}
        {sterilizers.length === 0 && <p className="mt-1 text-xs text-ink-muted">No sterilizer is registered on your site yet; an engineer adds them under Sterilizers.</p>}
      </div>
      <div>
        <label className="field-label" htmlFor={`${ids}-profile`}>
          Acceptance profile
        </label>
        <select
          id={`${ids}-profile`}
          name="profileId"
          className="field-input"
          value={fields.profileId}
          onChange={(e) => setField("profileId", e.target.value)}
          {...invalid("profileId")}
          aria-describedby={describedBy("profileId") ?? `${ids}-profile-hint`}
        >
          <option value="">Choose…</option>
          {profiles.map((p) => (
            <option key={p.id} value={p.id}>
              {p.name}
            </option>
          ))}
        </select>
        {errorText("profileId")}
        {profile && (
          <p id={`${ids}-profile-hint`} className="mt-1 text-xs text-ink-muted">
            {profile.sterilizationTempC} °C to {profile.sterilizationTempC + profile.bandK} °C, holding at least {formatDuration(profile.holdingTimeS)} · basis {PROFILE_BASIS_LABELS[profile.basis]}
            {details.sterilizer?.defaultProfileId === profile.id ? " · the sterilizer's default" : ""}
          </p>
        )}
      </div>
      <div>
        <label className="field-label" htmlFor={`${ids}-instrument`}>
          Logger (instrument)
        </label>
        <select
          id={`${ids}-instrument`}
          name="instrumentId"
          className="field-input"
          value={fields.instrumentId}
          onChange={(e) => onInstrumentChange(e.target.value)}
          disabled={busy}
          {...invalid("instrumentId")}
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
    </>
  );
}

function CycleFacts({ idPrefix: ids, details, wiring }: { idPrefix: string; details: CycleFields; wiring: Wiring }) {
  const { fields, setField } = details;
  const { invalid, describedBy, errorText } = wiring;
  return (
    <>
      <div>
        <label className="field-label" htmlFor={`${ids}-cycle-number`}>
          Cycle number
        </label>
        <input
          id={`${ids}-cycle-number`}
          name="cycleNumber"
          className="field-input"
          value={fields.cycleNumber}
          maxLength={80}
          placeholder="From the sterilizer's display or printout"
          onChange={(e) => setField("cycleNumber", e.target.value)}
          {...invalid("cycleNumber")}
          aria-describedby={describedBy("cycleNumber") ?? `${ids}-cycle-number-hint`}
        />
        {errorText("cycleNumber") ?? (
          <p id={`${ids}-cycle-number-hint`} className="mt-1 text-xs text-ink-muted">
            Left empty, Papin uses the serial number and the start time.
          </p>
        )}
      </div>
      <div>
        <label className="field-label" htmlFor={`${ids}-test-kind`}>
          Kind of test
        </label>
        <select
          id={`${ids}-test-kind`}
          name="testKind"
          className="field-input"
          value={fields.testKind}
          onChange={(e) => setField("testKind", e.target.value as TestKind)}
          {...invalid("testKind")}
          aria-describedby={describedBy("testKind")}
        >
          {TEST_KINDS.map((k) => (
            <option key={k} value={k}>
              {testKindLabel(k)}
            </option>
          ))}
        </select>
        {errorText("testKind")}
      </div>
      {fields.testKind === "air-leakage" && <LeakMarkField idPrefix={ids} details={details} />}
      <div className="md:col-span-2 xl:col-span-3">
        <label className="field-label" htmlFor={`${ids}-load`}>
          Load description
        </label>
        <textarea
          id={`${ids}-load`}
          name="load"
          rows={2}
          className="field-input"
          value={fields.load}
          placeholder="e.g. standard test pack, 6 probes; or trays and wrapped instruments"
          onChange={(e) => setField("load", e.target.value)}
          {...invalid("load")}
          aria-describedby={describedBy("load")}
        />
        {errorText("load")}
      </div>
      {fields.testKind !== "air-leakage" && fields.testKind !== "bowie-dick" && (
        <>
          <div>
            <label className="field-label" htmlFor={`${ids}-load-type`}>
              Test pack or load
            </label>
            <select
              id={`${ids}-load-type`}
              name="loadType"
              className="field-input"
              value={fields.loadType}
              onChange={(e) => setField("loadType", e.target.value as IntakeFields["loadType"])}
              {...invalid("loadType")}
              aria-describedby={describedBy("loadType")}
            >
              <option value="">not recorded</option>
              {LOAD_TYPES.map((t) => (
                <option key={t} value={t}>
                  {LOAD_TYPE_LABELS[t]}
                </option>
              ))}
            </select>
            {errorText("loadType")}
          </div>
          <div>
            <label className="field-label" htmlFor={`${ids}-load-lot`}>
              Lot or batch of the test pack or load
            </label>
            <input
              id={`${ids}-load-lot`}
              name="loadLot"
              className="field-input"
              maxLength={LOAD_LOT_MAX_CHARS}
              value={fields.loadLot}
              placeholder="e.g. STP-2611-04"
              onChange={(e) => setField("loadLot", e.target.value)}
              {...invalid("loadLot")}
              aria-describedby={describedBy("loadLot")}
            />
            {errorText("loadLot")}
          </div>
        </>
      )}
    </>
  );
}

/** An air leakage test's t1, when the trace alone does not show where the valves closed (DOMAIN.md §2.5). */
function LeakMarkField({ idPrefix: ids, details }: { idPrefix: string; details: CycleFields }) {
  const error = details.fieldErrors.leakMarks;
  return (
    <div>
      <label className="field-label" htmlFor={`${ids}-leak-t1`}>
        Valves closed at t1 (optional)
      </label>
      <input
        id={`${ids}-leak-t1`}
        name="leakT1"
        className="field-input mono"
        inputMode="decimal"
        placeholder="m:ss after the first sample"
        value={details.fields.leakT1 ?? ""}
        onChange={(e) => details.setField("leakT1", e.target.value)}
        aria-invalid={Boolean(error)}
        aria-describedby={error ? `${ids}-leak-t1-error` : `${ids}-leak-t1-hint`}
      />
      {error ? (
        <p id={`${ids}-leak-t1-error`} className="field-error" data-field-error="leakMarks">
          {error}
        </p>
      ) : (
        <p id={`${ids}-leak-t1-hint`} className="mt-1 text-xs text-ink-muted">
          Empty: Papin takes the deepest vacuum as t1. A marked t1 overrides it and is recorded as marked; t2 and t3 follow 5 and 15 min later. The file may hold only time and chamber pressure.
        </p>
      )}
    </div>
  );
}

/** The cycle's start, only for a file without a date: never taken from the upload time. */
function StartTimeField({ idPrefix: ids, details, wiring, timeZone }: { idPrefix: string; details: CycleFields; wiring: Wiring; timeZone: string }) {
  const { invalid, describedBy, errorText } = wiring;
  return (
    <div>
      <label className="field-label" htmlFor={`${ids}-started-at`}>
        Cycle started at
      </label>
      <input
        id={`${ids}-started-at`}
        name="startedAt"
        type="datetime-local"
        step={1}
        className="field-input"
        value={details.fields.startedAt}
        onChange={(e) => details.setField("startedAt", e.target.value)}
        {...invalid("startedAt")}
        aria-describedby={describedBy("startedAt") ?? `${ids}-started-at-hint`}
      />
      {errorText("startedAt") ?? (
        <p id={`${ids}-started-at-hint`} className="mt-1 text-xs text-ink-muted">
          The file holds elapsed times only. Local time at the site ({timeZone}), from the sterilizer&apos;s printout or display.
        </p>
      )}
    </div>
  );
}

/** Only when another cycle of the site already holds the file: why it belongs to this cycle too (e.g. one file holding several cycles). */
function DuplicateReasonField({ idPrefix: ids, details, wiring }: { idPrefix: string; details: CycleFields; wiring: Wiring }) {
  const { invalid, describedBy, errorText } = wiring;
  return (
    <div className="md:col-span-2 xl:col-span-3">
      <label className="field-label" htmlFor={`${ids}-duplicate-reason`}>
        Why this file belongs to this cycle too
      </label>
      <textarea
        id={`${ids}-duplicate-reason`}
        name="duplicateReason"
        rows={2}
        className="field-input"
        value={details.fields.duplicateReason}
        placeholder="e.g. one logger file holds the morning and the afternoon cycles"
        onChange={(e) => details.setField("duplicateReason", e.target.value)}
        {...invalid("duplicateReason")}
        aria-describedby={describedBy("duplicateReason")}
      />
      {errorText("duplicateReason")}
    </div>
  );
}

function SaveMappingBox({ details }: { details: CycleFields }) {
  const { instrument } = details;
  return (
    <label className={`mt-4 flex items-start gap-2 text-sm ${instrument ? "" : "text-ink-faint"}`}>
      <input type="checkbox" className="mt-1" checked={details.saveMapping} disabled={!instrument} onChange={(e) => details.setSaveMapping(e.target.checked)} />
      <span>
        Save this column mapping for the instrument
        {instrument ? ` ${instrument.name}` : ""}
        <span className="block text-xs text-ink-muted">{instrument ? "Its next files get this mapping automatically; you can still correct it." : "Choose the logger above to save its mapping."}</span>
      </span>
    </label>
  );
}
