import type { ReactNode } from "react";
import { Document, Line, Page, Rect, Svg, View } from "@react-pdf/renderer";
import { isAirLeakage, thermometricOf, type AnalysisResult, type Check, type SaturationFlag } from "@/lib/analysis/types";
import type { CycleDetail, SeriesResponse, SignatureView } from "@/lib/cycles/contracts";
import { formatElapsed } from "@/lib/cycles/chart-model";
import { downsampleForReport, strideIndexes } from "./downsample";
import { REPORT_CHART_POINTS, REPORT_PHASE_POINTS, type ReportModel } from "./model";
import { PhaseChart } from "./phase-chart";
import { s } from "./styles";
import {
  basisNoteFor,
  CYCLE_STATUS_EXPLANATIONS,
  cycleStatusLabel,
  describeBasis,
  formatDuration,
  formatVolume,
  loadTypeLabel,
  plural,
  PROFILE_BASIS_LABELS,
  SIGNATURE_MEANING_LABELS,
  testKindLabel,
} from "@/lib/domain";
import { bytes, fixed, pdfText, signed } from "./text";
import { CONTENT_WIDTH, colour, loadChannelStyle, seriesStyle } from "./theme";
import { bothClocks, instantOf, siteClockAt } from "./time";
import { TimeChart } from "./time-chart";
import { DraftWatermark } from "./watermark";
import { ReportFooter } from "./footer";
import { Fact, Heading, SafetyNotesSection, T, TableHead, type Column } from "./parts";
import { ChannelsSection, RecordInputSection } from "./record-sections";
import { BowieDickSection } from "./bowie-dick-section";
import { AirLeakageSection } from "./air-leakage-section";
import { LedgerHeadRow } from "./integrity";
import { AnalysisHistorySection, calibrationFacts, FailureConfirmedBanner, ReplacementBanner, SharedFilesNote } from "./correction-sections";

const verdictColours = {
  pass: { border: colour.pass500, background: colour.pass50, ink: colour.pass700, word: "PASS", caption: "VERDICT" },
  fail: { border: colour.fail500, background: colour.fail50, ink: colour.fail700, word: "FAIL", caption: "VERDICT" },
  none: { border: colour.caution500, background: colour.caution50, ink: colour.caution700, word: "NO RESULT", caption: "NOT ANALYSED" },
};

function measuredText(check: Check): string {
  if (check.measured === null) return "not measured";
  if (check.unit === "s") return formatDuration(check.measured);
  return `${fixed(check.measured, 2)} ${check.unit}`;
}

function limitText(check: Check): string {
  if (check.limit === null) return "—";
  const value = check.unit === "s" ? formatDuration(check.limit) : `${fixed(check.limit, check.unit === "K" ? 1 : 2)} ${check.unit}`;
  if (check.id === "saturation") return `within ±${fixed(check.limit, 1)} K`;
  return `${check.comparison === "at-most" ? "at most" : "at least"} ${value}`;
}

// What each signature means, after its name from lib/domain (the same words as the record page).
const MEANING_EXPLANATIONS: Record<SignatureView["meaning"], string> = {
  reviewed: "the signer has reviewed this record and its analysis.",
  approved: "the signer approves this record and its verdict.",
  "failure-confirmed": "the signer confirms that this test failed; the record is closed as a signed failure.",
  returned: "the signer sends this record back to be corrected and submitted again.",
  rejected: "the signer sent this record back to be corrected before it could be approved.",
};
const meaningText = (meaning: SignatureView["meaning"]) => `${SIGNATURE_MEANING_LABELS[meaning]}: ${MEANING_EXPLANATIONS[meaning]}`;

const statusText = (status: string) => {
  const explanation = CYCLE_STATUS_EXPLANATIONS[status as CycleDetail["status"]];
  return explanation ? `${cycleStatusLabel(status)}: ${explanation}` : cycleStatusLabel(status);
};

