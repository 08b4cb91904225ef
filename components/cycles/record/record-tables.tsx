import type { ReactNode } from "react";
import { DEFAULT_FREE_SPACE, type AnalysisResult } from "@/lib/analysis/types";
import type { CycleDetail } from "@/lib/cycles/contracts";
import { EmptyState } from "@/components/ui/panel";
import { Badge } from "@/components/ui/badge";
import { TableFrame } from "@/components/ui/table-frame";
import { formatBytes, formatDateTime, formatNumber } from "@/lib/format";
import { clockTimeAt, elapsedFormatter } from "@/lib/cycles/chart-model";
import { actionLabel, describeDialect, describeMapping, formatFigure, formatLimit, summariseAuditValue } from "./record-format";
import { channelRoleLabel, missingCell, NOT_RECORDED } from "@/lib/cycles/record-input";
import { basisNoteFor, describeBasis, formatDuration, sensorPositionLabel } from "@/lib/domain";

export function ChecksTable({ analysis, profile }: { analysis: AnalysisResult; profile: CycleDetail["profile"] }) {
  return (
    <ChecksTableFrame caption="Checks against the acceptance profile">
      {analysis.checks.map((c) => (
        <tr key={c.id} className={c.passed ? "" : "bg-fail-50/60"}>
          <td className="font-medium">{c.label}</td>
          <td className="whitespace-nowrap tabular-nums">{formatFigure(c.measured, c.unit)}</td>
          <td className="whitespace-nowrap tabular-nums">{formatLimit(c)}</td>
          <td className="text-xs text-ink-muted">{basisNoteFor(c.id, profile.basis, profile.basisReason, profile.sterilizationTempC)}</td>
          <td className="whitespace-nowrap">{c.passed ? <Badge tone="pass">✓ Pass</Badge> : <Badge tone="fail">✕ Fail</Badge>}</td>
        </tr>
      ))}
    </ChecksTableFrame>
  );
}

/** The one frame of a checks table (thermometric or air leakage): check, measured, limit, basis, result. */
export function ChecksTableFrame({ caption, children }: { caption: string; children: ReactNode }) {
  return (
    <TableFrame label={caption}>
      <table className="data-table" data-testid="checks-table">
        <caption className="sr-only">{caption}</caption>
        <thead>
          <tr>
            <th scope="col">Check</th>
            <th scope="col">Measured</th>
            <th scope="col">Limit</th>
            <th scope="col">Basis</th>
            <th scope="col">Result</th>
          </tr>
        </thead>
        <tbody>{children}</tbody>
      </table>
    </TableFrame>
  );
}

/** Each temperature channel: where its probe sat, its role and its figures during holding; its own scroll frame on a phone. */
export function ChannelTable({ analysis, positions, positionProblem }: { analysis: AnalysisResult; positions: CycleDetail["positions"]; positionProblem: string | null }) {
  const ref = analysis.limits.f0ReferenceC;
  const z = analysis.limits.f0ZK;
  const hold = analysis.saturationTemperatureDuringHold;
  const placeOf = new Map(positions.map((p) => [p.header, p]));
  return (
    <>
      {positionProblem && (
        <p className="mb-2 text-sm text-caution-700" data-testid="position-problem">
          ⚠ {positionProblem}
        </p>
      )}
      <TableFrame label="Temperature channels">
        <table className="data-table" data-testid="channel-table">
          <caption className="sr-only">Temperature channels during holding</caption>
          <thead>
            <tr>
              <th scope="col">Channel</th>
              <th scope="col">Position</th>
              <th scope="col">Note</th>
              <th scope="col">Role</th>
              <th scope="col">Unit</th>
              <th scope="col" className="text-right">
                Min (°C)
              </th>
              <th scope="col" className="text-right">
                Max (°C)
              </th>
              <th scope="col" className="text-right">
                Mean (°C)
              </th>
              <th scope="col" className="text-right">
                Reached Ts after plateau start
              </th>
              <th scope="col" className="text-right">
                F0 (min)
              </th>
              <th scope="col" className="text-right">
                Missing
              </th>
            </tr>
          </thead>
          <tbody>
            {analysis.channels.map((ch) => (
              <tr key={ch.header}>
                <td className="whitespace-nowrap font-medium">{ch.header}</td>
                <td className="whitespace-nowrap">
                  {placeOf.get(ch.header)?.position ? sensorPositionLabel(placeOf.get(ch.header)!.position!) : <span className="text-caution-700">not recorded</span>}
                </td>
                <td className="min-w-40 text-xs text-ink-muted">{placeOf.get(ch.header)?.note ?? ""}</td>
                <td className="whitespace-nowrap">{ch.role === "reference" ? <Badge tone="steam">{channelRoleLabel(ch.role)}</Badge> : channelRoleLabel(ch.role)}</td>
                <td className="whitespace-nowrap">°C</td>
                <td className="text-right tabular-nums">{formatNumber(ch.minDuringHold, 2)}</td>
                <td className="text-right tabular-nums">{formatNumber(ch.maxDuringHold, 2)}</td>
                <td className="text-right tabular-nums">{formatNumber(ch.meanDuringHold, 2)}</td>
                <td className="text-right tabular-nums">
                  {ch.arrivalAfterPlateauStart === null ? (
                    analysis.plateau ? (
                      <span className="text-fail-700">never</span>
                    ) : (
                      "—"
                    )
                  ) : (
                    `${formatNumber(ch.arrivalAfterPlateauStart, ch.arrivalAfterPlateauStart < 10 ? 1 : 0)} s`
                  )}
                </td>
                <td className="text-right tabular-nums">{formatNumber(ch.f0, 1)}</td>
                <td className={`text-right tabular-nums ${ch.missing ? "text-caution-700" : ""}`}>{missingCell(ch)}</td>
              </tr>
            ))}
          </tbody>
        </table>
      </TableFrame>
      <p className="mt-2 text-xs text-ink-muted">
        Min, max and mean over the holding time{analysis.holdingTime === null ? " (none here, so no figures)" : ""}. Missing: blank cells of the channel in the whole record
        {analysis.channels.some((c) => c.missing === undefined) ? ` (${NOT_RECORDED})` : ""}. F0 over the whole record with T<sub>ref</sub> = {ref} °C and z = {z} K. Chamber pressure from{" "}
        {analysis.pressureChannel}, in kPa absolute
        {hold ? `; its saturation temperature during holding was ${formatNumber(hold.min, 2)} to ${formatNumber(hold.max, 2)} °C (mean ${formatNumber(hold.mean, 2)} °C).` : "."}
      </p>
    </>
  );
}

