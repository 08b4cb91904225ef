/** The report's section for a logged air leakage test (DOMAIN.md §2.5): it replaces the thermometric sections. */
import { Circle, ClipPath, Defs, G, Line, Path, Rect, Svg, View } from "@react-pdf/renderer";
import type { AirLeakageResult, CycleDetail, SeriesResponse } from "@/lib/cycles/contracts";
import { leakChartGeometry, leakChartWindow } from "@/lib/cycles/air-leakage-chart";
import { formatElapsed } from "@/lib/cycles/chart-model";
import { basisNoteFor, formatDuration, formatLeakRate, formatPressure } from "@/lib/domain";
import { downsampleForReport } from "./downsample";
import { REPORT_CHART_POINTS } from "./model";
import { Heading, T, TableHead, type Column } from "./parts";
import { s } from "./styles";
import { SvgLabel } from "./svg";
import { CONTENT_WIDTH, colour } from "./theme";

const SOURCE_WORDS = { detected: "found in the trace", marked: "marked by the user", timed: "by the standard's timing" } as const;

function valueText(unit: AirLeakageResult["checks"][number]["unit"], value: number | null): string {
  if (value === null) return "not measured";
  if (unit === "kPa/min") return formatLeakRate(value);
  if (unit === "kPa") return formatPressure(value, { digits: 2, reference: "abs" });
  return formatDuration(value);
}

/** Readings, checks, warnings and the pressure chart of an air leakage test; `at` prints a time since the first sample with the site clock. */
export function AirLeakageSection({ analysis: a, detail, series, at }: { analysis: AirLeakageResult; detail: CycleDetail; series: SeriesResponse; at: (s: number) => string }) {
  const readings: Column[] = [
    { title: "Point", width: 30 },
    { title: "Time since first sample (site clock)", width: 30 },
    { title: "Chamber pressure", width: 18, numeric: true },
    { title: "How the time was found", width: 22 },
  ];
  const checks: Column[] = [
    { title: "Check", width: 26 },
    { title: "Result", width: 8 },
    { title: "Measured", width: 15, numeric: true },
    { title: "Limit", width: 15, numeric: true },
    { title: "Basis of the limit", width: 36 },
  ];
  const rows = [
    { point: "t1 / p1: valves closed, pump stopped", time: a.t1, p: a.p1, source: a.timeSources.t1 },
    { point: "t2 / p2: after the 5 min wait", time: a.t2, p: a.p2, source: a.timeSources.t2 },
    { point: "t3 / p3: 10 min later", time: a.t3, p: a.p3, source: a.timeSources.t3 },
  ];
  return (
    <View>
      <View wrap={false}>
        <Heading>Air leakage test: readings</Heading>
        <View style={s.table}>
          <TableHead columns={readings} />
          {rows.map((r) => (
            <View key={r.point} style={s.tr}>
              <T style={[s.td, { width: "30%" }, s.strong]}>{r.point}</T>
              <T style={[s.td, { width: "30%" }, s.mono]}>{at(r.time)}</T>
              <T style={[s.tdNum, { width: "18%" }]}>{r.p === null ? "not in the record" : formatPressure(r.p, { digits: 2, reference: "abs" })}</T>
              <T style={[s.td, { width: "22%" }]}>{SOURCE_WORDS[r.source]}</T>
            </View>
          ))}
        </View>
        <T style={s.caption}>
          {`Leak rate (p3 − p2) / 10 min = ${formatLeakRate(a.leakRate)}; rise during the wait (p2 − p1) ${a.stabilisationRise === null ? "—" : formatPressure(a.stabilisationRise, { digits: 2 })}; deepest vacuum ${formatPressure(a.vacuum.lowestKpaAbs, { digits: 2, reference: "abs" })} at ${at(a.vacuum.atS)}. ${a.findings.join(" ")}`}
        </T>
      </View>

      <View wrap={false}>
        <Heading>Checks against the acceptance limits</Heading>
        <View style={s.table}>
          <TableHead columns={checks} />
          {a.checks.map((c) => (
            <View key={c.id} style={s.tr}>
              <T style={[s.td, { width: "26%" }, s.strong]}>{c.label}</T>
              <T style={[s.td, { width: "8%" }, c.passed ? s.pass : s.fail]}>{c.passed ? "PASS" : "FAIL"}</T>
              <T style={[s.tdNum, { width: "15%" }]}>{valueText(c.unit, c.measured)}</T>
              <T style={[s.tdNum, { width: "15%" }]}>{`${c.comparison === "at-most" ? "at most" : "at least"} ${valueText(c.unit, c.limit)}`}</T>
              <T style={[s.td, { width: "36%", fontSize: 7.2, color: colour.inkSoft }]}>
                {detail.profile.basis === "local" ? basisNoteFor(c.id, detail.profile.basis, detail.profile.basisReason, 0) : c.basis}
              </T>
            </View>
          ))}
        </View>
      </View>

      {a.warnings.map((w) => (
        <View key={w} style={s.finding} wrap={false}>
          <T style={s.strong}>Needs a look</T>
          <T>{w}</T>
        </View>
      ))}

      <View wrap={false}>
        <Heading>Chamber pressure during the test</Heading>
        <View style={s.chartBox}>
          <LeakChart analysis={a} series={series} />
          <T style={s.caption}>
            {`Chamber pressure (kPa abs) from the logger file, ${series.totalSamples.toLocaleString("en-GB")} samples in the record. t1: the valves close (dashed: marked by the user); t2 after the 5 min wait; t3 10 min later. Dashed green: the vacuum set point, ${formatPressure(a.limits.vacuumSetPointKpaAbs, { digits: 1, reference: "abs" })}.`}
          </T>
        </View>
      </View>
    </View>
  );
}

