/** The report's channel table and what the record brings and how it was read (issue 9 rule 12). */
import { View } from "@react-pdf/renderer";
import type { AnalysisResult, ChannelPosition, SeriesResponse } from "@/lib/cycles/contracts";
import { channelRoleLabel, gapLines, missingCell, NOT_RECORDED, recordInputRows } from "@/lib/cycles/record-input";
import { formatDuration, sensorPositionLabel } from "@/lib/domain";
import { Heading, T, TableHead, type Column } from "./parts";
import { s } from "./styles";
import { fixed } from "./text";
import { colour } from "./theme";

type AnalysisOf = AnalysisResult;

/** Each channel with where its probe sat (position and note), its role and its figures in °C. */
export function ChannelsSection({ analysis, band, positions }: { analysis: AnalysisOf; band: SeriesResponse["band"]; positions: ChannelPosition[] }) {
  const columns: Column[] = [
    { title: "Channel", width: 14 },
    { title: "Position and note", width: 22 },
    { title: "Role", width: 9 },
    { title: "Min in holding (°C)", width: 10, numeric: true },
    { title: "Max in holding (°C)", width: 10, numeric: true },
    { title: "Mean in holding (°C)", width: 10, numeric: true },
    { title: "F0 (min)", width: 7, numeric: true },
    { title: "At Ts after plateau start", width: 11, numeric: true },
    { title: "Missing", width: 7, numeric: true },
  ];
  const placeOf = new Map(positions.map((p) => [p.header, p]));
  const placeText = (header: string) => {
    const place = placeOf.get(header);
    if (!place?.position) return "NOT RECORDED";
    return place.note ? `${sensorPositionLabel(place.position)}: ${place.note}` : sensorPositionLabel(place.position);
  };
  const hold = analysis.saturationTemperatureDuringHold;
  const unrecorded = analysis.channels.some((c) => c.missing === undefined);
  return (
    // Up to two dozen channels the table stays on one page; longer ones run on with the header repeated.
    <View wrap={analysis.channels.length > 24}>
      <Heading>Channels during holding</Heading>
      <View style={s.table}>
        <TableHead columns={columns} />
        {analysis.channels.map((c) => {
          const low = c.minDuringHold !== null && c.minDuringHold < band.low;
          const high = c.maxDuringHold !== null && c.maxDuringHold > band.high;
          return (
            <View key={c.header} style={s.tr} wrap={false}>
              <T style={[s.td, { width: "14%" }, c.role === "reference" ? s.strong : {}]}>{c.header}</T>
              <T style={[s.td, { width: "22%" }, placeOf.get(c.header)?.position ? {} : { color: colour.caution700 }]}>{placeText(c.header)}</T>
              <T style={[s.td, { width: "9%" }]}>{channelRoleLabel(c.role).toLowerCase()}</T>
              <T style={[s.tdNum, { width: "10%" }, low ? s.fail : {}]}>{fixed(c.minDuringHold, 2)}</T>
              <T style={[s.tdNum, { width: "10%" }, high ? s.fail : {}]}>{fixed(c.maxDuringHold, 2)}</T>
              <T style={[s.tdNum, { width: "10%" }]}>{fixed(c.meanDuringHold, 2)}</T>
              <T style={[s.tdNum, { width: "7%" }]}>{fixed(c.f0, 2)}</T>
              <T style={[s.tdNum, { width: "11%" }]}>{c.arrivalAfterPlateauStart === null ? "never" : formatDuration(c.arrivalAfterPlateauStart)}</T>
              <T style={[s.tdNum, { width: "7%" }, c.missing ? { color: colour.caution700 } : {}]}>{missingCell(c)}</T>
            </View>
          );
        })}
      </View>
      <T style={s.caption}>
        {`Holding: from the moment every channel has reached ${fixed(band.low, 1)} °C to the end of the plateau. F0 over the whole record. Figures in red lie outside the band.${
          hold ? ` Saturation temperature from chamber pressure during holding: ${fixed(hold.min, 2)} to ${fixed(hold.max, 2)} °C (mean ${fixed(hold.mean, 2)} °C).` : ""
        } Reference channel: ${analysis.referenceChannel}; pressure channel: ${analysis.pressureChannel}. Missing: blank cells of the channel in the whole record${unrecorded ? ` (${NOT_RECORDED})` : ""}.`}
      </T>
    </View>
  );
}

const GAP_COLUMNS: Column[] = [
  { title: "Gap from", width: 24 },
  { title: "to", width: 24 },
  { title: "Length", width: 14, numeric: true },
  { title: "What is missing", width: 38 },
];

/** Sampling interval, gaps with their times, missing readings, pressure reference ("assumed" as a caution) and atmosphere. */
export function RecordInputSection({ analysis, at }: { analysis: AnalysisOf; at: (s: number) => string }) {
  const rows = recordInputRows(analysis);
  const gaps = gapLines(analysis.input?.gaps ?? [], at);
  const warnings = analysis.input?.warnings ?? [];
  return (
    <View>
      <View wrap={false}>
        <Heading>The record and how it was read</Heading>
        <View style={s.table}>
          {rows.map((row) => (
            <View key={row.label} style={s.tr} wrap={false}>
              <T style={[s.td, { width: "26%" }, s.strong]}>{row.label}</T>
              <T style={row.caution ? [s.td, { width: "74%" }, s.strong, { color: colour.caution700 }] : [s.td, { width: "74%" }]}>{row.caution ? `CAUTION: ${row.value}` : row.value}</T>
            </View>
          ))}
        </View>
      </View>
      {gaps.length > 0 ? (
        <View style={[s.table, { marginTop: 4 }]}>
          <TableHead columns={GAP_COLUMNS} />
          {gaps.map((g) => (
            <View key={`${g.from}-${g.what}`} style={s.tr} wrap={false}>
              <T style={[s.td, { width: "24%" }]}>{g.from}</T>
              <T style={[s.td, { width: "24%" }]}>{g.to}</T>
              <T style={[s.tdNum, { width: "14%" }]}>{g.duration}</T>
              <T style={[s.td, { width: "38%" }]}>{g.what}</T>
            </View>
          ))}
        </View>
      ) : null}
      {warnings.map((w) => (
        <View key={w} wrap={false}>
          <T style={[s.small, { color: colour.caution700, marginTop: 2 }]}>{`Note: ${w}`}</T>
        </View>
      ))}
    </View>
  );
}
