"use client";

import { useRouter } from "next/navigation";
import { useState } from "react";
import type { CycleDetail } from "@/lib/cycles/contracts";
import { SIGNATURE_MEANING_LABELS, SIGNATURE_MEANINGS, type Role, type SignatureMeaning, type Verdict } from "@/lib/domain";
import { fetchJson } from "@/lib/client/fetch-json";
import { IDLE_FORM_STATE, type FormState } from "@/lib/form-state";
import { ActionMessage } from "@/components/ui/action-message";

const MEANING_STATEMENTS: Record<SignatureMeaning, string> = {
  reviewed: "I have reviewed this record; the decision stays open.",
  approved: "I approve this test cycle as meeting its acceptance profile. The record will be locked and its report archived.",
  rejected: "I return this cycle to the technician for correction, for the reason given.",
};

export function SignOffPanel({ detail, actor }: { detail: CycleDetail; actor: { id: string; role: Role; name: string } }) {
  const router = useRouter();
  const [busy, setBusy] = useState(false);
  const [message, setMessage] = useState<FormState>(IDLE_FORM_STATE);
  const [meaning, setMeaning] = useState<SignatureMeaning>(detail.verdict === "pass" && detail.createdBy.id !== actor.id ? "approved" : detail.verdict === "pass" ? "reviewed" : "rejected");
  const [reason, setReason] = useState("");
  const [password, setPassword] = useState("");
  const [correction, setCorrection] = useState<File | null>(null);

  const canSubmit = (actor.role === "technician" || actor.role === "engineer") && (detail.status === "draft" || detail.status === "rejected") && !!detail.analysis;
  const canSign = actor.role === "engineer" && detail.status === "submitted";
  const ownUpload = detail.createdBy.id === actor.id;
  const canCorrect = (actor.role === "technician" || actor.role === "engineer") && (detail.status === "draft" || detail.status === "rejected");

  async function run(action: () => Promise<string>) {
    setBusy(true);
    setMessage(IDLE_FORM_STATE);
    try {
      setMessage({ status: "ok", message: await action() });
      setPassword("");
      router.refresh();
    } catch (error) {
      setMessage({ status: "error", message: error instanceof Error ? error.message : "Something went wrong." });
    } finally {
      setBusy(false);
    }
  }

  const submit = () => run(async () => (await fetchJson(`/api/cycles/${detail.id}/submit`, { method: "POST", what: "the submission" }), "Submitted: the site's engineers have been notified."));

  const sign = (event: React.FormEvent) => {
    event.preventDefault();
    if (meaning === "rejected" && !reason.trim()) {
      setMessage({ status: "error", message: "Give the reason for rejecting, so the technician knows what to correct." });
      return;
    }
    if (!password) {
      setMessage({ status: "error", message: "Enter your password: signing needs it every time." });
      return;
    }
    void run(async () => {
      const s = await fetchJson<{ printedName: string; signedAt: string }>(`/api/cycles/${detail.id}/signatures`, {
        json: { password, meaning, reason: reason.trim() || null },
        what: "the signature",
      });
      return `Signed "${SIGNATURE_MEANING_LABELS[meaning]}" by ${s.printedName} at ${new Date(s.signedAt).toUTCString()}.`;
    });
  };

  const correct = (event: React.FormEvent) => {
    event.preventDefault();
    if (!correction) return;
    void run(async () => {
      const form = new FormData();
      form.set("file", correction);
      const data = await fetchJson<{ analysis: { verdict: Verdict } }>(`/api/cycles/${detail.id}/analyses`, { form, what: "the new analysis" });
      setCorrection(null);
      return `New analysis: ${data.analysis.verdict === "pass" ? "pass" : "fail"}. The earlier analysis stays in the history.`;
    });
  };

  return (
    <section className="panel" aria-labelledby="sign-off-title" data-testid="sign-off">
      <header className="border-b border-ink-line px-panel py-3">
        <h2 id="sign-off-title" className="text-base font-semibold">
          Review and signatures
        </h2>
      </header>
      <div className="space-y-4 px-panel py-4 text-sm">
        {detail.signatures.length === 0 ? (
          <p className="text-ink-muted">No signature yet.</p>
        ) : (
          <ol className="space-y-2" data-testid="signatures">
            {detail.signatures.map((s) => (
              <li key={s.id} className="rounded-md border border-ink-line px-3 py-2">
                <p className="font-medium">
                  {SIGNATURE_MEANING_LABELS[s.meaning]} — {s.printedName} <span className="font-normal text-ink-muted">({s.role})</span>
                </p>
                <p className="text-xs text-ink-muted">{new Date(s.signedAt).toISOString().replace("T", " ").slice(0, 19)} UTC</p>
                {s.reason && <p className="mt-1">Reason: {s.reason}</p>}
                <p className={`mt-1 text-xs ${s.valid ? "text-pass-700" : "text-fail-700"}`}>
                  {s.valid ? "✓ Signature verifies against the record as stored" : `✕ Signature no longer matches the record: ${s.problem ?? "the record has changed."} Investigate.`}
                </p>
                <p className="mono mt-0.5 break-all text-ink-faint">{s.bundleHash}</p>
              </li>
            ))}
          </ol>
        )}

        <p className="flex flex-wrap gap-2">
          <a className="btn-secondary" href={`/api/cycles/${detail.id}/report`} target="_blank" rel="noreferrer">
            {detail.report ? "Open the archived report (PDF)" : "Open a draft report (PDF)"}
          </a>
        </p>
        {detail.report && (
          <p className="text-xs text-ink-muted">
            Report <span className="mono">{detail.report.reportNumber}</span>, SHA-256 <span className="mono break-all">{detail.report.sha256}</span>
          </p>
        )}

        {canSubmit && (
          <div>
            <button type="button" className="btn-primary" onClick={submit} disabled={busy}>
              {detail.status === "rejected" ? "Submit the corrected cycle again" : "Submit for review"}
            </button>
            <p className="mt-1 text-xs text-ink-muted">Submitting sends the record to the site&apos;s validation engineers.</p>
          </div>
        )}

        {canSign && (
          <form onSubmit={sign} className="space-y-3 rounded-md border border-steam-100 bg-steam-50/40 p-3" aria-label="Electronic signature">
            <fieldset>
              <legend className="field-label">Meaning of your signature</legend>
              <div className="space-y-1">
                {SIGNATURE_MEANINGS.map((m) => {
                  const failing = m === "approved" && detail.verdict !== "pass";
                  const blocked = m === "approved" && (ownUpload || failing);
                  return (
                    <label key={m} className={`flex items-start gap-2 ${blocked ? "opacity-50" : ""}`}>
                      <input type="radio" name="meaning" value={m} checked={meaning === m} disabled={blocked} onChange={() => setMeaning(m)} className="mt-1" />
                      <span>
                        <span className="font-medium">{SIGNATURE_MEANING_LABELS[m]}</span>
                        <span className="block text-xs text-ink-muted">
                          {failing ? "The analysis failed, so this cycle cannot be approved." : blocked ? "You uploaded this cycle; another engineer must approve it." : MEANING_STATEMENTS[m]}
                        </span>
                      </span>
                    </label>
                  );
                })}
              </div>
            </fieldset>
            <div>
              <label htmlFor="sign-reason" className="field-label">
                Reason {meaning === "rejected" ? "(required)" : "(optional)"}
              </label>
              <textarea id="sign-reason" className="field-input" rows={2} value={reason} onChange={(e) => setReason(e.target.value)} />
            </div>
            <div>
              <label htmlFor="sign-password" className="field-label">
                Your password (re-entered to sign)
              </label>
              <input id="sign-password" type="password" autoComplete="current-password" className="field-input" value={password} onChange={(e) => setPassword(e.target.value)} />
            </div>
            <p className="text-xs text-ink-muted">
              Signing as <strong>{actor.name}</strong>. Your printed name, the meaning, the time (UTC) and a hash of this record are stored with the signature and printed on the report; the signature
              is your own and equals a handwritten one.
            </p>
            <button type="submit" className="btn-primary" disabled={busy}>
              {busy ? "Signing…" : "Sign"}
            </button>
          </form>
        )}

        {canCorrect && (
          <form onSubmit={correct} className="space-y-2" aria-label="Correct the logger file">
            <label htmlFor="correction-file" className="field-label">
              Correct with a new logger file
            </label>
            <input id="correction-file" type="file" accept=".csv,.txt,.tsv,.dat,.log" onChange={(e) => setCorrection(e.target.files?.[0] ?? null)} className="block text-sm" />
            <button type="submit" className="btn-secondary" disabled={busy || !correction}>
              Analyse the new file
            </button>
          </form>
        )}

        {detail.status === "approved" && <p className="text-xs text-ink-muted">Approved records are locked. A correction is a new cycle that refers to this one.</p>}

        <ActionMessage state={message} />
      </div>
    </section>
  );
}
