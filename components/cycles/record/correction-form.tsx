"use client";

import { useRouter } from "next/navigation";
import { useState } from "react";
import type { ChannelPlacement, ChannelPlacements, Verdict } from "@/lib/domain";
import type { ChannelPosition } from "@/lib/cycles/contracts";
import { canonicalPlacements } from "@/lib/cycles/positions";
import { PositionPicker } from "@/components/intake/position-picker";
import { fetchJson, RequestError } from "@/lib/client/fetch-json";
import { IDLE_FORM_STATE, type FormState } from "@/lib/form-state";
import { ActionMessage } from "@/components/ui/action-message";

type Choice = { id: string; name: string };

const fromMap = (p: ChannelPlacements, header: string) => (Object.hasOwn(p, header) ? { position: p[header].position, note: p[header].note ?? null } : { position: null, note: null });

export type CorrectionChoices = { profiles: Choice[]; instruments: Array<Choice & { serialNumber: string }> };

/**
 * A correction of a draft or returned cycle: a replacement logger file and/or changed profile or instrument, always
 * with the reason, which stays with the new analysis. Earlier files and analyses stay on the record.
 */
export function CorrectionForm({
  cycleId,
  current,
  choices,
}: {
  cycleId: string;
  current: { profileId: string; instrumentId: string | null; positions: ChannelPosition[] };
  choices: CorrectionChoices;
}) {
  const router = useRouter();
  const [busy, setBusy] = useState(false);
  const [message, setMessage] = useState<FormState>(IDLE_FORM_STATE);
  const [file, setFile] = useState<File | null>(null);
  const [profileId, setProfileId] = useState(current.profileId);
  const [instrumentId, setInstrumentId] = useState(current.instrumentId ?? "");
  const [reason, setReason] = useState("");
  const [duplicateReason, setDuplicateReason] = useState<string | null>(null);
  const startPlacements = canonicalPlacements(current.positions);
  const [placements, setPlacements] = useState<ChannelPlacements>(startPlacements);
  const placementsChanged = JSON.stringify(placements) !== JSON.stringify(startPlacements);
  const place = (header: string, next: ChannelPlacement | undefined) =>
    setPlacements((p) =>
      canonicalPlacements(current.positions.map((c) => (c.header === header ? { header, position: next?.position ?? null, note: next?.note ?? null } : { header: c.header, ...fromMap(p, c.header) }))),
    );

  const changed = !!file || placementsChanged || profileId !== current.profileId || instrumentId !== (current.instrumentId ?? "");

  async function correct(event: React.FormEvent) {
    event.preventDefault();
    if (!reason.trim()) {
      setMessage({ status: "error", message: "Say why the cycle is analysed again: the reason is kept with the analysis." });
      return;
    }
    const form = new FormData();
    if (file) form.set("file", file);
    if (profileId !== current.profileId) form.set("profileId", profileId);
    if (instrumentId && instrumentId !== (current.instrumentId ?? "")) form.set("instrumentId", instrumentId);
    if (placementsChanged) form.set("positions", JSON.stringify(placements));
    form.set("reason", reason.trim());
    if (duplicateReason?.trim()) form.set("duplicateReason", duplicateReason.trim());
    setBusy(true);
    setMessage(IDLE_FORM_STATE);
    try {
      const data = await fetchJson<{ analysis: { verdict: Verdict } }>(`/api/cycles/${cycleId}/analyses`, { form, what: "the new analysis" });
      setFile(null);
      setReason("");
      setDuplicateReason(null);
      setMessage({ status: "ok", message: `New analysis: ${data.analysis.verdict === "pass" ? "pass" : "fail"}. The earlier analysis stays in the history.` });
      router.refresh();
    } catch (error) {
      if (error instanceof RequestError && error.field === "duplicateReason") setDuplicateReason((r) => r ?? "");
      setMessage({ status: "error", message: error instanceof Error ? error.message : "Something went wrong." });
    } finally {
      setBusy(false);
    }
  }

  return (
    <form onSubmit={correct} className="space-y-3" aria-label="Correct the cycle" data-testid="correction-form">
      <div>
        <label htmlFor="correction-file" className="field-label">
          Replacement logger file (optional)
        </label>
        <input id="correction-file" type="file" accept=".csv,.txt,.tsv,.dat,.log" onChange={(e) => setFile(e.target.files?.[0] ?? null)} className="block text-sm" />
      </div>
      <div className="grid gap-3 sm:grid-cols-2">
        <div>
          <label htmlFor="correction-profile" className="field-label">
            Acceptance profile
          </label>
          <select id="correction-profile" className="field-input" value={profileId} onChange={(e) => setProfileId(e.target.value)}>
            {choices.profiles.map((p) => (
              <option key={p.id} value={p.id}>
                {p.name}
              </option>
            ))}
          </select>
        </div>
        <div>
          <label htmlFor="correction-instrument" className="field-label">
            Instrument
          </label>
          <select id="correction-instrument" className="field-input" value={instrumentId} onChange={(e) => setInstrumentId(e.target.value)}>
            {!current.instrumentId && <option value="">None named</option>}
            {choices.instruments.map((i) => (
              <option key={i.id} value={i.id}>
                {i.name} ({i.serialNumber})
              </option>
            ))}
          </select>
        </div>
      </div>
      {current.positions.length > 0 && (
        <fieldset>
          <legend className="field-label">Where each probe sat</legend>
          <div className="grid gap-2 sm:grid-cols-2">
            {current.positions.map((c, i) => (
              <div key={c.header}>
                <p className="mono mb-0.5 text-xs">{c.header}</p>
                <PositionPicker id={`correction-position-${i}`} header={c.header} placement={placements[c.header]} onChange={(next) => place(c.header, next)} />
              </div>
            ))}
          </div>
        </fieldset>
      )}
      <div>
        <label htmlFor="correction-reason" className="field-label">
          Why is the cycle analysed again? (required)
        </label>
        <textarea id="correction-reason" className="field-input" rows={2} value={reason} onChange={(e) => setReason(e.target.value)} />
      </div>
      {duplicateReason !== null && (
        <div>
          <label htmlFor="correction-duplicate" className="field-label">
            Why does this file belong to another cycle too? (e.g. one file holding several cycles)
          </label>
          <textarea id="correction-duplicate" className="field-input" rows={2} value={duplicateReason} onChange={(e) => setDuplicateReason(e.target.value)} />
        </div>
      )}
      <button type="submit" className="btn-secondary" disabled={busy || !changed}>
        {busy ? "Analysing…" : "Analyse again"}
      </button>
      <ActionMessage state={message} />
    </form>
  );
}
