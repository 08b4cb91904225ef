"use client";

import { useRouter } from "next/navigation";
import { useEffect, useState } from "react";
import { createStudyAction } from "@/app/(portal)/studies/actions";
import { useFormAction } from "@/components/equipment/form-bits";
import { ActionMessage } from "@/components/ui/action-message";
import { loadTypeLabel, profileMinimumF0, STUDY_KIND_LABELS, STUDY_KINDS, plural } from "@/lib/domain";
import { CriteriaFields } from "./criteria-fields";
import { EMPTY_PATTERN, PatternEditor, patternPayload, type PatternDraft } from "./pattern-editor";

export type PlanningOptions = {
  sterilizers: Array<{ id: string; name: string; defaultProfileId: string | null }>;
  profiles: Array<{ id: string; name: string; sterilizationTempC: number; holdingTimeS: number; f0ReferenceC: number; f0ZK: number; maxSpreadK: number }>;
  patterns: Array<{ id: string; sterilizerId: string; name: string; loadType: string | null; positions: number; requalificationDueOn: string | null }>;
};

/** Planning a study: the sterilizer, kind and profile, the loading pattern (an existing one or a new one), criteria and protocol. */
export function StudyForm({ options }: { options: PlanningOptions }) {
  const router = useRouter();
  const { state, pending, formRef, onSubmit, onChange, errors } = useFormAction(createStudyAction);
  const [sterilizerId, setSterilizerId] = useState(options.sterilizers.length === 1 ? options.sterilizers[0].id : "");
  const [profileId, setProfileId] = useState(options.sterilizers.length === 1 ? (options.sterilizers[0].defaultProfileId ?? "") : "");
  const [patternChoice, setPatternChoice] = useState<string>("new");
  const [pattern, setPattern] = useState<PatternDraft>(EMPTY_PATTERN);
  useEffect(() => {
    if (state.status === "ok" && state.href) router.push(state.href);
  }, [state, router]);

  const patterns = options.patterns.filter((p) => p.sterilizerId === sterilizerId);
  const profile = options.profiles.find((p) => p.id === profileId);
  const chooseSterilizer = (id: string) => {
    setSterilizerId(id);
    const s = options.sterilizers.find((x) => x.id === id);
    if (s?.defaultProfileId) setProfileId(s.defaultProfileId);
    setPatternChoice("new");
  };
  const patternValue = JSON.stringify(patternChoice === "new" ? patternPayload(pattern) : { existingId: patternChoice });

  return (
    <form ref={formRef} onSubmit={onSubmit} onChange={onChange} className="max-w-4xl space-y-5" noValidate aria-label="Plan a qualification study">
      <input type="hidden" name="pattern" value={patternValue} />
      <div className="grid gap-3 sm:grid-cols-3">
        <div>
          <label className="field-label" htmlFor="study-sterilizer">
            Sterilizer
          </label>
          <select id="study-sterilizer" name="sterilizerId" className="field-input" value={sterilizerId} onChange={(e) => chooseSterilizer(e.target.value)} aria-invalid={!!errors.sterilizerId}>
            <option value="">Choose…</option>
            {options.sterilizers.map((s) => (
              <option key={s.id} value={s.id}>
                {s.name}
              </option>
            ))}
          </select>
          {errors.sterilizerId && <p className="field-error">{errors.sterilizerId}</p>}
        </div>
        <div>
          <label className="field-label" htmlFor="study-kind">
            Kind of study
          </label>
          <select id="study-kind" name="kind" className="field-input" defaultValue="heat-penetration" aria-invalid={!!errors.kind}>
            {STUDY_KINDS.map((k) => (
              <option key={k} value={k}>
                {STUDY_KIND_LABELS[k]}
              </option>
            ))}
          </select>
          {errors.kind && <p className="field-error">{errors.kind}</p>}
        </div>
        <div>
          <label className="field-label" htmlFor="study-profile">
            Profile
          </label>
          <select id="study-profile" name="profileId" className="field-input" value={profileId} onChange={(e) => setProfileId(e.target.value)} aria-invalid={!!errors.profileId}>
            <option value="">Choose…</option>
            {options.profiles.map((p) => (
              <option key={p.id} value={p.id}>
                {p.name}
              </option>
            ))}
          </select>
          {errors.profileId ? <p className="field-error">{errors.profileId}</p> : <p className="mt-1 text-xs text-ink-muted">The sterilizer&apos;s default profile is chosen for you.</p>}
        </div>
      </div>

      <fieldset className="min-w-0 space-y-3">
        <legend className="field-label">Loading pattern</legend>
        {sterilizerId && patterns.length > 0 && (
          <div className="space-y-1">
            {patterns.map((p) => (
              <label key={p.id} className="flex items-start gap-2 text-sm">
                <input type="radio" name="patternChoice" value={p.id} checked={patternChoice === p.id} onChange={() => setPatternChoice(p.id)} className="mt-1" />
                <span>
                  {p.name}{" "}
                  <span className="text-ink-muted">
                    · {loadTypeLabel(p.loadType)} · {plural(p.positions, "position")}
                  </span>
                  {p.requalificationDueOn && <span className="block text-xs text-ink-muted">Requalification due {p.requalificationDueOn}</span>}
                </span>
              </label>
            ))}
          </div>
        )}
        {sterilizerId && (
          <label className="flex items-start gap-2 text-sm">
            <input type="radio" name="patternChoice" value="new" checked={patternChoice === "new"} onChange={() => setPatternChoice("new")} className="mt-1" />
            <span>Define a new loading pattern</span>
          </label>
        )}
        {!sterilizerId && <p className="text-sm text-ink-muted">Choose the sterilizer first: a loading pattern belongs to one sterilizer.</p>}
        {patternChoice === "new" && <PatternEditor value={pattern} onChange={setPattern} error={errors.pattern} />}
        {patternChoice !== "new" && errors.pattern && <p className="field-error">{errors.pattern}</p>}
      </fieldset>

      <CriteriaFields profileMinF0={profile ? profileMinimumF0(profile) : null} profileMaxSpreadK={profile?.maxSpreadK ?? null} errors={errors} />

      <ActionMessage state={state} />
      <button className="btn-primary" disabled={pending}>
        {pending ? "Saving…" : "Save the draft study"}
      </button>
      <p className="text-xs text-ink-muted">A draft stays editable until an engineer who is not its author approves the protocol; from then on protocol and criteria are frozen.</p>
    </form>
  );
}