function Legend({ series }: { series: SeriesResponse }) {
  let loadIndex = 0;
  const items: Array<{ key: string; label: string; swatch: ReactNode }> = [];
  const lineSwatch = (stroke: string, width: number, dash?: string) => (
    <Svg width={16} height={6}>
      <Line x1={0} x2={16} y1={3} y2={3} stroke={stroke} strokeWidth={width + 0.3} strokeDasharray={dash} />
    </Svg>
  );
  for (const c of series.channels) {
    if (c.role === "reference") items.push({ key: c.header, label: `${c.header} (reference)`, swatch: lineSwatch(seriesStyle.reference.stroke, seriesStyle.reference.width) });
  }
  for (const c of series.channels) {
    if (c.role !== "load") continue;
    const st = loadChannelStyle(loadIndex++);
    items.push({ key: c.header, label: c.header, swatch: lineSwatch(st.stroke, seriesStyle.load.width, st.dash) });
  }
  if (series.channels.some((c) => c.role === "saturation")) {
    items.push({
      key: "sat",
      label: "Saturation temperature from chamber pressure (IAPWS-IF97)",
      swatch: lineSwatch(seriesStyle.saturation.stroke, seriesStyle.saturation.width, seriesStyle.saturation.dash),
    });
  }
  if (series.channels.some((c) => c.kind === "pressure")) {
    items.push({ key: "p", label: "Chamber pressure (right axis)", swatch: lineSwatch(seriesStyle.pressure.stroke, seriesStyle.pressure.width, seriesStyle.pressure.dash) });
  }
  items.push({
    key: "band",
    label: `Sterilization band ${fixed(series.band.low, 1)} to ${fixed(series.band.high, 1)} °C`,
    swatch: (
      <Svg width={16} height={7}>
        <Rect x={0} y={0} width={16} height={7} fill={colour.pass50} stroke={colour.pass500} strokeWidth={0.5} strokeDasharray="2 1" />
      </Svg>
    ),
  });
  if (series.plateau) items.push({ key: "plateau", label: "Plateau start and end", swatch: lineSwatch(colour.brass600, 0.7, "2 1.5") });
  if (series.flags.length > 0)
    items.push({
      key: "flag",
      label: "Saturation flag",
      swatch: (
        <Svg width={16} height={7}>
          <Rect x={0} y={0} width={16} height={7} fill={colour.fail50} />
          <Rect x={0} y={0} width={16} height={2} fill={colour.fail500} />
        </Svg>
      ),
    });
  return (
    <View style={s.legend}>
      {items.map((item) => (
        <View key={item.key} style={s.legendItem} wrap={false}>
          {item.swatch}
          <T style={s.legendLabel}>{item.label}</T>
        </View>
      ))}
    </View>
  );
}

function phaseSeries(series: SeriesResponse): SeriesResponse {
  const plateau = series.plateau;
  let from: number | undefined;
  let to: number | undefined;
  if (plateau) {
    from = series.timesS.findIndex((t) => t >= plateau.start);
    const after = series.timesS.findIndex((t) => t > plateau.end);
    to = after < 0 ? series.timesS.length - 1 : after - 1;
    if (from < 0) from = to = undefined;
  }
  const keep = strideIndexes(series.timesS.length, REPORT_PHASE_POINTS, from, to);
  return { ...series, timesS: keep.map((i) => series.timesS[i]), channels: series.channels.map((c) => ({ ...c, values: keep.map((i) => c.values[i]) })) };
}

/** The plateau with a margin either side; without a plateau, the span around the reference's highest reading. */
function holdingWindow(series: SeriesResponse, first: number, last: number): { from: number; to: number } | null {
  const plateau = series.plateau;
  if (plateau) {
    const margin = Math.max(30, (plateau.end - plateau.start) * 0.15);
    return { from: Math.max(first, plateau.start - margin), to: Math.min(last, plateau.end + margin) };
  }
  const reference = series.channels.find((c) => c.role === "reference");
  if (!reference || series.timesS.length < 2) return null;
  let peakAt = -1;
  for (let i = 0; i < reference.values.length; i++) {
    const v = reference.values[i];
    if (v !== null && (peakAt < 0 || v > (reference.values[peakAt] as number))) peakAt = i;
  }
  if (peakAt < 0) return null;
  const half = Math.max(120, (last - first) * 0.06);
  const centre = series.timesS[peakAt];
  return { from: Math.max(first, centre - half), to: Math.min(last, centre + half) };
}

