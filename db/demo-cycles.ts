/**
 * One demo cycle stored as intake stores it (cycle, logger file, analysis, the recording's columns, ledger event), dated
 * when it ran: registered at its start, submitted an hour later. Signatures come after, through the real sign-off.
 */
import { eq } from "drizzle-orm";
import type { Executor } from "./index";
import { analyses, analysisSeries, cycles, loggerFiles, type AcceptanceProfile, type TestKind } from "./schema";
import { appendAuditEvent } from "./ledger";
import { analyzeLoggerBytes } from "@/lib/cycles/analyze-file";
import { recordingToColumns } from "@/lib/cycles/series";
import type { MappingOverrides } from "@/lib/logger-files";
import type { LoadType } from "@/lib/domain";

export type DemoCycle = {
  siteId: string;
  sterilizerId: string;
  sterilizerName: string;
  profile: AcceptanceProfile;
  instrumentId: string;
  technician: { id: string; email: string };
  cycleNumber: string;
  testKind: TestKind;
  loadDescription: string;
  loadType: LoadType;
  loadLot: string;
  status: "draft" | "submitted";
  startedAt: Date;
  bytes: Uint8Array;
  mapping: MappingOverrides;
  atmosphereKpa: number;
};

export async function insertDemoCycle(tx: Executor, c: DemoCycle) {
  const analysis = analyzeLoggerBytes(c.bytes, c.profile, c.mapping, c.atmosphereKpa);
  const submitted = c.status === "submitted";
  const [cycle] = await tx
    .insert(cycles)
    .values({
      siteId: c.siteId,
      sterilizerId: c.sterilizerId,
      profileId: c.profile.id,
      instrumentId: c.instrumentId,
      cycleNumber: c.cycleNumber,
      testKind: c.testKind,
      loadDescription: c.loadDescription,
      loadType: c.loadType,
      loadLot: c.loadLot,
      status: c.status,
      verdict: analysis.result.verdict,
      startedAt: c.startedAt.toISOString(),
      createdBy: c.technician.id,
      createdAt: c.startedAt.toISOString(),
      submittedBy: submitted ? c.technician.id : null,
      submittedAt: submitted ? new Date(c.startedAt.getTime() + 3_600_000).toISOString() : null,
    })
    .returning();
  const [file] = await tx
    .insert(loggerFiles)
    .values({
      cycleId: cycle.id,
      name: `${c.cycleNumber}.csv`,
      sizeBytes: c.bytes.byteLength,
      sha256: analysis.sha256,
      bytes: Buffer.from(c.bytes),
      dialect: analysis.dialect,
      mapping: analysis.mapping,
      uploadedBy: c.technician.id,
    })
    .returning({ id: loggerFiles.id });
  const [saved] = await tx
    .insert(analyses)
    .values({
      cycleId: cycle.id,
      loggerFileId: file.id,
      engineVersion: analysis.engineVersion,
      inputHash: analysis.inputHash,
      limits: analysis.limits,
      result: analysis.result,
      verdict: analysis.result.verdict,
      mapping: analysis.mapping,
      createdBy: c.technician.id,
    })
    .returning({ id: analyses.id });
  await tx.update(cycles).set({ currentAnalysisId: saved.id }).where(eq(cycles.id, cycle.id));
  // The recording's columns, as intake stores them, so the demo's charts and reports never re-parse the file.
  const { meta, sampleCount, timesS, channelValues } = recordingToColumns(analysis.recording);
  const buffer = (bytes: Uint8Array) => Buffer.from(bytes.buffer, bytes.byteOffset, bytes.byteLength);
  await tx.insert(analysisSeries).values({ analysisId: saved.id, meta, sampleCount, timesS: buffer(timesS), channelValues: buffer(channelValues) });
  await appendAuditEvent(tx, {
    actorId: c.technician.id,
    actorEmail: c.technician.email,
    siteId: c.siteId,
    action: "cycle.create",
    entityType: "cycle",
    entityId: cycle.id,
    newValue: { cycleNumber: c.cycleNumber, sterilizer: c.sterilizerName, verdict: analysis.result.verdict, file: analysis.sha256, demo: true },
  });
  return { id: cycle.id, verdict: analysis.result.verdict };
}
