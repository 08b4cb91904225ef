"use client";

import { useRouter } from "next/navigation";
import { useState } from "react";
import type { CycleDetail } from "@/lib/cycles/contracts";
import { isEditableCycleStatus, isLockedCycleStatus, SIGNATURE_MEANING_LABELS, SIGNING_MEANINGS, type Role, type SigningMeaning } from "@/lib/domain";
import { fetchJson } from "@/lib/client/fetch-json";
import { IDLE_FORM_STATE, type FormState } from "@/lib/form-state";
import { ActionMessage } from "@/components/ui/action-message";
import { SignatureList } from "./signature-list";

const MEANING_STATEMENTS: Record<SigningMeaning, string> = {
  reviewed: "I have reviewed this record; the decision stays open.",
  approved: "I approve this test as passed and accept it as evidence. The record will be locked and its report archived.",
  "failure-confirmed": "I confirm that this test failed. The record closes as a signed failure, locked, with its report archived marked FAIL.",
  returned: "I return this cycle to the technician to correct a data or entry problem, for the reason given.",
};

/** Why a meaning cannot be chosen for this cycle by this engineer; null when it can. */
function blockedBecause(meaning: SigningMeaning, detail: CycleDetail, contributed: boolean): string | null {
  if (meaning === "approved" && detail.verdict !== "pass") return "The analysis failed, so this cycle cannot be approved: confirm the failure or return it.";
  if (meaning === "failure-confirmed" && detail.verdict !== "fail") return "The analysis passed: there is no failure to confirm.";
  if ((meaning === "approved" || meaning === "failure-confirmed") && contributed) return "You gave this cycle an input (file, analysis or details); another engineer must decide it.";
  return null;
}

function firstOpenMeaning(detail: CycleDetail, contributed: boolean): SigningMeaning {
  const preferred: SigningMeaning = detail.verdict === "pass" ? "approved" : "failure-confirmed";
  return blockedBecause(preferred, detail, contributed) ? "returned" : preferred;
}

export function SignOffPanel({ detail, actor, contributed }: { detail: CycleDetail; actor: { id: string; role: Role; name: string }; contributed: boolean }) {
  const router = useRouter();
  const [busy, setBusy] = useState(false);
  const [message, setMessage] = useState<FormState>(IDLE_FORM_STATE);
  const [meaning, setMeaning] = useState<SigningMeaning>(firstOpenMeaning(detail, contributed));
  const [reason, setReason] = useState("");
  const [password, setPassword] = useState("");
  const [acknowledged, setAcknowledged] = useState(false);

  const editable = isEditableCycleStatus(detail.status);
  const canSubmit = (actor.role === "technician" || actor.role === "engineer") && editable && !!detail.analysis;
  const canSign = actor.role === "engineer" && detail.status === "submitted";
  const differences = detail.fileReplacement?.differences ?? [];
  const needsAcknowledgement = differences.length > 0 && (meaning === "approved" || meaning === "failure-confirmed");

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
    if (meaning === "returned" && !reason.trim()) {
      setMessage({ status: "error", message: "Give the reason for returning the cycle, so the technician knows what to correct." });
      return;
    }
    if (needsAcknowledgement && !acknowledged) {
      setMessage({ status: "error", message: "Acknowledge the replaced logger file before you sign." });
      return;
    }
    if (!password) {
      setMessage({ status: "error", message: "Enter your password: signing needs it every time." });
      return;
    }
    void run(async () => {
      const s = await fetchJson<{ printedName: string; signedAt: string }>(`/api/cycles/${detail.id}/signatures`, {
        json: { password, meaning, reason: reason.trim() || null, acknowledgeReplacement: needsAcknowledgement ? acknowledged : undefined },
        what: "the signature",
      });
      return `Signed "${SIGNATURE_MEANING_LABELS[meaning]}" by ${s.printedName} at ${new Date(s.signedAt).toUTCString()}.`;
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
        <SignatureList signatures={detail.signatures} />

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
              {detail.status === "returned" ? "Submit the corrected cycle again" : "Submit for review"}
            </button>
            <p className="mt-1 text-xs text-ink-muted">Submitting sends the record to the site&apos;s validation engineers.</p>
          </div>
        )}

        {canSign && (
          <form onSubmit={sign} className="space-y-3 rounded-md border border-steam-100 bg-steam-50/40 p-3" aria-label="Electronic signature">
            <fieldset>
              <legend className="field-label">Meaning of your signature</legend>
              <div className="space-y-1">
                {SIGNING_MEANINGS.map((m) => {
                  const blocked = blockedBecause(m, detail, contributed);
                  return (
                    <label key={m} className={`flex items-start gap-2 ${blocked ? "opacity-50" : ""}`}>
                      <input type="radio" name="meaning" value={m} checked={meaning === m} disabled={!!blocked} onChange={() => setMeaning(m)} className="mt-1" />
                      <span>
                        <span className="font-medium">{SIGNATURE_MEANING_LABELS[m]}</span>
                        <span className="block text-xs text-ink-muted">{blocked ?? MEANING_STATEMENTS[m]}</span>
                      </span>
                    </label>
                  );
                })}
              </div>
            </fieldset>
            {needsAcknowledgement && (
              <label className="flex items-start gap-2 rounded-md border border-caution-500/40 bg-caution-50 p-2 text-xs">
                <input type="checkbox" checked={acknowledged} onChange={(e) => setAcknowledged(e.target.checked)} className="mt-0.5" />
                <span>I have seen that the logger file was replaced after the first analysis and that the recordings differ: {differences.join(" ")}</span>
              </label>
            )}
            <div>
              <label htmlFor="sign-reason" className="field-label">
                Reason {meaning === "returned" ? "(required)" : "(optional)"}
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

        {isLockedCycleStatus(detail.status) && (
          <p className="text-xs text-ink-muted">
            {detail.status === "approved" ? "Approved" : "Closed as a signed failure"}: the record is locked. A correction is a new cycle that refers to this one.
          </p>
        )}

        <ActionMessage state={message} />
      </div>
    </section>
  );
}