type FindingItem = { title: string; text: string };

function Finding({ item }: { item: FindingItem }) {
  return (
    <View style={s.finding} wrap={false}>
      <T style={s.strong}>{item.title}</T>
      <T>{item.text}</T>
    </View>
  );
}

function flagSide(flag: SaturationFlag): string {
  return flag.kind === "below" ? "Colder than saturated steam" : "Hotter than saturated steam";
}

type AnalysisOf = AnalysisResult;

function FlagBlock({ flag, index, at }: { flag: SaturationFlag; index: number; at: (s: number) => string }) {
  return (
    <View style={s.flag} wrap={false}>
      <T style={s.strong}>{`Flag ${index + 1}: ${flagSide(flag)}, ${at(flag.start)} to ${at(flag.end)}, ${formatDuration(flag.durationS)}, worst ${signed(flag.worst, 2)} K`}</T>
      <T>{flag.diagnosis}</T>
    </View>
  );
}

function FlagsSection({ analysis, at }: { analysis: AnalysisOf; at: (s: number) => string }) {
  const flags = analysis.saturation.flags;
  const none = analysis.plateau
    ? `None: throughout the plateau the reference stayed within ±${fixed(analysis.limits.saturationLimitK, 1)} K of the saturation temperature at the chamber pressure (deviation from ${signed(analysis.saturation.lowestDeviation, 2)} to ${signed(analysis.saturation.highestDeviation, 2)} K).`
    : "None: there was no plateau to judge.";
  return (
    <View>
      <View wrap={false}>
        <Heading>Saturation flags</Heading>
        {flags.length === 0 ? <T style={s.muted}>{none}</T> : <FlagBlock flag={flags[0]} index={0} at={at} />}
      </View>
      {flags.slice(1).map((f, i) => (
        <FlagBlock key={`flag-${i + 1}`} flag={f} index={i + 1} at={at} />
      ))}
    </View>
  );
}

function RecordSection({ detail }: { detail: CycleDetail }) {
  const analysis = detail.analysis;
  const currentAnalysis = detail.analysisHistory.find((a) => a.id === detail.analysisId);
  return (
    <View>
      <View wrap={false}>
        <Heading>Instrument, files and analysis</Heading>
        <View style={s.facts}>
          <Fact label="Instrument">{detail.instrument ? detail.instrument.name : "not recorded"}</Fact>
          <Fact label="Instrument serial">
            <T style={s.mono}>{detail.instrument?.serialNumber ?? "—"}</T>
          </Fact>
          {calibrationFacts(detail.instrument).map((f) => (
            <Fact key={f.label} label={f.label}>
              <T style={f.lapsed ? s.fail : s.mono}>{f.value}</T>
            </Fact>
          ))}
          {analysis ? (
            <>
              <Fact label="Samples">{`${analysis.record.samples.toLocaleString("en-GB")} over ${formatDuration(analysis.record.durationS)}`}</Fact>
              <Fact label="Sample interval">{`${fixed(analysis.record.medianSampleIntervalS, 2)} s (median)`}</Fact>
              {analysis.kind === "air-leakage" ? null : (
                <Fact label="Plateaus found">{`${analysis.plateausFound}${analysis.plateauIndex !== null ? `; number ${analysis.plateauIndex + 1} analysed` : ""}`}</Fact>
              )}
              <Fact label="Analysis engine">
                <T style={s.mono}>{analysis.engineVersion}</T>
              </Fact>
            </>
          ) : null}
          <Fact label="Analysis id" wide>
            <T style={s.mono}>{detail.analysisId ?? "—"}</T>
          </Fact>
          {currentAnalysis ? (
            <Fact label="Analysis input" wide>
              <T style={s.mono}>{`SHA-256 ${currentAnalysis.inputHash}`}</T>
            </Fact>
          ) : null}
        </View>
      </View>
      <T style={[s.h3, { marginTop: 6 }]}>{detail.files.length === 1 ? "Logger file" : "Logger files"}</T>
      {detail.files.length === 0 ? (
        <T style={s.muted}>No logger file is attached.</T>
      ) : (
        detail.files.map((f) => (
          <View key={f.id} style={[s.tr, { flexDirection: "column", paddingVertical: 3 }]} wrap={false}>
            <View style={{ flexDirection: "row", justifyContent: "space-between" }}>
              <T style={[s.mono, s.strong]}>{f.name}</T>
              <T style={s.small}>{`${bytes(f.size)} · uploaded ${bothClocks(f.uploadedAt, detail.site.timeZone).site} by ${f.uploadedBy}`}</T>
            </View>
            <T style={s.monoSmall}>{`SHA-256 ${f.sha256}`}</T>
          </View>
        ))
      )}
    </View>
  );
}