/** Key figures; plateau start and end as elapsed time with the site's clock time beside it. */
export function KeyFigures({ analysis, startedAt, timeZone }: { analysis: AnalysisResult | null; startedAt: string | null; timeZone: string }) {
  if (!analysis) return <EmptyState title="No figures without an analysis" />;
  const interval = analysis.record.medianSampleIntervalS;
  const at = elapsedFormatter(analysis.record.durationS);
  const withClock = (s: number) => {
    const clock = clockTimeAt(startedAt, s, timeZone);
    return clock ? `${at(s)} · ${clock}` : at(s);
  };
  const plateau: Array<[string, string]> = analysis.plateau
    ? [
        ["Plateau start", withClock(analysis.plateau.start)],
        ["Plateau end", withClock(analysis.plateau.end)],
      ]
    : [["Plateau", "not reached"]];
  const rows: Array<[string, string]> = [
    ...plateau,
    ["Equilibration time", formatDuration(analysis.equilibrationTime)],
    ["Holding time", formatDuration(analysis.holdingTime)],
    [
      "Reference − saturation",
      analysis.saturation.lowestDeviation === null || analysis.saturation.highestDeviation === null
        ? "—"
        : `${signed(analysis.saturation.lowestDeviation)} to ${signed(analysis.saturation.highestDeviation)} K`,
    ],
    ["F0 of the reference", `${formatNumber(analysis.f0[analysis.referenceChannel] ?? null, 1)} min`],
    ["Record length", at(analysis.record.durationS)],
    ["Samples", `${analysis.record.samples.toLocaleString("en-GB")}, every ${formatNumber(interval, interval < 10 && !Number.isInteger(interval) ? 1 : 0)} s`],
  ];
  return (
    <>
      <dl className="grid grid-cols-[minmax(0,1fr)_auto] gap-x-3 gap-y-1.5 text-sm" data-testid="key-figures">
        {rows.map(([k, v]) => (
          <div key={k} className="contents">
            <dt className="text-ink-muted">{k}</dt>
            <dd className="whitespace-nowrap text-right font-medium tabular-nums">{v}</dd>
          </div>
        ))}
      </dl>
      {startedAt && analysis.plateau && <p className="mt-2 text-2xs text-ink-faint">Elapsed time since the first sample · clock time at the site ({timeZone}).</p>}
    </>
  );
}

