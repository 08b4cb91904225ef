"use client";

import { useRouter } from "next/navigation";
import { useState, type FormEvent } from "react";
import { PERIODIC_SIGNATURE_MEANING_LABELS, PERIODIC_SIGNATURE_MEANINGS, type PeriodicSignatureMeaning } from "@/lib/domain";
import { fetchJson } from "@/lib/client/fetch-json";
import { IDLE_FORM_STATE, type FormState } from "@/lib/form-state";
import { ActionMessage } from "@/components/ui/action-message";

/** Which meanings fit the recorded result: a pass is approved, a fail confirmed as a failure; either may be returned. */
const fits = (meaning: PeriodicSignatureMeaning, result: "pass" | "fail") => meaning === "returned" || (meaning === "approved" ? result === "pass" : result === "fail");

/** An engineer's electronic signature on a periodic-test record: meaning, reason and the re-entered password. */
export function PeriodicSignForm({ recordId, result, signerName }: { recordId: string; result: "pass" | "fail"; signerName: string }) {
  const router = useRouter();
  const [meaning, setMeaning] = useState<PeriodicSignatureMeaning>(result === "pass" ? "approved" : "failure-confirmed");
  const [reason, setReason] = useState("");
  const [password, setPassword] = useState("");
  const [busy, setBusy] = useState(false);
  const [message, setMessage] = useState<FormState>(IDLE_FORM_STATE);

  async function sign(event: FormEvent) {
    event.preventDefault();
    if (meaning === "returned" && !reason.trim()) return setMessage({ status: "error", message: "Give the reason for returning this record, so whoever recorded it knows what to correct." });
    if (!password) return setMessage({ status: "error", message: "Enter your password: signing needs it every time." });
    setBusy(true);
    setMessage(IDLE_FORM_STATE);
    try {
      const signed = await fetchJson<{ printedName: string; status: string }>(`/api/periodic-tests/${recordId}/signatures`, {
        json: { password, meaning, reason: reason.trim() || null },
        what: "the signature",
      });
      setPassword("");
      setMessage({ status: "ok", message: `Signed by ${signed.printedName}: ${PERIODIC_SIGNATURE_MEANING_LABELS[meaning].split(":")[0].toLowerCase()}.` });
      router.refresh();
    } catch (error) {
      setMessage({ status: "error", message: error instanceof Error ? error.message : "Something went wrong." });
    } finally {
      setBusy(false);
    }
  }

  return (
    <form onSubmit={sign} className="space-y-3" aria-label="Electronic signature">
      <fieldset>
        <legend className="field-label">Meaning of your signature</legend>
        <div className="space-y-1">
          {PERIODIC_SIGNATURE_MEANINGS.map((m) => {
            const blocked = !fits(m, result);
            return (
              <label key={m} className={`flex items-start gap-2 text-sm ${blocked ? "opacity-50" : ""}`}>
                <input type="radio" name="meaning" value={m} checked={meaning === m} disabled={blocked} onChange={() => setMeaning(m)} className="mt-1" />
                <span>
                  {PERIODIC_SIGNATURE_MEANING_LABELS[m]}
                  {blocked && (
                    <span className="block text-xs text-ink-muted">{result === "pass" ? "The test passed; there is no failure to confirm." : "The test failed; it cannot be approved."}</span>
                  )}
                </span>
              </label>
            );
          })}
        </div>
      </fieldset>
      <div>
        <label htmlFor="pt-sign-reason" className="field-label">
          Reason {meaning === "returned" ? "(required)" : "(optional)"}
        </label>
        <textarea id="pt-sign-reason" className="field-input" rows={2} value={reason} onChange={(e) => setReason(e.target.value)} />
      </div>
      <div>
        <label htmlFor="pt-sign-password" className="field-label">
          Your password (re-entered to sign)
        </label>
        <input id="pt-sign-password" type="password" autoComplete="current-password" className="field-input" value={password} onChange={(e) => setPassword(e.target.value)} />
      </div>
      <p className="text-xs text-ink-muted">
        Signing as <strong>{signerName}</strong>. Your printed name, role, the meaning, the reason, the time (UTC) and a SHA-256 of this record, its photo included, are stored with the signature.
      </p>
      <button type="submit" className="btn-primary" disabled={busy}>
        {busy ? "Signing…" : "Sign"}
      </button>
      <ActionMessage state={message} />
    </form>
  );
}
