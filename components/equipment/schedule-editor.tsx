"use client";

import { useState } from "react";
import { removeScheduleAction, saveScheduleAction } from "@/app/(portal)/sterilizers/actions";
import { Field, TextInput, useFormAction } from "./form-bits";
import { ActionMessage } from "@/components/ui/action-message";
import { testKindLabel } from "@/lib/domain";

type Row = { kind: string; intervalDays: number; requiredBeforeUse: boolean };

// Common practice (DOMAIN.md §2.12): a vacuum sterilizer is not used before its daily steam penetration and weekly air leakage tests.
const SUGGESTED_REQUIRED = new Set(["bowie-dick", "air-leakage"]);

function RequiredBox({ id, defaultChecked, checked, onChange }: { id: string; defaultChecked?: boolean; checked?: boolean; onChange?: (v: boolean) => void }) {
  return (
    <label className="flex items-center gap-2 text-sm" htmlFor={id}>
      <input id={id} type="checkbox" name="requiredBeforeUse" defaultChecked={defaultChecked} checked={checked} onChange={onChange && ((e) => onChange(e.target.checked))} /> Required before use (out
      of use while due or never passed)
    </label>
  );
}

// Common practice (DOMAIN.md §2.12, HTM 01-01 Part C in outline): offered as starting values only.
const SUGGESTED_INTERVAL: Record<string, number> = {
  "bowie-dick": 1,
  "air-leakage": 7,
  "thermometric-small-load": 91,
  "thermometric-full-load": 365,
  "steam-non-condensable-gas": 365,
  "steam-superheat": 365,
  "steam-dryness": 365,
};

export function ScheduleEditor({ sterilizerId, rows, kinds }: { sterilizerId: string; rows: Row[]; kinds: readonly string[] }) {
  const unscheduled = kinds.filter((k) => !rows.some((r) => r.kind === k));
  return (
    <div className="space-y-4">
      {rows.map((r) => (
        <ScheduleRowForm key={r.kind} sterilizerId={sterilizerId} row={r} />
      ))}
      {unscheduled.length > 0 && <AddSchedule sterilizerId={sterilizerId} kinds={unscheduled} />}
    </div>
  );
}

function ScheduleRowForm({ sterilizerId, row }: { sterilizerId: string; row: Row }) {
  const save = useFormAction(saveScheduleAction);
  const remove = useFormAction(removeScheduleAction);
  const [removing, setRemoving] = useState(false);
  const id = `sched-${row.kind}`;
  return (
    <div className="rounded-md border border-ink-line p-3">
      <p className="text-sm font-medium">{testKindLabel(row.kind)}</p>
      <form onSubmit={save.onSubmit} onChange={save.onChange} className="mt-2 space-y-2" noValidate>
        <input type="hidden" name="sterilizerId" value={sterilizerId} />
        <input type="hidden" name="kind" value={row.kind} />
        <div className="grid grid-cols-[1fr_auto] items-end gap-2">
          <TextInput id={`${id}-interval`} name="intervalDays" label="Interval" suffix="days" inputMode="numeric" defaultValue={row.intervalDays} error={save.errors.intervalDays} />
          <button className="btn-secondary" disabled={save.pending}>
            {save.pending ? "Saving…" : "Save"}
          </button>
        </div>
        <RequiredBox id={`${id}-required`} defaultChecked={row.requiredBeforeUse} />
        <TextInput id={`${id}-reason`} name="reason" label="Reason for a change" error={save.errors.reason} />
      </form>
      <div className="mt-2">
        <ActionMessage state={save.state} />
      </div>
      {!removing ? (
        <button type="button" className="mt-2 text-xs text-fail-700 underline" onClick={() => setRemoving(true)}>
          Take off the schedule…
        </button>
      ) : (
        <form onSubmit={remove.onSubmit} onChange={remove.onChange} className="mt-2 flex flex-wrap items-end gap-2" noValidate>
          <input type="hidden" name="sterilizerId" value={sterilizerId} />
          <input type="hidden" name="kind" value={row.kind} />
          <div className="min-w-[14rem] flex-1">
            <TextInput id={`${id}-remove-reason`} name="reason" label="Why is this test no longer scheduled?" error={remove.errors.reason} />
          </div>
          <button className="btn-danger" disabled={remove.pending}>
            Remove
          </button>
          <button type="button" className="btn-secondary" onClick={() => setRemoving(false)}>
            Cancel
          </button>
        </form>
      )}
      <div className="mt-2">
        <ActionMessage state={remove.state} />
      </div>
    </div>
  );
}

function AddSchedule({ sterilizerId, kinds }: { sterilizerId: string; kinds: string[] }) {
  const { state, pending, onSubmit, onChange, errors } = useFormAction(saveScheduleAction);
  const [kind, setKind] = useState(kinds[0]);
  const [interval, setInterval] = useState(String(SUGGESTED_INTERVAL[kinds[0]] ?? 7));
  const [required, setRequired] = useState(SUGGESTED_REQUIRED.has(kinds[0]));
  return (
    <form onSubmit={onSubmit} onChange={onChange} className="rounded-md border border-dashed border-ink-line p-3" noValidate aria-label="Add a test to the schedule">
      <p className="text-sm font-medium">Add a test to the schedule</p>
      <input type="hidden" name="sterilizerId" value={sterilizerId} />
      <div className="mt-2 space-y-2">
        <Field id="add-sched-kind" label="Test" error={errors.kind}>
          <select
            id="add-sched-kind"
            name="kind"
            className="field-input"
            value={kind}
            onChange={(e) => {
              setKind(e.target.value);
              setInterval(String(SUGGESTED_INTERVAL[e.target.value] ?? 7));
              setRequired(SUGGESTED_REQUIRED.has(e.target.value));
            }}
          >
            {kinds.map((k) => (
              <option key={k} value={k}>
                {testKindLabel(k)}
              </option>
            ))}
          </select>
        </Field>
        <div className="grid grid-cols-[1fr_auto] items-end gap-2">
          <TextInput id="add-sched-interval" name="intervalDays" label="Interval" suffix="days" inputMode="numeric" value={interval} onChange={setInterval} error={errors.intervalDays} />
          <button className="btn-primary" disabled={pending}>
            Add
          </button>
        </div>
        <RequiredBox id="add-sched-required" checked={required} onChange={setRequired} />
      </div>
      <p className="mt-1 text-xs text-ink-muted">
        Suggested intervals follow common practice (daily Bowie-Dick and weekly air leakage, both required before use on a vacuum sterilizer; quarterly and yearly thermometric and steam quality
        tests); your written scheme decides.
      </p>
      <div className="mt-2">
        <ActionMessage state={state} />
      </div>
    </form>
  );
}