/** The profile's limits; the record and free-space limits as the analysis applied them (analyses before engine 2 had none). */
export function ProfileLimits({ profile, analysis }: { profile: CycleDetail["profile"]; analysis?: AnalysisResult | null }) {
  const applied = analysis?.input ? analysis.limits : null;
  const rows: Array<[string, string]> = [
    ["Sterilization temperature", `${profile.sterilizationTempC} °C`],
    ["Band above it", `${profile.bandK} K`],
    ["Minimum holding time", formatDuration(profile.holdingTimeS)],
    ["Longest equilibration", `${profile.maxEquilibrationS} s`],
    ["Largest spread", `${profile.maxSpreadK} K`],
    ["Saturation limit", `± ${profile.saturationLimitK} K`],
    ["F0 reference, z", `${profile.f0ReferenceC} °C, ${profile.f0ZK} K`],
    ...(applied
      ? ([
          ["Longest sampling interval", applied.maxSampleIntervalS === undefined ? "3× the median" : `${applied.maxSampleIntervalS} s`],
          [
            "Free space above reference",
            `${applied.freeSpaceEarlyK ?? DEFAULT_FREE_SPACE.freeSpaceEarlyK} K for ${applied.freeSpaceEarlyS ?? DEFAULT_FREE_SPACE.freeSpaceEarlyS} s, then ${applied.freeSpaceK ?? DEFAULT_FREE_SPACE.freeSpaceK} K`,
          ],
        ] as Array<[string, string]>)
      : []),
  ];
  return (
    <>
      <dl className="grid grid-cols-[minmax(0,1fr)_auto] gap-x-3 gap-y-1.5 text-sm">
        {rows.map(([k, v]) => (
          <div key={k} className="contents">
            <dt className="text-ink-muted">{k}</dt>
            <dd className="whitespace-nowrap text-right tabular-nums">{v}</dd>
          </div>
        ))}
      </dl>
      <p className="mt-2 text-xs text-ink-muted" data-testid="profile-basis">
        Basis: <span className="text-ink-soft">{describeBasis(profile.basis, profile.basisReason)}</span>
      </p>
    </>
  );
}

export function FilesList({ files, timeZone }: { files: CycleDetail["files"]; timeZone: string }) {
  if (files.length === 0) return <EmptyState title="No files on this record" />;
  return (
    <ul className="divide-y divide-ink-line/60" data-testid="files-list">
      {files.map((f) => {
        const mapping = describeMapping(f.mapping);
        return (
          <li key={f.id} className="py-3 first:pt-0 last:pb-0">
            <div className="flex flex-wrap items-baseline justify-between gap-2">
              <p className="font-medium break-all">{f.name}</p>
              <p className="text-xs text-ink-muted">
                {formatBytes(f.size)} · uploaded by {f.uploadedBy} · {formatDateTime(f.uploadedAt, timeZone)}
              </p>
            </div>
            <p className="mt-1 text-xs text-ink-muted">
              SHA-256{" "}
              <span className="mono break-all text-ink-soft" data-testid="file-sha256">
                {f.sha256}
              </span>
            </p>
            <p className="mt-1 text-xs text-ink-soft">{describeDialect(f.dialect)}</p>
            {f.dialect && <p className="mt-1 text-xs text-ink-soft">Mapping: {mapping.length ? mapping.join("; ") : "as guessed from the headers and values, no corrections"}.</p>}
          </li>
        );
      })}
    </ul>
  );
}

export type HistoryEvent = { seq: number; at: string; actorEmail: string | null; action: string; reason: string | null; newValue: string | null };

export function RecordHistory({ events, timeZone }: { events: HistoryEvent[]; timeZone: string }) {
  if (events.length === 0) return <EmptyState title="No events recorded for this cycle" />;
  return (
    <ol className="relative space-y-3 border-l border-ink-line pl-4" data-testid="record-history">
      {events.map((e) => {
        const summary = summariseAuditValue(e.newValue);
        return (
          <li key={e.seq} className="text-sm">
            <span aria-hidden="true" className="absolute -left-[5px] mt-1.5 h-2.5 w-2.5 rounded-full border border-ink-line bg-paper-raised" />
            <p>
              <span className="font-medium">{actionLabel(e.action)}</span>
              <span className="text-ink-muted">
                {" "}
                · {formatDateTime(e.at, timeZone)} · {e.actorEmail ?? "system"}
              </span>
            </p>
            {e.reason && <p className="text-ink-soft">Reason: {e.reason}</p>}
            {summary && <p className="mono text-ink-muted break-all">{summary}</p>}
            <p className="text-2xs text-ink-faint">
              Ledger event #{e.seq} · {e.action}
            </p>
          </li>
        );
      })}
    </ol>
  );
}

function signed(v: number): string {
  return `${v > 0 ? "+" : v < 0 ? "−" : ""}${Math.abs(v).toFixed(2)}`;
}
