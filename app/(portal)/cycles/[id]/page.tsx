import type { Metadata } from "next";
import Link from "next/link";
import { Panel } from "@/components/ui/panel";
import { StatusBadge, VerdictBadge } from "@/components/ui/badge";
import { SignOffPanel } from "@/components/review/sign-off-panel";
import { Findings } from "@/components/cycles/record/findings";
import { TimeChart } from "@/components/cycles/record/time-chart";
import { PhaseDiagram } from "@/components/cycles/record/phase-diagram";
import { ChannelTable, ChecksTable, FilesList, KeyFigures, ProfileLimits, RecordHistory } from "@/components/cycles/record/record-tables";
import { AnalysisHistory, CorrectionNotices, InstrumentEvidence } from "@/components/cycles/record/corrections";
import { CorrectionForm } from "@/components/cycles/record/correction-form";
import { RecordInput } from "@/components/cycles/record/record-input";
import { SafetyCaution } from "@/components/cycles/record/safety-caution";
import { AirLeakageFigures, AirLeakageFindings, AirLeakageTable } from "@/components/cycles/air-leakage/leak-record";
import { AirLeakageChart } from "@/components/cycles/air-leakage/leak-chart";
import { isAirLeakage, thermometricOf } from "@/lib/analysis/types";
import { formatStartedAt } from "@/components/cycles/record/record-format";
import { loadTypeLabel, testKindLabel, formatVolume } from "@/lib/domain";
import { describeTimeChart } from "@/lib/cycles/chart-model";
import { formatDateTime } from "@/lib/format";
import { orNotFound } from "@/lib/auth/page-guard";
import { getCycleRecord } from "@/lib/services/cycles";
import { getCycleIndicatorSheets } from "@/lib/services/bowie-dick";
import { CycleSheetPanel } from "@/components/bowie-dick/cycle-sheet-panel";
import { RecordTrailLink } from "@/components/audit/record-trail-link";
import { guardCycleRecord } from "./record";

type Props = { params: Promise<{ id: string }> };

export const metadata: Metadata = { title: "Cycle record" };

