/** The study report's sections, each a function of the study as the service gives it. */
import { View } from "@react-pdf/renderer";
import {
  formatDuration,
  INDICATOR_KIND_LABELS,
  INDICATOR_RESULT_LABELS,
  isPositiveIndicator,
  loadTypeLabel,
  plural,
  sensorPositionLabel,
  STUDY_KIND_LABELS,
  DEVIATION_SOURCE_LABELS,
  cycleStatusLabel,
} from "@/lib/domain";
import { Fact, Heading, T } from "../parts";
import { s } from "../styles";
import { fixed } from "../text";
import { colour } from "../theme";
import { bothClocks } from "../time";
import { breakReportNumber } from "../footer";
import { f0Text, personName, positionLabel, runEquilibrationText } from "./conclusion";
import type { StudyReportDetail } from "./model";
import { Caption, Table } from "./table";

type Props = { detail: StudyReportDetail; zone: string };
const judgementStyle = (j: string) => (j === "pass" ? s.pass : j === "fail" ? s.fail : s.caution);
const dateOf = (iso: string | null | undefined, zone: string) => bothClocks(iso, zone).site;

export function ProtocolSection({ detail, zone }: Props) {
  const { criteria, profile } = detail;
  const source = (from: "study" | "profile", what: string) => (from === "study" ? "set by this study's protocol" : `from the profile "${profile.name}" (${what})`);
  return (
    <View>
      <Heading>Protocol</Heading>
      <View style={s.facts}>
        <Fact label="Study">{`${detail.studyNumber}${detail.title ? `: ${detail.title}` : ""}`}</Fact>
        <Fact label="Kind">{STUDY_KIND_LABELS[detail.kind]}</Fact>
        <Fact label="Sterilizer">{detail.sterilizer.name}</Fact>
        <Fact label="Acceptance profile">{`${profile.name} (${fixed(profile.sterilizationTempC, 1)} °C, ${formatDuration(profile.holdingTimeS)})`}</Fact>
        <Fact label="Author">{detail.author.name}</Fact>
        <Fact label="Created">{dateOf(detail.createdAt, zone)}</Fact>
        <Fact label="Runs required">{`${plural(criteria.runsRequired, "consecutive passing run")}`}</Fact>
        <Fact label="Requalification">{`every ${plural(detail.requalificationMonths, "month")}${detail.loadingPattern.requalificationDueOn ? `; next due ${detail.loadingPattern.requalificationDueOn}` : ""}`}</Fact>
        <Fact
          label="Minimum F0"
          wide
        >{`${f0Text(criteria.minF0Min)} min at every load position, ${source(criteria.minF0Source, "its hold at Ts, as F0")}; Tref ${fixed(profile.f0ReferenceC, 1)} °C, z ${fixed(profile.f0ZK, 0)} K`}</Fact>
        <Fact label="Largest spread" wide>{`${fixed(criteria.maxSpreadK, 1)} K between positions during holding, ${source(criteria.maxSpreadSource, "its band")}`}</Fact>
        <Fact label="Indicators" wide>
          {criteria.indicatorsRequired
            ? "A biological indicator at every position of every run, read negative, before the run can pass; chemical indicators count when recorded."
            : "Not required; any indicator recorded must be negative."}
        </Fact>
      </View>
      {detail.protocol ? (
        <View style={{ marginTop: 5 }}>
          <T style={s.h3}>Protocol text</T>
          <T>{detail.protocol}</T>
        </View>
      ) : null}
    </View>
  );
}

export function PatternSection({ detail }: Props) {
  const pattern = detail.loadingPattern;
  return (
    <View>
      <Heading>Loading pattern</Heading>
      <View style={s.facts}>
        <Fact label="Pattern">{pattern.name}</Fact>
        <Fact label="Load type">{loadTypeLabel(pattern.loadType)}</Fact>
        <Fact label="Description" wide>
          {pattern.description || "—"}
        </Fact>
      </View>
      <T style={[s.h3, { marginTop: 6 }]}>Items</T>
      <Table
        columns={[
          { title: "Item", width: 45 },
          { title: "Quantity", width: 12, numeric: true },
          { title: "Note", width: 43 },
        ]}
        rows={pattern.items.map((item, i) => ({ key: `i${i}`, cells: [item.name, String(item.quantity), item.note ?? ""] }))}
        empty="No items are listed (an empty chamber)."
      />
      <T style={[s.h3, { marginTop: 6 }]}>Positions and sensor map</T>
      <SensorMapTable detail={detail} />
      <Caption>Each cell names the logger channel confirmed at that position when the run was attached.</Caption>
    </View>
  );
}

