import { View } from "@react-pdf/renderer";
import { ROLE_LABELS, STUDY_SIGNATURE_MEANING_LABELS, type Role, type StudySignatureMeaning } from "@/lib/domain";
import { Heading, T } from "../parts";
import { s } from "../styles";
import { colour } from "../theme";
import { bothClocks } from "../time";
import type { StudyReportDetail } from "./model";

const MEANING_EXPLANATIONS: Record<StudySignatureMeaning, string> = {
  "protocol-approved": "an engineer other than the author approved the protocol and its criteria, which were frozen from then on.",
  "submitted-for-review": "the author declares the series complete and submits the study for review.",
  reviewed: "an engineer other than the author has reviewed the study, its runs, indicators and deviations.",
  "qa-approved": "a third engineer, neither author nor reviewer, approves the study for quality assurance.",
  failed: "an engineer other than the author closed the study as failed.",
  returned: "an engineer other than the author sent the study back to the author.",
};

/** The four signatures an approved study carries, in order; each one missing prints as an empty box. */
const EXPECTED: StudySignatureMeaning[] = ["protocol-approved", "submitted-for-review", "reviewed", "qa-approved"];

export function StudySignaturesSection({ detail, zone }: { detail: StudyReportDetail; zone: string }) {
  const sorted = [...detail.signatures].sort((a, b) => a.signedAt.localeCompare(b.signedAt));
  const missing = detail.status === "failed" ? [] : EXPECTED.filter((m) => !sorted.some((sig) => sig.meaning === m));
  return (
    <View>
      <Heading>Signatures</Heading>
      {sorted.map((sig) => {
        const when = bothClocks(sig.signedAt, zone);
        const ink = sig.meaning === "failed" ? colour.fail700 : sig.meaning === "returned" ? colour.caution700 : sig.meaning === "qa-approved" ? colour.pass700 : colour.ink;
        return (
          <View key={sig.id} style={s.signature} wrap={false}>
            <View style={{ flexDirection: "row", justifyContent: "space-between" }}>
              <View style={{ flex: 1 }}>
                <T style={s.signatureName}>{sig.printedName}</T>
                <T style={s.muted}>{`${ROLE_LABELS[sig.role as Role] ?? sig.role}${sig.meaning === "submitted-for-review" ? " · author" : ""}`}</T>
              </View>
              <View style={{ width: 210 }}>
                <T style={[s.small, { textAlign: "right" }]}>{`Signed ${when.utc}`}</T>
                <T style={[s.small, { textAlign: "right" }]}>{when.site}</T>
              </View>
            </View>
            <T style={[s.signatureMeaning, { color: ink }]}>{`${STUDY_SIGNATURE_MEANING_LABELS[sig.meaning]}: ${MEANING_EXPLANATIONS[sig.meaning]}`}</T>
            {sig.reason ? <T>{`Reason: ${sig.reason}`}</T> : null}
          </View>
        );
      })}
      {missing.map((m) => (
        <View key={m} style={s.signatureBlank} wrap={false}>
          <T>{`${STUDY_SIGNATURE_MEANING_LABELS[m]}: not signed yet.`}</T>
        </View>
      ))}
      <T style={s.caption}>Each signature was given with the signer{"'"}s password entered again; the signers are three different engineers (author, reviewer, quality assurance).</T>
    </View>
  );
}
