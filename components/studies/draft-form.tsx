"use client";

import { useState } from "react";
import { updateStudyDraftAction } from "@/app/(portal)/studies/[id]/actions";
import { TextInput, useFormAction } from "@/components/equipment/form-bits";
import { ActionMessage } from "@/components/ui/action-message";
import { profileMinimumF0 } from "@/lib/domain";
import type { StudyDetail } from "@/lib/studies/contracts";
import { CriteriaFields } from "./criteria-fields";
import { PatternEditor, patternPayload, type PatternDraft } from "./pattern-editor";

function draftOf(lp: StudyDetail["loadingPattern"]): PatternDraft {
  return {
    name: lp.name,
    description: lp.description,
    loadType: lp.loadType ?? "",
    items: lp.items.map((i) => ({ name: i.name, quantity: String(i.quantity), note: i.note ?? "" })),
    positions: lp.positions.map((p) => ({ id: p.id, label: p.label, sensorPosition: p.sensorPosition ?? "", note: p.note ?? "" })),
  };
}

/** Editing a draft study: criteria, protocol and (ticked) the loading pattern; the ledger keeps old and new. */
export function DraftForm({ detail }: { detail: StudyDetail }) {
  const { state, pending, formRef, onSubmit, onChange, errors } = useFormAction(updateStudyDraftAction);
  const [editPattern, setEditPattern] = useState(false);
  const [pattern, setPattern] = useState<PatternDraft>(() => draftOf(detail.loadingPattern));
  const c = detail.criteria;
  return (
    <form ref={formRef} onSubmit={onSubmit} onChange={onChange} className="space-y-4" noValidate aria-label="Edit the draft study">
      <input type="hidden" name="id" value={detail.id} />
      {editPattern && <input type="hidden" name="pattern" value={JSON.stringify(patternPayload(pattern))} />}
      <CriteriaFields
        defaults={{
          title: detail.title,
          runsRequired: c.runsRequired,
          minF0Min: c.minF0Source === "study" ? c.minF0Min : null,
          maxSpreadK: c.maxSpreadSource === "study" ? c.maxSpreadK : null,
          indicatorsRequired: c.indicatorsRequired,
          protocol: detail.protocol,
          requalificationMonths: detail.requalificationMonths,
        }}
        profileMinF0={profileMinimumF0(detail.profile)}
        profileMaxSpreadK={detail.profile.maxSpreadK}
        errors={errors}
      />
      <label className="flex items-start gap-2 text-sm">
        <input type="checkbox" checked={editPattern} onChange={(e) => setEditPattern(e.target.checked)} className="mt-1" />
        <span>Change the loading pattern too</span>
      </label>
      {editPattern && <PatternEditor value={pattern} onChange={setPattern} error={errors.pattern} />}
      <TextInput id="draft-reason" name="reason" label="Reason for the change (optional)" error={errors.reason} />
      <ActionMessage state={state} />
      <button className="btn-primary" disabled={pending}>
        {pending ? "Saving…" : "Save the draft"}
      </button>
    </form>
  );
}