function LeakChart({ analysis, series }: { analysis: AirLeakageResult; series: SeriesResponse }) {
  const window = leakChartWindow(analysis, series.timesS[series.timesS.length - 1] ?? analysis.t3);
  const width = CONTENT_WIDTH - 13;
  const height = 220;
  const g = leakChartGeometry(downsampleForReport(series, REPORT_CHART_POINTS, window.from, window.to), analysis, { width, height });
  return (
    <Svg width={width} height={height}>
      {g.pressureTicks.map((t) => (
        <G key={`p${t.kpa}`}>
          <Line x1={g.plot.x} x2={g.plot.x + g.plot.w} y1={t.y} y2={t.y} stroke={colour.inkLine} strokeWidth={0.4} />
          <SvgLabel x={g.plot.x - 4} y={t.y + 2} anchor="end" mono>
            {String(t.kpa)}
          </SvgLabel>
        </G>
      ))}
      {g.timeTicks.map((t) => (
        <SvgLabel key={`t${t.s}`} x={t.x} y={g.plot.y + g.plot.h + 10} anchor="middle" mono>
          {formatElapsed(t.s)}
        </SvgLabel>
      ))}
      <SvgLabel x={2} y={g.plot.y + 4}>
        kPa abs
      </SvgLabel>
      <SvgLabel x={g.plot.x + g.plot.w} y={height - 4} anchor="end">
        time since the first sample (min:s)
      </SvgLabel>
      {g.setPoint ? <Line x1={g.plot.x} x2={g.plot.x + g.plot.w} y1={g.setPoint.y} y2={g.setPoint.y} stroke={colour.pass500} strokeWidth={0.7} strokeDasharray="4 2" /> : null}
      <Defs>
        <ClipPath id="leak-plot">
          <Rect x={g.plot.x} y={g.plot.y} width={g.plot.w} height={g.plot.h} />
        </ClipPath>
      </Defs>
      <G clipPath="url(#leak-plot)">
        <Path d={g.path} stroke={colour.brass600} strokeWidth={1} fill="none" />
      </G>
      {g.marks.map((m) => (
        <G key={m.label}>
          <Line x1={m.x} x2={m.x} y1={g.plot.y} y2={g.plot.y + g.plot.h} stroke={colour.steam600} strokeWidth={0.7} strokeDasharray={m.source === "marked" ? "2 2" : undefined} />
          {m.y !== null ? <Circle cx={m.x} cy={m.y} r={2.6} fill={colour.paperRaised} stroke={colour.steam600} strokeWidth={1} /> : null}
          <SvgLabel x={m.x + 3} y={g.plot.y + 7} fill={colour.steam700} weight={600}>
            {m.label}
          </SvgLabel>
        </G>
      ))}
    </Svg>
  );
}