function SignatureBlock({ sig, zone }: { sig: SignatureView; zone: string }) {
  const when = bothClocks(sig.signedAt, zone);
  return (
    <View style={s.signature} wrap={false}>
      <View style={{ flexDirection: "row", justifyContent: "space-between" }}>
        <View style={{ flex: 1 }}>
          <T style={s.signatureName}>{sig.printedName}</T>
          <T style={s.muted}>{sig.role}</T>
        </View>
        <View style={{ width: 210 }}>
          <T style={[s.small, { textAlign: "right" }]}>{`Signed ${when.utc}`}</T>
          <T style={[s.small, { textAlign: "right" }]}>{when.site}</T>
        </View>
      </View>
      <T
        style={[
          s.signatureMeaning,
          {
            color:
              sig.meaning === "failure-confirmed"
                ? colour.fail700
                : sig.meaning === "returned" || sig.meaning === "rejected"
                  ? colour.caution700
                  : sig.meaning === "approved"
                    ? colour.pass700
                    : colour.ink,
          },
        ]}
      >
        {meaningText(sig.meaning)}
      </T>
      {sig.reason ? <T>{`Reason: ${sig.reason}`}</T> : null}
      <T style={[s.monoSmall, { marginTop: 3 }]}>{`Bundle SHA-256 ${sig.bundleHash}`}</T>
      <T style={[s.small, sig.valid ? { color: colour.pass700 } : s.fail]}>
        {sig.valid ? "Verified when this report was made: the bundle recomputed from the record matches the signed hash." : "DOES NOT VERIFY: the record has changed since this signature was given."}
      </T>
    </View>
  );
}

function SignaturesSection({ signatures, zone }: { signatures: SignatureView[]; zone: string }) {
  return (
    <View>
      <View wrap={false}>
        <Heading>Signatures</Heading>
        <T style={[s.small, { marginBottom: 5 }]}>
          Each electronic signature shows the signer{"'"}s printed name, the date and time of signing and what the signature means (21 CFR 11.50). It is bound to this record by the SHA-256 of the
          record{"'"}s signed bundle: file hashes, analysis figures and cycle fields; a change to any of them stops the signature verifying (21 CFR 11.70).
        </T>
        {signatures.length === 0 ? (
          <View style={s.signatureBlank}>
            <T>No electronic signature yet. This record has not been reviewed or approved.</T>
          </View>
        ) : (
          <SignatureBlock sig={signatures[0]} zone={zone} />
        )}
      </View>
      {signatures.slice(1).map((sig) => (
        <SignatureBlock key={sig.id} sig={sig} zone={zone} />
      ))}
    </View>
  );
}

