import { Document, Page, View } from "@react-pdf/renderer";
import { plural, STUDY_KIND_LABELS, STUDY_STATUS_LABELS } from "@/lib/domain";
import { ReportFooter } from "../footer";
import { Heading, SafetyNotesSection, T } from "../parts";
import { s } from "../styles";
import { fixed, pdfText } from "../text";
import { CONTENT_WIDTH, colour } from "../theme";
import { bothClocks } from "../time";
import { DraftWatermark } from "../watermark";
import { f0Text, studyConclusion } from "./conclusion";
import { StudyHeatMap } from "./heat-map";
import { STUDY_REPORT_VERIFY_HINT, type StudyReportDetail, type StudyReportOptions } from "./model";
import { CrossRunSection, DeviationsSection, IndicatorsSection, PatternSection, ProtocolSection, RunsSection } from "./sections";
import { StudySignaturesSection } from "./signatures";

const TONES = {
  pass: { border: colour.pass500, background: colour.pass50, ink: colour.pass700 },
  fail: { border: colour.fail500, background: colour.fail50, ink: colour.fail700 },
  open: { border: colour.caution500, background: colour.caution50, ink: colour.caution700 },
};

export function StudyReportDocument({ detail, options }: { detail: StudyReportDetail; options: StudyReportOptions }) {
  const { reportNumber, generatedAt, draft } = options;
  const zone = options.site?.timeZone ?? "UTC";
  const siteName = options.site?.name;
  const conclusion = studyConclusion(detail);
  const tone = TONES[conclusion.tone];
  const { summary, criteria } = detail;
  const openDeviations = detail.deviations.filter((d) => d.status === "open").length;
  const generated = bothClocks(generatedAt, zone);
  const labels = Object.fromEntries(detail.loadingPattern.positions.map((p) => [p.id, `${p.id} ${p.label}`]));
  const readouts = [
    { label: "Consecutive passing runs", value: `${summary.consecutive.passing} of ${summary.consecutive.required}`, note: summary.consecutive.complete ? "series complete" : "series not complete" },
    {
      label: "Cold spot",
      value: summary.coldSpot ? summary.coldSpot.position : "—",
      note: summary.coldSpot ? `in ${summary.coldSpot.runsAsColdSpot} of ${summary.coldSpot.runsCounted} runs` : "no readings",
    },
    { label: "Lowest F0", value: summary.coldSpot ? `${f0Text(summary.coldSpot.minF0)} min` : "—", note: `at least ${f0Text(criteria.minF0Min)} min` },
    { label: "Largest spread", value: summary.spreadK === null ? "—" : `${fixed(summary.spreadK, 2)} K`, note: `at most ${fixed(criteria.maxSpreadK, 1)} K` },
    { label: "Deviations", value: `${openDeviations} open`, note: `${plural(detail.deviations.length, "deviation")} in all` },
  ];
  return (
    <Document
      title={pdfText(`Papin study report ${reportNumber}: ${detail.studyNumber}, ${detail.sterilizer.name}`)}
      author="Papin"
      subject={pdfText(`${siteName ? `${siteName}: ` : ""}${STUDY_KIND_LABELS[detail.kind]}`)}
      keywords={pdfText(`${reportNumber} ${detail.id}`)}
      creator="Papin"
      producer="Papin"
      language="en-GB"
      creationDate={new Date(generatedAt)}
      modificationDate={new Date(generatedAt)}
    >
      <Page size="A4" style={draft ? [s.page, s.draftPage] : s.page}>
        {draft ? <DraftWatermark /> : null}
        <View style={s.header} fixed>
          <View style={{ flexDirection: "row", alignItems: "flex-end" }}>
            <T style={s.brand}>PAPIN</T>
            <T style={s.headerTitle}>Qualification study report</T>
          </View>
          <T style={s.headerRight}>{`Report ${reportNumber}`}</T>
        </View>
        {draft ? (
          <View style={s.draftBanner} fixed>
            <T style={s.draftBannerStrong}>DRAFT — NOT APPROVED</T>
            <T style={s.draftBannerText}>Not approved by quality assurance. Not a record for release or for the sterilizer{"'"}s file.</T>
          </View>
        ) : null}
        <ReportFooter reportNumber={reportNumber} about={`Study ${detail.studyNumber} · ${detail.sterilizer.name}${siteName ? ` · ${siteName}` : ""}`} />

        <View style={s.titleBlock}>
          <T style={s.title}>{`Study ${detail.studyNumber} · ${STUDY_KIND_LABELS[detail.kind]}`}</T>
          <T style={s.subtitle}>{`${detail.title ? `${detail.title} · ` : ""}${detail.loadingPattern.name} in ${detail.sterilizer.name}${siteName ? ` at ${siteName}` : ""}`}</T>
          <T style={s.titleMeta}>{`Status: ${STUDY_STATUS_LABELS[detail.status]}  ·  Author ${detail.author.name}`}</T>
        </View>

        <View style={[s.verdict, { borderColor: tone.border, backgroundColor: tone.background }]} wrap={false}>
          <View style={[s.verdictWordBox, { width: 150 }]}>
            <T style={[s.verdictCaption, { color: tone.ink }]}>{conclusion.caption}</T>
            <T style={[s.verdictWord, { color: tone.ink, fontSize: conclusion.word.length > 8 ? 17 : 26 }]}>{conclusion.word}</T>
          </View>
          <View style={[s.verdictBody, { borderLeftColor: tone.border }]}>
            <T style={s.verdictSummary}>{conclusion.sentence}</T>
          </View>
        </View>

        <View style={s.readouts} wrap={false}>
          {readouts.map((r, i) => (
            <View key={r.label} style={i === 0 ? s.readout : [s.readout, s.readoutGap]}>
              <T style={s.readoutLabel}>{r.label}</T>
              <T style={s.readoutValue}>{r.value}</T>
              <T style={s.readoutNote}>{r.note}</T>
            </View>
          ))}
        </View>

        <ProtocolSection detail={detail} zone={zone} />
        <PatternSection detail={detail} zone={zone} />
        <RunsSection detail={detail} zone={zone} />
        <CrossRunSection detail={detail} zone={zone} />

        <View wrap={false}>
          <Heading>Heat map: F0 by position and run</Heading>
          {summary.runs.length > 0 && summary.positions.length > 0 ? (
            <View style={s.chartBox}>
              <StudyHeatMap summary={summary} minF0={criteria.minF0Min} width={CONTENT_WIDTH - 13} labels={labels} />
            </View>
          ) : (
            <T style={s.muted}>No run to draw yet.</T>
          )}
        </View>

        <IndicatorsSection detail={detail} zone={zone} />
        <DeviationsSection detail={detail} zone={zone} />

        <View wrap={false}>
          <Heading>Conclusion</Heading>
          <T>{conclusion.sentence}</T>
        </View>

        <StudySignaturesSection detail={detail} zone={zone} />

        <View wrap={false}>
          <Heading>This report and how to verify it</Heading>
          <View style={s.identity}>
            <View style={s.identityRow}>
              <T style={s.identityLabel}>Report number</T>
              <T style={[s.mono, { fontSize: 11, fontWeight: 500 }]}>{reportNumber}</T>
            </View>
            <View style={s.identityRow}>
              <T style={s.identityLabel}>Generated</T>
              <T>{`${generated.utc}  ·  ${generated.site}`}</T>
            </View>
            <View style={s.identityRow}>
              <T style={s.identityLabel}>Study record</T>
              <T style={s.mono}>{detail.id}</T>
            </View>
            <View style={[s.identityRow, { marginTop: 4 }]}>
              <T style={s.identityLabel}>How to verify</T>
              <T style={{ flex: 1 }}>{STUDY_REPORT_VERIFY_HINT}</T>
            </View>
            <T style={[s.small, { marginTop: 3, marginLeft: 92 }]}>
              {draft
                ? "This is a draft. Only the copy rendered at QA approval is archived; a draft never verifies as an archived report."
                : "At QA approval this report was rendered once and its SHA-256 archived. Only a byte-for-byte copy verifies; a re-export, print-out, scan or edited file does not."}
            </T>
          </View>
        </View>

        <SafetyNotesSection />
      </Page>
    </Document>
  );
}
