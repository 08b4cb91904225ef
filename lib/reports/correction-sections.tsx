/** The report's record of outcome and corrections: a confirmed failure, a replaced logger file, shared files and every analysis made. */
import { View } from "@react-pdf/renderer";
import type { CycleDetail } from "@/lib/cycles/contracts";
import { Heading, T, TableHead, type Column } from "./parts";
import { s } from "./styles";
import { colour } from "./theme";
import { bothClocks } from "./time";

const banner = (border: string, background: string) => ({
  borderWidth: 1.2,
  borderColor: border,
  backgroundColor: background,
  borderRadius: 3,
  paddingVertical: 6,
  paddingHorizontal: 9,
  marginBottom: 8,
});

/** "FAILURE CONFIRMED by … on …": the test failed and the record is closed as a signed failure. */
export function FailureConfirmedBanner({ detail }: { detail: CycleDetail }) {
  if (detail.status !== "failure-confirmed") return null;
  const signature = [...detail.signatures].reverse().find((sig) => sig.meaning === "failure-confirmed");
  const when = signature ? bothClocks(signature.signedAt, detail.site.timeZone) : null;
  return (
    <View style={banner(colour.fail500, colour.fail50)} wrap={false}>
      <T style={[s.fail, { fontSize: 11, letterSpacing: 0.4 }]}>FAIL · FAILURE CONFIRMED</T>
      <T style={{ marginTop: 2 }}>
        {signature && when
          ? `Failure confirmed by ${signature.printedName} (${signature.role}) on ${when.site} (${when.utc}). The test failed; this record is closed as a signed failure and is not evidence of a pass.`
          : "The test failed; this record is closed as a signed failure."}
      </T>
    </View>
  );
}

/** Stated prominently: the logger file was replaced after the first analysis, with the first file's hash and how the recordings differ. */
export function ReplacementBanner({ detail }: { detail: CycleDetail }) {
  const replacement = detail.fileReplacement;
  if (!replacement) return null;
  return (
    <View style={banner(colour.caution500, colour.caution50)} wrap={false}>
      <T style={[s.caution, { fontSize: 9.6 }]}>{`Logger file replaced after the first analysis; first file SHA-256 ${replacement.first.sha256}`}</T>
      <T style={[s.small, { color: colour.caution700, marginTop: 2 }]}>
        {`First file: ${replacement.first.fileName}. Now analysed: ${replacement.current.fileName}, SHA-256 ${replacement.current.sha256}.`}
      </T>
      {replacement.differences.map((d) => (
        <T key={d} style={[s.small, { color: colour.caution700 }]}>
          {d}
        </T>
      ))}
      {detail.sharedFiles.map((f) => (
        <T key={`${f.sha256}-${f.cycleId}`} style={[s.small, { color: colour.caution700 }]}>
          {`${f.fileName} is the same file as cycle ${f.cycleNumber}: ${f.reason ?? "no reason recorded"}.`}
        </T>
      ))}
    </View>
  );
}

/** Files shared with another cycle, when no replacement banner already names them. */
export function SharedFilesNote({ detail }: { detail: CycleDetail }) {
  if (detail.fileReplacement || detail.sharedFiles.length === 0) return null;
  return (
    <View style={banner(colour.caution500, colour.caution50)} wrap={false}>
      {detail.sharedFiles.map((f) => (
        <T key={`${f.sha256}-${f.cycleId}`} style={[s.small, { color: colour.caution700 }]}>
          {`${f.fileName} (SHA-256 ${f.sha256}) is the same file as cycle ${f.cycleNumber}: ${f.reason ?? "no reason recorded"}.`}
        </T>
      ))}
    </View>
  );
}

const HISTORY_COLUMNS: Column[] = [
  { title: "When (site time)", width: 22 },
  { title: "By", width: 18 },
  { title: "Reason", width: 50 },
  { title: "Verdict", width: 10 },
];

/** Every analysis of the cycle, oldest first: when, who, why, verdict, and beneath it the file read with its SHA-256 on one line. */
export function AnalysisHistorySection({ detail }: { detail: CycleDetail }) {
  const oldestFirst = [...detail.analysisHistory].reverse();
  if (oldestFirst.length === 0) return null;
  return (
    <View>
      <View wrap={false}>
        <Heading>History of the analyses</Heading>
        <T style={[s.small, { marginBottom: 3 }]}>Every analysis made of this cycle stays on the record; a new one needs a reason. The current one is marked.</T>
        <TableHead columns={HISTORY_COLUMNS} />
      </View>
      <View style={s.table}>
        {oldestFirst.map((h, index) => (
          <View key={h.id} style={[s.tr, { flexDirection: "column" }]} wrap={false}>
            <View style={{ flexDirection: "row" }}>
              <T style={[s.td, { width: "22%" }]}>{`${bothClocks(h.createdAt, detail.site.timeZone).site}${h.id === detail.analysisId ? " (current)" : ""}`}</T>
              <T style={[s.td, { width: "18%" }]}>{h.createdByName ?? "—"}</T>
              <T style={[s.td, { width: "50%" }]}>{h.reason ?? (index === 0 ? "first analysis" : "—")}</T>
              <T style={[s.td, { width: "10%" }, h.verdict === "pass" ? s.pass : s.fail]}>{h.verdict === "pass" ? "PASS" : "FAIL"}</T>
            </View>
            <T style={[s.monoSmall, { paddingHorizontal: 3, paddingBottom: 3 }]}>{`${h.fileName} · SHA-256 ${h.fileSha256}`}</T>
          </View>
        ))}
      </View>
    </View>
  );
}

/** The instrument's calibration certificate in force on the cycle's date, for the report's facts. */
export function calibrationFacts(instrument: CycleDetail["instrument"]): Array<{ label: string; value: string; lapsed?: boolean }> {
  if (!instrument) return [];
  const c = instrument.calibration;
  if (!c) return [{ label: "Calibration", value: "no certificate dated on or before the cycle's date", lapsed: true }];
  return [
    { label: "Certificate", value: c.certificateNumber },
    { label: "Calibration due", value: c.lapsed ? `${c.dueOn}: LAPSED on the cycle's date (${c.testDate})` : c.dueOn, lapsed: c.lapsed },
  ];
}