export function CycleReportDocument({ model }: { model: ReportModel }) {
  const { detail, series, reportNumber, generatedAt, verifyHint, draft } = model;
  // Each test kind has its own section: a Bowie-Dick cycle is judged by its indicator sheet and an air leakage test by its
  // pressure trace; neither prints the thermometric findings.
  const judged = model.bowieDick === undefined ? detail.analysis : null;
  const leak = isAirLeakage(judged) ? judged : null;
  const analysis = thermometricOf(judged);
  const zone = detail.site.timeZone;
  const startIso = detail.startedAt ?? series.startedAt ?? judged?.record.startedAt ?? null;
  const start = startIso ? instantOf(startIso, zone) : null;
  const started = bothClocks(startIso, zone);
  const generated = bothClocks(generatedAt, zone);
  const verdictKey = judged ? judged.verdict : "none";
  const v = verdictColours[verdictKey];
  const clockAt = (offsetS: number) => (start ? `${siteClockAt(start, offsetS, zone)}` : null);
  const at = (offsetS: number | null | undefined) => {
    if (offsetS === null || offsetS === undefined) return "—";
    const clock = clockAt(offsetS);
    return clock ? `${formatElapsed(offsetS)} (${clock})` : formatElapsed(offsetS);
  };
  // Plateau start and end as elapsed time, with the site's clock time beneath.
  const plateauReadout = analysis?.plateau
    ? {
        value: `${formatElapsed(analysis.plateau.start)}–${formatElapsed(analysis.plateau.end)}`,
        note: start ? `${clockAt(analysis.plateau.start)}–${clockAt(analysis.plateau.end)} site time` : "since first sample",
      }
    : { value: "none", note: "never reached Ts" };

  const first = series.timesS[0] ?? 0;
  const last = series.timesS[series.timesS.length - 1] ?? first + 1;
  const chartSeries = downsampleForReport(series, REPORT_CHART_POINTS);
  const plateau = series.plateau;
  const detailWindow = holdingWindow(series, first, last);
  const detailSeries = detailWindow ? downsampleForReport(series, REPORT_CHART_POINTS / 2, detailWindow.from, detailWindow.to) : null;
  const limits = analysis?.limits;
  const detailDomain: [number, number] = [series.band.low - 3, series.band.high + 2];

  const flagDiagnoses = new Set(analysis?.saturation.flags.map((f) => f.diagnosis) ?? []);
  const checkLabel = new Map((analysis?.checks ?? []).map((c) => [c.id, c.label]));
  const failures: FindingItem[] = (analysis?.diagnoses ?? []).filter((d) => !flagDiagnoses.has(d.text)).map((d) => ({ title: checkLabel.get(d.checkId) ?? d.checkId, text: d.text }));
  const flags = analysis?.saturation.flags ?? [];
  if (flags.length > 0) {
    failures.push({
      title: checkLabel.get("saturation") ?? "Saturation",
      text: `${plural(flags.length, "saturation flag")}: ${flags
        .map((f) => `${f.kind === "below" ? "colder" : "hotter"} than saturated steam from ${at(f.start)} to ${at(f.end)}, worst ${signed(f.worst, 2)} K`)
        .join("; ")}. Each flag's diagnosis is under "Saturation flags".`,
    });
  }
  const lowestF0 = analysis && analysis.channels.length > 0 ? Math.min(...analysis.channels.map((c) => c.f0)) : null;
  const timeNote = start ? `0 = ${started.site}` : undefined;

  const checkColumns: Column[] = [
    { title: "Check", width: 25 },
    { title: "Result", width: 8 },
    { title: "Measured", width: 13, numeric: true },
    { title: "Limit", width: 18, numeric: true },
    { title: "Basis of the limit", width: 36 },
  ];

  return (
    <Document
      title={pdfText(`Papin cycle report ${reportNumber}: ${detail.sterilizer.name}, cycle ${detail.cycleNumber}`)}
      author="Papin"
      subject={pdfText(`${detail.site.name}: ${testKindLabel(detail.testKind)}`)}
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
            <T style={s.headerTitle}>Steam sterilizer cycle report</T>
          </View>
          <T style={s.headerRight}>{`Report ${reportNumber}`}</T>
        </View>
        {draft ? (
          <View style={s.draftBanner} fixed>
            <T style={s.draftBannerStrong}>DRAFT — NOT APPROVED</T>
            <T style={s.draftBannerText}>Not approved by an engineer. Not a record for release or for the sterilizer{"'"}s file.</T>
          </View>
        ) : null}
        <ReportFooter reportNumber={reportNumber} about={`Cycle ${detail.cycleNumber} · ${detail.sterilizer.name} · ${detail.site.name}`} />

        <View style={s.titleBlock}>
          <T style={s.title}>{`Cycle ${detail.cycleNumber} · ${testKindLabel(detail.testKind)}`}</T>
          <T style={s.subtitle}>{`${detail.sterilizer.name} at ${detail.site.name}`}</T>
          <T style={s.titleMeta}>{`Started ${started.site}  ·  Status: ${statusText(detail.status)}`}</T>
        </View>

        {model.bowieDick !== undefined ? (
          <BowieDickSection sheet={model.bowieDick} zone={zone} />
        ) : (
          <View style={[s.verdict, { borderColor: v.border, backgroundColor: v.background }]} wrap={false}>
            <View style={s.verdictWordBox}>
              <T style={[s.verdictCaption, { color: v.ink }]}>{v.caption}</T>
              <T style={[s.verdictWord, { color: v.ink }, verdictKey === "none" ? { fontSize: 18 } : {}]}>{v.word}</T>
            </View>
            <View style={[s.verdictBody, { borderLeftColor: v.border }]}>
              <T style={s.verdictSummary}>{judged ? judged.summary : "This cycle has no analysis yet, so it has no verdict."}</T>
              {judged ? (
                <T style={[s.small, { marginTop: 3 }]}>
                  {`${judged.checks.filter((c) => c.passed).length} of ${plural(judged.checks.length, "check")} passed against the acceptance profile "${detail.profile.name}".`}
                </T>
              ) : null}
            </View>
          </View>
        )}

        <FailureConfirmedBanner detail={detail} />
        <ReplacementBanner detail={detail} />
        <SharedFilesNote detail={detail} />

        {failures.length > 0 ? (
          <View style={{ marginBottom: 5 }}>
            <View wrap={false}>
              <Heading>What failed and why</Heading>
              <Finding item={failures[0]} />
            </View>
            {failures.slice(1).map((item, i) => (
              <Finding key={`finding-${i}`} item={item} />
            ))}
          </View>
        ) : null}

        {analysis ? (
          <View style={s.readouts} wrap={false}>
            {[
              { label: "Plateau", ...plateauReadout },
              { label: "Equilibration", value: formatDuration(analysis.equilibrationTime), note: `limit ${formatDuration(limits?.maxEquilibrationS)}` },
              { label: "Holding", value: formatDuration(analysis.holdingTime), note: `at least ${formatDuration(limits?.holdingTimeS)}` },
              {
                label: "Ref. − Tsat",
                value: analysis.saturation.maxDeviation === null ? "—" : `${fixed(analysis.saturation.maxDeviation, 2)} K`,
                note: `largest, limit ±${fixed(limits?.saturationLimitK, 1)} K`,
              },
              { label: "F0, lowest", value: lowestF0 === null ? "—" : `${fixed(lowestF0, 1)} min`, note: `Tref ${fixed(limits?.f0ReferenceC, 1)} °C, z ${fixed(limits?.f0ZK, 0)} K` },
            ].map((r, i) => (
              <View key={r.label} style={i === 0 ? s.readout : [s.readout, s.readoutGap]}>
                <T style={s.readoutLabel}>{r.label}</T>
                <T style={s.readoutValue}>{r.value}</T>
                <T style={s.readoutNote}>{r.note}</T>
              </View>
            ))}
          </View>
        ) : null}

        <Heading>Site, sterilizer and cycle</Heading>
        <View style={s.facts}>
          <Fact label="Site">{detail.site.name}</Fact>
          <Fact label="Site time zone">{zone}</Fact>
          <Fact label="Sterilizer">{detail.sterilizer.name}</Fact>
          <Fact label="Serial number">
            <T style={s.mono}>{detail.sterilizer.serialNumber}</T>
          </Fact>
          <Fact label="Chamber volume">{formatVolume(detail.sterilizer.chamberVolumeL)}</Fact>
          <Fact label="Cycle number">
            <T style={s.mono}>{detail.cycleNumber}</T>
          </Fact>
          <Fact label="Test kind">{testKindLabel(detail.testKind)}</Fact>
          <Fact label="Acceptance profile">{`${detail.profile.name} (${fixed(detail.profile.sterilizationTempC, 1)} °C, ${formatDuration(detail.profile.holdingTimeS)}), basis ${PROFILE_BASIS_LABELS[detail.profile.basis]}`}</Fact>
          <Fact label="Load" wide>
            {detail.loadDescription || "—"}
          </Fact>
          <Fact label="Test pack or load">{loadTypeLabel(detail.loadType)}</Fact>
          <Fact label="Lot or batch">{detail.loadLot || "not recorded"}</Fact>
          <Fact label="Started (site)">{started.site}</Fact>
          <Fact label="Started (UTC)">{started.utc}</Fact>
          <Fact label="Uploaded by">{detail.createdBy.name}</Fact>
          <Fact label="Instrument">{detail.instrument ? `${detail.instrument.name}, serial ${detail.instrument.serialNumber}` : "not recorded"}</Fact>
        </View>

        {model.bowieDick !== undefined ? null : leak ? <AirLeakageSection analysis={leak} detail={detail} series={series} at={at} /> : <Heading>Checks against the acceptance limits</Heading>}
        {analysis ? (
          <View style={s.table}>
            <TableHead columns={checkColumns} />
            {analysis.checks.map((c) => (
              <View key={c.id} style={s.tr} wrap={false}>
                <T style={[s.td, { width: "25%" }, s.strong]}>{c.label}</T>
                <T style={[s.td, { width: "8%" }, c.passed ? s.pass : s.fail]}>{c.passed ? "PASS" : "FAIL"}</T>
                <T style={[s.tdNum, { width: "13%" }]}>{measuredText(c)}</T>
                <T style={[s.tdNum, { width: "18%" }]}>{limitText(c)}</T>
                <T style={[s.td, { width: "36%", fontSize: 7.2, color: colour.inkSoft }]}>{basisNoteFor(c.id, detail.profile.basis, detail.profile.basisReason, detail.profile.sterilizationTempC)}</T>
              </View>
            ))}
          </View>
        ) : leak ? null : (
          <T style={s.muted}>No analysis: no checks were run.</T>
        )}
        {limits ? (
          <T style={s.caption}>
            {`Limits as configured in the acceptance profile "${detail.profile.name}", basis ${describeBasis(detail.profile.basis, detail.profile.basisReason)}. Saturation temperature from chamber pressure by IAPWS-IF97. F0 at ${fixed(limits.f0ReferenceC, 1)} °C with z = ${fixed(limits.f0ZK, 0)} K.`}
          </T>
        ) : null}

        {leak ? null : (
          <View wrap={false}>
            <Heading>The cycle against time</Heading>
            {series.timesS.length > 1 ? (
              <View style={s.chartBox}>
                <TimeChart id="whole" series={chartSeries} width={CONTENT_WIDTH - 13} height={250} fromS={first} toS={last} showPressure labelPlateau timeAxisNote={timeNote} />
                <Legend series={series} />
                <T style={s.caption}>
                  {`${series.totalSamples.toLocaleString("en-GB")} samples${analysis ? ` about every ${fixed(analysis.record.medianSampleIntervalS, analysis.record.medianSampleIntervalS % 1 === 0 ? 0 : 1)} s` : ""}, drawn as vector lines${chartSeries.fullResolution ? " at full resolution" : ", each interval keeping its highest and lowest reading so no peak or dip is lost"}. Saturation temperature is computed from the chamber pressure; it is missing where the pressure is outside water's liquid–vapour line.`}
                </T>
              </View>
            ) : (
              <T style={s.muted}>No chart data.</T>
            )}
          </View>
        )}

        {!leak && series.timesS.length > 1 ? (
          <View style={{ flexDirection: "row", marginTop: 8 }} wrap={false}>
            <View style={[s.chartBox, { width: 292 }]}>
              <T style={s.h3}>{plateau ? "Holding in detail" : "Around the highest reading"}</T>
              {detailSeries && detailWindow ? (
                <TimeChart
                  id="detail"
                  series={detailSeries}
                  width={280}
                  height={196}
                  fromS={detailWindow.from}
                  toS={detailWindow.to}
                  temperatureDomain={detailDomain}
                  showPressure={false}
                  labelPlateau
                />
              ) : (
                <T style={s.muted}>No data to draw.</T>
              )}
              <T style={s.caption}>
                {`${
                  plateau
                    ? `The band (${fixed(series.band.low, 1)} to ${fixed(series.band.high, 1)} °C) and the plateau with a margin either side.`
                    : `No plateau: the reference never reached ${fixed(series.band.low, 1)} °C. Shown: the minutes around its highest reading, against the band (${fixed(series.band.low, 1)} to ${fixed(series.band.high, 1)} °C).`
                } Lines leaving the plot are outside ${fixed(detailDomain[0], 0)} to ${fixed(detailDomain[1], 0)} °C.`}
              </T>
            </View>
            <View style={[s.chartBox, { width: CONTENT_WIDTH - 292 - 8, marginLeft: 8 }]}>
              <T style={s.h3}>Phase diagram of water</T>
              <PhaseChart
                series={phaseSeries(series)}
                width={CONTENT_WIDTH - 292 - 8 - 13}
                height={196}
                sterilizationTempC={series.band.low}
                bandK={series.band.high - series.band.low}
                saturationLimitK={limits?.saturationLimitK ?? detail.profile.saturationLimitK}
              />
              <T style={s.caption}>
                {`The liquid–vapour line (IAPWS-IF97, solid), ±${fixed(limits?.saturationLimitK ?? detail.profile.saturationLimitK, 1)} K shaded, and the cycle's path (grey). Plateau samples as dots: green on the line, teal on the liquid side, red on the vapour side.`}
              </T>
            </View>
          </View>
        ) : null}

        {analysis ? <ChannelsSection analysis={analysis} band={series.band} positions={detail.positions} /> : null}
        {analysis ? <RecordInputSection analysis={analysis} at={at} /> : null}
        {analysis ? <FlagsSection analysis={analysis} at={at} /> : null}
        <RecordSection detail={detail} />
        <AnalysisHistorySection detail={detail} />
        <SignaturesSection signatures={detail.signatures} zone={zone} />

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
              <T style={s.identityLabel}>Cycle record</T>
              <T style={s.mono}>{detail.id}</T>
            </View>
            {model.ledgerHead ? <LedgerHeadRow head={model.ledgerHead} /> : null}
            <View style={[s.identityRow, { marginTop: 4 }]}>
              <T style={s.identityLabel}>How to verify</T>
              <T style={{ flex: 1 }}>{verifyHint}</T>
            </View>
            <T style={[s.small, { marginTop: 3, marginLeft: 92 }]}>
              {draft
                ? "This is a draft. Only the copy rendered at approval is archived; a draft never verifies as an archived report."
                : "At approval this report was rendered once and its SHA-256 archived. Only a byte-for-byte copy verifies; a re-export, print-out, scan or edited file does not."}
            </T>
          </View>
        </View>

        <SafetyNotesSection />
      </Page>
    </Document>
  );
}