function SensorMapTable({ detail }: { detail: StudyReportDetail }) {
  const runs = detail.runs;
  const runWidth = runs.length > 0 ? Math.min(14, 52 / runs.length) : 0;
  const channelAt = (run: StudyReportDetail["runs"][number], positionId: string) =>
    Object.entries(run.sensorMap)
      .filter(([, p]) => p === positionId)
      .map(([header]) => header)
      .join(", ") || "none";
  return (
    <Table
      columns={[
        { title: "Position", width: 8 },
        { title: "Where", width: 100 - 8 - 18 - runWidth * runs.length },
        { title: "Chamber position", width: 18 },
        ...runs.map((r) => ({ title: `Run ${r.runNumber}`, width: runWidth })),
      ]}
      rows={detail.loadingPattern.positions.map((p) => ({
        key: p.id,
        cells: [
          { text: p.id, style: s.strong },
          `${p.label}${p.note ? ` (${p.note})` : ""}`,
          p.sensorPosition ? sensorPositionLabel(p.sensorPosition) : "—",
          ...runs.map((r) => {
            const channel = channelAt(r, p.id);
            return { text: channel, style: channel === "none" ? s.fail : s.mono };
          }),
        ],
      }))}
      empty="The pattern names no positions."
    />
  );
}

export function RunsSection({ detail, zone }: Props) {
  const judged = new Map(detail.summary.runs.map((r) => [r.runId, r]));
  return (
    <View>
      <Heading>Runs</Heading>
      <Table
        columns={[
          { title: "Run", width: 4 },
          { title: "Cycle", width: 17 },
          { title: "Started", width: 16 },
          { title: "Signed outcome", width: 12 },
          { title: "Equilibration", width: 12, numeric: true },
          { title: "Holding", width: 9, numeric: true },
          { title: "Cold spot (F0)", width: 13 },
          { title: "Spread", width: 8, numeric: true },
          { title: "Judgement", width: 9 },
        ]}
        rows={detail.runs.map((run) => {
          const r = judged.get(run.id);
          return {
            key: run.id,
            cells: [
              String(run.runNumber),
              // Cycle numbers are long and have no spaces: broken at their hyphens so they stay in their column.
              { text: breakReportNumber(run.cycleNumber, 17), style: s.monoSmall },
              dateOf(run.startedAt, zone),
              `${cycleStatusLabel(run.cycleStatus)}${run.cycleVerdict ? `, ${run.cycleVerdict.toUpperCase()}` : ""}`,
              runEquilibrationText(detail, run.id),
              run.holdingTimeS === undefined ? "—" : formatDuration(run.holdingTimeS),
              r?.coldSpot ? `${r.coldSpot.positionId}, ${f0Text(r.coldSpot.f0Min)} min` : "—",
              r?.spreadK === null || r?.spreadK === undefined ? "—" : `${fixed(r.spreadK, 2)} K`,
              { text: r ? r.judgement.toUpperCase() : "NOT JUDGED", style: judgementStyle(r?.judgement ?? "pending") },
            ],
          };
        })}
        empty="No run is attached yet."
      />
      {detail.summary.runs
        .filter((r) => r.reasons.length > 0)
        .map((r) => (
          <View key={r.runId} style={r.judgement === "fail" ? s.flag : s.finding} wrap={false}>
            <T style={s.strong}>{`Run ${r.runNumber} (cycle ${r.cycleNumber}): ${r.judgement === "fail" ? "failed" : "pending"}`}</T>
            {r.reasons.map((reason, i) => (
              <T key={i}>{reason}</T>
            ))}
          </View>
        ))}
      <Caption>
        {`Equilibration: the time from the plateau start until the position last to arrive reached ${fixed(detail.criteria.sterilizationTempC, 1)} °C. Spread: an upper bound of the spread between the run's load positions at any one instant during holding (conservative): the highest maximum minus the lowest minimum, or the cycle's own spread at its worst instant when that is smaller and covered every mapped probe.`}
      </Caption>
    </View>
  );
}