export default async function CycleRecordPage({ params }: Props) {
  const { id } = await params;
  const actor = await guardCycleRecord(id);
  const { detail, history, contributed, correctionChoices } = await orNotFound(getCycleRecord({ actor, id }));
  const sheets = detail.testKind === "bowie-dick" ? await getCycleIndicatorSheets({ actor, cycleId: id }) : null;

  const tz = detail.site.timeZone;
  // Each test kind on its own terms: a logged air leakage test has its own panels, the thermometric ones are not shown.
  const leak = isAirLeakage(detail.analysis) ? detail.analysis : null;
  const a = thermometricOf(detail.analysis);
  const profile = detail.profile;

  return (
    <>
      <nav aria-label="Breadcrumb" className="mb-2 text-sm text-ink-muted">
        <Link href="/cycles" className="text-steam-700 underline underline-offset-2">
          Cycles
        </Link>
        <span aria-hidden="true"> / </span>
        <span className="mono">{detail.cycleNumber}</span>
      </nav>
      <header className="mb-6 flex flex-wrap items-start justify-between gap-4" data-testid="record-header">
        <div className="min-w-0">
          <div className="flex flex-wrap items-center gap-2">
            <h1>
              Cycle <span className="mono text-xl">{detail.cycleNumber}</span>
            </h1>
            <VerdictBadge verdict={detail.verdict} />
            <StatusBadge status={detail.status} />
          </div>
          <p className="mt-1 text-sm text-ink-soft">
            {testKindLabel(detail.testKind)} on <span className="font-medium">{detail.sterilizer.name}</span>
            <span className="text-ink-muted">
              {" "}
              (serial {detail.sterilizer.serialNumber}, {formatVolume(detail.sterilizer.chamberVolumeL)})
            </span>{" "}
            against <span className="font-medium">{profile.name}</span>
          </p>
          <p className="mt-0.5 text-sm text-ink-muted">
            Started {formatStartedAt(detail.startedAt, tz)} · registered by {detail.createdBy.name} on {formatDateTime(detail.createdAt, tz)}
            {detail.submittedAt ? ` · submitted ${formatDateTime(detail.submittedAt, tz)}` : ""}
            {detail.instrument ? ` · logger ${detail.instrument.name} (${detail.instrument.serialNumber})` : ""}
          </p>
          {detail.loadDescription && <p className="mt-0.5 text-sm text-ink-muted">Load: {detail.loadDescription}</p>}
          {(detail.loadType || detail.loadLot) && (
            <p className="mt-0.5 text-sm text-ink-muted" data-testid="load-type">
              Test pack or load: {loadTypeLabel(detail.loadType)}
              {detail.loadLot ? ` · lot ${detail.loadLot}` : ""}
            </p>
          )}
          {detail.supersedesId && (
            <p className="mt-0.5 text-sm">
              <Link href={`/cycles/${detail.supersedesId}`} className="text-steam-700 underline">
                This record replaces an earlier one
              </Link>
            </p>
          )}
        </div>
        <div className="flex flex-wrap gap-2">
          {detail.report && (
            <a href={`/api/cycles/${detail.id}/report`} className="btn-secondary">
              Report {detail.report.reportNumber} (PDF)
            </a>
          )}
          <RecordTrailLink role={actor.role} recordId={detail.id} />
        </div>
      </header>

      <div className="grid gap-gutter xl:grid-cols-[minmax(0,1fr)_20rem]">
        <div className="min-w-0 space-y-gutter">
          <CorrectionNotices detail={detail} />
          {sheets && (
            <Panel title="Indicator sheet: the verdict of this test">
              <CycleSheetPanel cycleId={detail.id} readings={sheets.readings} mayRecord={sheets.mayRecord} timeZone={tz} />
            </Panel>
          )}
          <Panel title={sheets ? "The logged cycle (information only)" : "What the analysis found"}>{leak ? <AirLeakageFindings analysis={leak} /> : <Findings detail={detail} />}</Panel>

          {leak && (
            <>
              <Panel title="Air leakage test: p1, p2, p3 and the leak rate">
                <AirLeakageTable analysis={leak} startedAt={detail.startedAt} timeZone={tz} />
              </Panel>
              <Panel title="Chamber pressure during the test">
                <AirLeakageChart cycleId={detail.id} cycleNumber={detail.cycleNumber} analysis={leak} />
              </Panel>
            </>
          )}

          {a && (
            <>
              <Panel title="Checks">
                <ChecksTable analysis={a} profile={profile} />
              </Panel>

              <Panel title="Temperatures and pressure over time">
                <TimeChart
                  cycleId={detail.id}
                  cycleNumber={detail.cycleNumber}
                  timeZone={tz}
                  summary={describeTimeChart(a, { sterilizationTempC: a.limits.sterilizationTempC, bandK: a.limits.bandK })}
                />
              </Panel>

              <Panel title="The cycle on the water phase diagram">
                <PhaseDiagram
                  cycleId={detail.id}
                  cycleNumber={detail.cycleNumber}
                  plateau={a.plateau}
                  sterilizationTempC={a.limits.sterilizationTempC}
                  bandK={a.limits.bandK}
                  saturationLimitK={a.limits.saturationLimitK}
                  referenceChannel={a.referenceChannel}
                  pressureChannel={a.pressureChannel}
                />
              </Panel>

              <Panel title="The record and how it was read">
                <RecordInput analysis={a} startedAt={detail.startedAt} timeZone={tz} />
              </Panel>

              <Panel title="Channels">
                <ChannelTable analysis={a} positions={detail.positions} positionProblem={detail.positionProblem} />
              </Panel>
            </>
          )}

          <Panel title={`Files (${detail.files.length})`}>
            <FilesList files={detail.files} timeZone={tz} />
          </Panel>

          <Panel title="Analyses">
            <AnalysisHistory history={detail.analysisHistory} currentId={detail.analysisId} timeZone={tz} />
          </Panel>
          {correctionChoices && (
            <Panel title="Correct and analyse again">
              <CorrectionForm cycleId={detail.id} current={{ profileId: detail.profile.id, instrumentId: detail.instrument?.id ?? null, positions: detail.positions }} choices={correctionChoices} />
            </Panel>
          )}
          <Panel title="Record history">
            <RecordHistory events={history} timeZone={tz} />
          </Panel>
        </div>

        <aside className="min-w-0 space-y-gutter" aria-label="Figures and sign-off">
          <Panel title="Key figures">{leak ? <AirLeakageFigures analysis={leak} /> : <KeyFigures analysis={a} startedAt={detail.startedAt} timeZone={tz} />}</Panel>
          <SignOffPanel detail={detail} actor={{ id: actor.id, role: actor.role, name: actor.name }} contributed={contributed} />
          <Panel title="Instrument and calibration">
            <InstrumentEvidence instrument={detail.instrument} />
          </Panel>
          {!leak && (
            <Panel title="Acceptance profile">
              <ProfileLimits profile={profile} analysis={a} />
            </Panel>
          )}
          <SafetyCaution />
        </aside>
      </div>
    </>
  );
}