export function CrossRunSection({ detail }: Props) {
  const { summary, criteria } = detail;
  const runs = summary.runs.map((r) => r.runNumber);
  const runWidth = runs.length > 0 ? Math.min(11, 44 / runs.length) : 0;
  return (
    <View>
      <Heading>Across runs</Heading>
      <Table
        columns={[
          { title: "Position", width: 100 - 44 - runWidth * runs.length },
          ...runs.map((n) => ({ title: `F0 run ${n}`, width: runWidth, numeric: true })),
          { title: "Min F0 (min)", width: 11, numeric: true },
          { title: "Min (°C)", width: 10, numeric: true },
          { title: "Max (°C)", width: 10, numeric: true },
          { title: "Equil. (longest)", width: 13, numeric: true },
        ]}
        rows={summary.positions.map((p) => {
          const low = p.minF0 === null || p.minF0 < criteria.minF0Min;
          return {
            key: p.position,
            cells: [
              { text: `${p.position} ${p.label}`, style: summary.coldSpot?.position === p.position ? s.strong : {} },
              ...runs.map((n) => ({ text: f0Text(p.f0ByRun[n] ?? null), style: (p.f0ByRun[n] ?? -Infinity) < criteria.minF0Min ? s.fail : {} })),
              { text: f0Text(p.minF0), style: low ? s.fail : {} },
              fixed(p.minTemp, 2),
              fixed(p.maxTemp, 2),
              p.maxEquilibrationS === null ? "not reached" : formatDuration(p.maxEquilibrationS),
            ],
          };
        })}
        empty="No position has a reading yet."
      />
      <Caption>
        {`${
          summary.coldSpot
            ? `Cold spot over the study: ${positionLabel(detail, summary.coldSpot.position)}, lowest F0 ${f0Text(summary.coldSpot.minF0)} min; the cold spot in ${summary.coldSpot.runsAsColdSpot} of ${summary.coldSpot.runsCounted} runs. `
            : "No cold spot: no run has readings. "
        }Largest spread of a run: ${summary.spreadK === null ? "—" : `${fixed(summary.spreadK, 2)} K`} (limit ${fixed(criteria.maxSpreadK, 1)} K). F0 in minutes at Tref ${fixed(detail.profile.f0ReferenceC, 1)} °C, z ${fixed(detail.profile.f0ZK, 0)} K; temperatures during holding. Red: below the minimum F0 of ${f0Text(criteria.minF0Min)} min.${
          summary.unmappedPositions.length > 0 ? ` Positions without a channel in any run: ${summary.unmappedPositions.map((p) => p.id).join(", ")}.` : ""
        }`}
      </Caption>
    </View>
  );
}

export function IndicatorsSection({ detail, zone }: Props) {
  const runNumber = new Map(detail.runs.map((r) => [r.id, r.runNumber]));
  const rows = [...detail.indicators].sort((a, b) => (runNumber.get(a.runId) ?? 0) - (runNumber.get(b.runId) ?? 0) || a.positionId.localeCompare(b.positionId));
  return (
    <View>
      <Heading>Indicators</Heading>
      <Table
        columns={[
          { title: "Run", width: 5 },
          { title: "Position", width: 8 },
          { title: "Kind", width: 10 },
          { title: "Organism, lot, population, incubation", width: 31 },
          { title: "Result", width: 16 },
          { title: "Read by, at", width: 30 },
        ]}
        rows={rows.map((i) => ({
          key: i.id,
          cells: [
            String(runNumber.get(i.runId) ?? "?"),
            i.positionId,
            i.kind === "biological" ? "biological" : "chemical",
            [i.organism, i.lot ? `lot ${i.lot}` : null, i.population !== null && i.population !== "" ? `population ${i.population}` : null, i.incubation].filter(Boolean).join(", ") || "—",
            { text: `${INDICATOR_RESULT_LABELS[i.result]}${i.current ? "" : " (superseded)"}`, style: !i.current ? s.muted : isPositiveIndicator(i.result) ? s.fail : s.pass },
            `${i.readBy ?? "—"}, ${dateOf(i.readAt, zone)}${i.reason ? `; correction: ${i.reason}` : ""}`,
          ],
        }))}
        empty="No indicator result is recorded."
      />
      <Caption>{`${INDICATOR_KIND_LABELS.biological}s: growth is positive; ${INDICATOR_KIND_LABELS.chemical.toLowerCase()}s: not changed as specified is positive. A positive indicator fails its run. A correction adds a row; the latest per run, position and kind counts, earlier ones are marked superseded.`}</Caption>
    </View>
  );
}

export function DeviationsSection({ detail, zone }: Props) {
  const runNumber = new Map(detail.runs.map((r) => [r.id, r.runNumber]));
  return (
    <View>
      <Heading>Deviations</Heading>
      {detail.deviations.length === 0 ? <T style={s.muted}>No deviation was opened.</T> : null}
      {detail.deviations.map((d, n) => (
        <View key={d.id} style={[s.signature, { borderColor: d.status === "open" ? colour.fail500 : colour.inkFaint }]} wrap={false}>
          <View style={{ flexDirection: "row", justifyContent: "space-between" }}>
            <T style={s.strong}>{`Deviation ${n + 1}: ${DEVIATION_SOURCE_LABELS[d.source]}${d.runId ? ` (run ${runNumber.get(d.runId) ?? "?"})` : ""}`}</T>
            <T style={d.status === "open" ? s.fail : s.pass}>{d.status === "open" ? "OPEN" : "CLOSED"}</T>
          </View>
          <T>{d.what}</T>
          <T style={s.small}>{`Opened ${dateOf(d.openedAt, zone)} by ${personName(d.openedBy)}`}</T>
          <T>{`Impact: ${d.impact || "not yet assessed"}`}</T>
          <T>{`Root cause: ${d.rootCause || "not yet found"}`}</T>
          <T>{`Corrective and preventive action: ${d.capaReference || "none referenced"}`}</T>
          {d.status === "closed" ? <T>{`Closed ${dateOf(d.closedAt, zone)} by ${personName(d.closedBy)}: ${d.closeReason ?? "—"}`}</T> : null}
        </View>
      ))}
    </View>
  );
}
