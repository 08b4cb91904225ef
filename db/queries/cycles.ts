import "server-only";
import { and, asc, count, desc, eq, gte, inArray, like, lte, or, type SQL } from "drizzle-orm";
import { alias } from "drizzle-orm/sqlite-core";
import { getDb, type Executor } from "@/db";
import {
  acceptanceProfiles,
  analyses,
  cycles,
  instruments,
  loggerFiles,
  reports,
  signatures,
  sites,
  sterilizers,
  users,
  type CycleStatus,
  type TestKind,
} from "@/db/schema";
import { appendAuditEvent } from "@/db/ledger";
import type { Actor } from "./users";
import { AppError } from "@/lib/errors";
import { analyzeLoggerBytes, type FileAnalysis } from "@/lib/cycles/analyze-file";
import { readLoggerFile, LoggerFileError, type MappingOverrides, type Recording } from "@/lib/logger-files";
import { AnalysisError } from "@/lib/analysis";
import { buildSeries } from "@/lib/cycles/series";
import { atmosphereAtAltitudeKpa, STANDARD_ATMOSPHERE_KPA } from "@/lib/steam";
import type { AnalysisResult } from "@/lib/analysis/types";
import type { CreateCycleResponse, CycleDetail, CycleListItem, CycleListResponse, SeriesResponse, SignatureView } from "@/lib/cycles/contracts";
import { signatureIsValid } from "./signature-bundle";
import { enqueueAnalysisFailedMail } from "@/lib/services/mail";

const siteOf = (actor: Actor) => actor.siteId ?? "";

export type CycleFilter = {
  status?: CycleStatus;
  verdict?: "pass" | "fail";
  sterilizer?: string;
  from?: string;
  to?: string;
  q?: string;
  page?: number;
  pageSize?: number;
  sort?: string;
};

const creator = alias(users, "creator");

const SORTS = {
  startedAt: cycles.startedAt,
  createdAt: cycles.createdAt,
  cycleNumber: cycles.cycleNumber,
  status: cycles.status,
  verdict: cycles.verdict,
  sterilizer: sterilizers.name,
  submittedAt: cycles.submittedAt,
} as const;

export function cycleListWhere(actor: Actor, filter: CycleFilter): SQL | undefined {
  const conditions: Array<SQL | undefined> = [eq(cycles.siteId, siteOf(actor))];
  if (filter.status) conditions.push(eq(cycles.status, filter.status));
  if (filter.verdict) conditions.push(eq(cycles.verdict, filter.verdict));
  if (filter.sterilizer) conditions.push(eq(cycles.sterilizerId, filter.sterilizer));
  if (filter.from) conditions.push(gte(cycles.startedAt, filter.from));
  if (filter.to) conditions.push(lte(cycles.startedAt, filter.to.length === 10 ? `${filter.to}T23:59:59.999Z` : filter.to));
  if (filter.q) {
    const pattern = `%${filter.q}%`;
    conditions.push(or(like(cycles.cycleNumber, pattern), like(cycles.loadDescription, pattern), like(sterilizers.name, pattern)));
  }
  return and(...conditions);
}

export async function listCycles({ actor, filter }: { actor: Actor; filter: CycleFilter }): Promise<CycleListResponse> {
  const db = getDb();
  const pageSize = Math.min(Math.max(Math.trunc(filter.pageSize ?? 25), 1), 1000);
  const page = Math.max(Math.trunc(filter.page ?? 1), 1);
  const [sortKey, sortDir] = (filter.sort ?? "startedAt:desc").split(":");
  const column = SORTS[sortKey as keyof typeof SORTS] ?? cycles.startedAt;
  const order = sortDir === "asc" ? asc(column) : desc(column);
  const where = cycleListWhere(actor, filter);
  const [rows, [{ total }]] = await Promise.all([
    db
      .select({
        id: cycles.id,
        cycleNumber: cycles.cycleNumber,
        status: cycles.status,
        verdict: cycles.verdict,
        testKind: cycles.testKind,
        startedAt: cycles.startedAt,
        createdAt: cycles.createdAt,
        loadDescription: cycles.loadDescription,
        sterilizerId: sterilizers.id,
        sterilizerName: sterilizers.name,
        profileId: acceptanceProfiles.id,
        profileName: acceptanceProfiles.name,
        createdByName: creator.name,
      })
      .from(cycles)
      .innerJoin(sterilizers, eq(cycles.sterilizerId, sterilizers.id))
      .innerJoin(acceptanceProfiles, eq(cycles.profileId, acceptanceProfiles.id))
      .innerJoin(creator, eq(cycles.createdBy, creator.id))
      .where(where)
      .orderBy(order, desc(cycles.id))
      .limit(pageSize)
      .offset((page - 1) * pageSize),
    db.select({ total: count() }).from(cycles).innerJoin(sterilizers, eq(cycles.sterilizerId, sterilizers.id)).where(where),
  ]);
  const items: CycleListItem[] = rows.map((r) => ({
    id: r.id,
    cycleNumber: r.cycleNumber,
    status: r.status,
    verdict: r.verdict,
    testKind: r.testKind,
    startedAt: r.startedAt,
    createdAt: r.createdAt,
    loadDescription: r.loadDescription,
    sterilizer: { id: r.sterilizerId, name: r.sterilizerName },
    profile: { id: r.profileId, name: r.profileName },
    createdByName: r.createdByName,
  }));
  return { items, total, page, pageSize };
}

/** The cycle row, only if it belongs to the actor's site. */
export async function getCycleRow({ actor, id, tx }: { actor: Actor; id: string; tx?: Executor }) {
  const [row] = await (tx ?? getDb())
    .select()
    .from(cycles)
    .where(and(eq(cycles.id, id), eq(cycles.siteId, siteOf(actor))))
    .limit(1);
  return row;
}

export function siteAtmosphereKpa(site: { atmosphereKpa: number | null; altitudeM: number | null }): number {
  if (site.atmosphereKpa) return site.atmosphereKpa;
  if (site.altitudeM !== null && site.altitudeM !== undefined) return atmosphereAtAltitudeKpa(site.altitudeM);
  return STANDARD_ATMOSPHERE_KPA;
}

export async function getCycleDetail({ actor, id }: { actor: Actor; id: string }): Promise<CycleDetail | undefined> {
  const db = getDb();
  const [row] = await db
    .select({ cycle: cycles, site: sites, sterilizer: sterilizers, profile: acceptanceProfiles, instrument: instruments, creatorName: creator.name })
    .from(cycles)
    .innerJoin(sites, eq(cycles.siteId, sites.id))
    .innerJoin(sterilizers, eq(cycles.sterilizerId, sterilizers.id))
    .innerJoin(acceptanceProfiles, eq(cycles.profileId, acceptanceProfiles.id))
    .innerJoin(creator, eq(cycles.createdBy, creator.id))
    .leftJoin(instruments, eq(cycles.instrumentId, instruments.id))
    .where(and(eq(cycles.id, id), eq(cycles.siteId, siteOf(actor))))
    .limit(1);
  if (!row) return undefined;
  const { cycle, site, sterilizer, profile, instrument } = row;
  const uploader = alias(users, "uploader");
  const [files, analysisRows, signatureRows, [report]] = await Promise.all([
    db
      .select({
        id: loggerFiles.id,
        name: loggerFiles.name,
        size: loggerFiles.sizeBytes,
        sha256: loggerFiles.sha256,
        uploadedAt: loggerFiles.uploadedAt,
        uploadedBy: uploader.name,
        dialect: loggerFiles.dialect,
        mapping: loggerFiles.mapping,
      })
      .from(loggerFiles)
      .innerJoin(uploader, eq(loggerFiles.uploadedBy, uploader.id))
      .where(eq(loggerFiles.cycleId, id))
      .orderBy(asc(loggerFiles.uploadedAt)),
    db.select().from(analyses).where(eq(analyses.cycleId, id)).orderBy(desc(analyses.createdAt)),
    db.select().from(signatures).where(eq(signatures.cycleId, id)).orderBy(asc(signatures.signedAt)),
    db.select({ id: reports.id, reportNumber: reports.reportNumber, sha256: reports.sha256 }).from(reports).where(eq(reports.cycleId, id)).orderBy(desc(reports.createdAt)).limit(1),
  ]);
  const current = analysisRows.find((a) => a.id === cycle.currentAnalysisId) ?? analysisRows[0];
  const detail: CycleDetail = {
    id: cycle.id,
    cycleNumber: cycle.cycleNumber,
    status: cycle.status,
    verdict: cycle.verdict,
    testKind: cycle.testKind,
    loadDescription: cycle.loadDescription,
    startedAt: cycle.startedAt,
    createdAt: cycle.createdAt,
    submittedAt: cycle.submittedAt,
    createdBy: { id: cycle.createdBy, name: row.creatorName },
    site: { id: site.id, name: site.name, timeZone: site.timeZone, atmosphereKpa: siteAtmosphereKpa(site) },
    sterilizer: { id: sterilizer.id, name: sterilizer.name, serialNumber: sterilizer.serialNumber, chamberVolumeL: sterilizer.chamberVolumeL },
    profile: {
      id: profile.id,
      name: profile.name,
      sterilizationTempC: profile.sterilizationTempC,
      bandK: profile.bandK,
      holdingTime: profile.holdingTimeS,
      holdingTimeS: profile.holdingTimeS,
      maxEquilibrationS: profile.maxEquilibrationS,
      maxSpreadK: profile.maxSpreadK,
      saturationLimitK: profile.saturationLimitK,
      f0ReferenceC: profile.f0ReferenceC,
      f0ZK: profile.f0ZK,
      basis: profile.basis,
    },
    instrument: instrument ? { id: instrument.id, name: instrument.name, serialNumber: instrument.serialNumber } : null,
    files: files.map((f) => ({ ...f, dialect: (f.dialect ?? null) as CycleDetail["files"][number]["dialect"], mapping: (f.mapping ?? null) as MappingOverrides | null })),
    analysis: (current?.result as AnalysisResult | undefined) ?? null,
    analysisId: current?.id ?? null,
    analysisHistory: analysisRows.map((a) => ({ id: a.id, createdAt: a.createdAt, verdict: a.verdict, engineVersion: a.engineVersion, inputHash: a.inputHash })),
    signatures: [],
    supersedesId: cycle.supersedesId,
    report: report ?? null,
  };
  detail.signatures = await Promise.all(
    signatureRows.map(
      async (s): Promise<SignatureView> => ({
        id: s.id,
        printedName: s.printedName,
        role: s.role,
        meaning: s.meaning,
        reason: s.reason,
        signedAt: s.signedAt,
        bundleHash: s.bundleHash,
        valid: await signatureIsValid({ signature: s }),
      }),
    ),
  );
  return detail;
}

// Re-reading a day-long file costs a few hundred milliseconds; keep the last few parsed recordings
// so that zooming the chart does not parse it again.
const recordingCache = (globalThis as unknown as { __papinRecordings?: Map<string, Recording> }).__papinRecordings ?? new Map<string, Recording>();
(globalThis as unknown as { __papinRecordings?: Map<string, Recording> }).__papinRecordings = recordingCache;

async function recordingOfAnalysis(analysisId: string): Promise<{ recording: Recording; result: AnalysisResult } | undefined> {
  const [row] = await getDb()
    .select({ bytes: loggerFiles.bytes, mapping: analyses.limits, fileMapping: loggerFiles.mapping, result: analyses.result })
    .from(analyses)
    .innerJoin(loggerFiles, eq(analyses.loggerFileId, loggerFiles.id))
    .where(eq(analyses.id, analysisId))
    .limit(1);
  if (!row) return undefined;
  let recording = recordingCache.get(analysisId);
  if (!recording) {
    recording = readLoggerFile(new Uint8Array(row.bytes), (row.fileMapping ?? {}) as MappingOverrides).recording;
    recordingCache.set(analysisId, recording);
    while (recordingCache.size > 4) recordingCache.delete(recordingCache.keys().next().value!);
  }
  return { recording, result: row.result as AnalysisResult };
}

export async function getCycleSeries({
  actor,
  id,
  fromS,
  toS,
  points = 3000,
}: {
  actor: Actor;
  id: string;
  fromS?: number;
  toS?: number;
  points?: number;
}): Promise<SeriesResponse | undefined> {
  const cycle = await getCycleRow({ actor, id });
  if (!cycle?.currentAnalysisId) return undefined;
  const loaded = await recordingOfAnalysis(cycle.currentAnalysisId);
  if (!loaded) return undefined;
  const maxPoints = Math.min(Math.max(Math.trunc(points), 50), 20000);
  return buildSeries(loaded.recording, loaded.result, { fromS, toS, points: maxPoints });
}

export type UploadedFile = { name: string; bytes: Uint8Array; contentType: string };

export type CreateCycleInput = {
  actor: Actor;
  sterilizerId: string;
  profileId: string;
  instrumentId?: string | null;
  cycleNumber?: string | null;
  load?: string | null;
  testKind?: TestKind;
  files: UploadedFile[];
  mapping?: MappingOverrides;
  saveMapping?: boolean;
  supersedesId?: string | null;
  origin?: string;
};

/**
 * A new cycle from uploaded files: the first file that reads as a logger file is analysed; any
 * others (photos, printouts) are kept beside it. Bytes, hashes, mapping, analysis, cycle and audit
 * event are written in one transaction, so a failure leaves nothing behind.
 */
export async function createCycleFromUpload(input: CreateCycleInput): Promise<CreateCycleResponse & { fileAnalysis: FileAnalysis }> {
  const { actor } = input;
  const db = getDb();
  const [site] = await db.select().from(sites).where(eq(sites.id, siteOf(actor))).limit(1);
  if (!site) throw new AppError(403, "Your account is not attached to a site, so it cannot register cycles.");
  const [sterilizer] = await db.select().from(sterilizers).where(and(eq(sterilizers.id, input.sterilizerId), eq(sterilizers.siteId, site.id))).limit(1);
  if (!sterilizer) throw new AppError(404, "That sterilizer was not found on your site.", "sterilizerId");
  const [profile] = await db.select().from(acceptanceProfiles).where(and(eq(acceptanceProfiles.id, input.profileId), eq(acceptanceProfiles.siteId, site.id))).limit(1);
  if (!profile) throw new AppError(404, "That acceptance profile was not found on your site.", "profileId");
  let instrument: typeof instruments.$inferSelect | undefined;
  if (input.instrumentId) {
    [instrument] = await db.select().from(instruments).where(and(eq(instruments.id, input.instrumentId), eq(instruments.siteId, site.id))).limit(1);
    if (!instrument) throw new AppError(404, "That instrument was not found on your site.", "instrumentId");
  }
  if (input.files.length === 0) throw new AppError(400, "Attach at least one logger file.", "files");

  const mapping: MappingOverrides = input.mapping ?? ((instrument?.savedMapping as MappingOverrides | null) ?? {});
  const atmosphereKpa = siteAtmosphereKpa(site);
  let primaryIndex = -1;
  let fileAnalysis: FileAnalysis | undefined;
  let firstProblem: string | undefined;
  for (const [index, file] of input.files.entries()) {
    try {
      fileAnalysis = analyzeLoggerBytes(file.bytes, profile, mapping, atmosphereKpa);
      primaryIndex = index;
      break;
    } catch (error) {
      if (error instanceof LoggerFileError || error instanceof AnalysisError) {
        firstProblem ??= `${file.name}: ${error.message}`;
        continue;
      }
      throw error;
    }
  }
  if (!fileAnalysis) throw new AppError(422, firstProblem ?? "None of the files could be read as a logger file.", "files");
  const analysis = fileAnalysis;
  const now = new Date().toISOString();
  const cycleNumber = input.cycleNumber?.trim() || defaultCycleNumber(sterilizer.serialNumber, analysis.startedAt ?? now);

  const id = await db.transaction(async (tx) => {
    const [cycle] = await tx
      .insert(cycles)
      .values({
        siteId: site.id,
        sterilizerId: sterilizer.id,
        profileId: profile.id,
        instrumentId: instrument?.id ?? null,
        cycleNumber,
        testKind: input.testKind ?? "thermometric-small-load",
        loadDescription: input.load?.trim() ?? "",
        status: "draft",
        verdict: analysis.result.verdict,
        startedAt: analysis.startedAt ? normaliseIso(analysis.startedAt) : now,
        createdBy: actor.id,
        supersedesId: input.supersedesId ?? null,
      })
      .returning({ id: cycles.id });
    let primaryFileId = "";
    for (const [index, file] of input.files.entries()) {
      const isPrimary = index === primaryIndex;
      const [saved] = await tx
        .insert(loggerFiles)
        .values({
          cycleId: cycle.id,
          name: file.name,
          sizeBytes: file.bytes.byteLength,
          sha256: isPrimary ? analysis.sha256 : sha256Of(file.bytes),
          contentType: file.contentType || "application/octet-stream",
          bytes: Buffer.from(file.bytes),
          dialect: isPrimary ? analysis.dialect : null,
          mapping: isPrimary ? analysis.mapping : null,
          uploadedBy: actor.id,
        })
        .returning({ id: loggerFiles.id });
      if (isPrimary) primaryFileId = saved.id;
    }
    const [savedAnalysis] = await tx
      .insert(analyses)
      .values({
        cycleId: cycle.id,
        loggerFileId: primaryFileId,
        engineVersion: analysis.engineVersion,
        inputHash: analysis.inputHash,
        limits: analysis.limits,
        result: analysis.result,
        verdict: analysis.result.verdict,
        createdBy: actor.id,
      })
      .returning({ id: analyses.id });
    await tx.update(cycles).set({ currentAnalysisId: savedAnalysis.id }).where(eq(cycles.id, cycle.id));
    if (input.saveMapping && instrument && input.mapping) {
      await tx.update(instruments).set({ savedMapping: input.mapping }).where(eq(instruments.id, instrument.id));
      await appendAuditEvent(tx, {
        actorId: actor.id,
        actorEmail: actor.email,
        siteId: site.id,
        action: "instrument.mapping-saved",
        entityType: "instrument",
        entityId: instrument.id,
        oldValue: instrument.savedMapping ?? null,
        newValue: input.mapping,
      });
    }
    await appendAuditEvent(tx, {
      actorId: actor.id,
      actorEmail: actor.email,
      siteId: site.id,
      action: "cycle.create",
      entityType: "cycle",
      entityId: cycle.id,
      newValue: {
        cycleNumber,
        sterilizer: sterilizer.name,
        profile: profile.name,
        files: input.files.map((f, i) => ({ name: f.name, size: f.bytes.byteLength, sha256: i === primaryIndex ? analysis.sha256 : sha256Of(f.bytes) })),
        verdict: analysis.result.verdict,
        inputHash: analysis.inputHash,
        supersedes: input.supersedesId ?? null,
      },
    });
    if (analysis.result.verdict === "fail") await notifyFailure(tx, cycle.id, analysis.result, input.origin);
    return cycle.id;
  });
  return { id, status: "draft", analysis: analysis.result, fileAnalysis: analysis };
}

async function notifyFailure(tx: Executor, cycleId: string, result: AnalysisResult, origin?: string) {
  const failedChecks = result.checks.filter((c) => !c.passed).map((c) => c.label);
  await enqueueAnalysisFailedMail(tx, { cycleId, summary: result.summary, failedChecks, origin });
}

import { createHash } from "node:crypto";
function sha256Of(bytes: Uint8Array) {
  return createHash("sha256").update(bytes).digest("hex");
}

function defaultCycleNumber(serial: string, startedAt: string) {
  const stamp = normaliseIso(startedAt).slice(0, 16).replace(/[-:T]/g, "");
  return `${serial}-${stamp}`;
}

function normaliseIso(value: string): string {
  const d = new Date(value);
  return Number.isNaN(d.getTime()) ? value : d.toISOString();
}

export async function listCycleIdsByStatus({ actor, statuses }: { actor: Actor; statuses: CycleStatus[] }) {
  return getDb()
    .select({ id: cycles.id })
    .from(cycles)
    .where(and(eq(cycles.siteId, siteOf(actor)), inArray(cycles.status, statuses)));
}

/**
 * A correction of a draft or returned cycle: a new file and/or a new mapping gives a new analysis;
 * earlier files and analyses stay on the record. Submitted and approved cycles are locked.
 */
export async function reanalyseCycle({ actor, id, file, mapping }: { actor: Actor; id: string; file?: UploadedFile; mapping?: MappingOverrides }) {
  const db = getDb();
  const cycle = await getCycleRow({ actor, id });
  if (!cycle) throw new AppError(404, "That cycle was not found.");
  if (cycle.status === "approved") throw new AppError(409, "This cycle is approved and locked; a correction must be a new, linked record.");
  if (cycle.status === "submitted") throw new AppError(409, "This cycle is waiting for review; it can be corrected once it is returned.");
  const [profile] = await db.select().from(acceptanceProfiles).where(eq(acceptanceProfiles.id, cycle.profileId)).limit(1);
  const [site] = await db.select().from(sites).where(eq(sites.id, cycle.siteId)).limit(1);
  let bytes: Uint8Array;
  let fileId: string | null = null;
  if (file) {
    bytes = file.bytes;
  } else {
    const [current] = await db
      .select({ id: loggerFiles.id, bytes: loggerFiles.bytes, mapping: loggerFiles.mapping })
      .from(analyses)
      .innerJoin(loggerFiles, eq(analyses.loggerFileId, loggerFiles.id))
      .where(eq(analyses.id, cycle.currentAnalysisId ?? ""))
      .limit(1);
    if (!current) throw new AppError(409, "This cycle has no logger file to analyse again; upload one.");
    bytes = new Uint8Array(current.bytes);
    fileId = current.id;
  }
  let analysis: FileAnalysis;
  try {
    analysis = analyzeLoggerBytes(bytes, profile, mapping ?? {}, siteAtmosphereKpa(site));
  } catch (error) {
    if (error instanceof LoggerFileError || error instanceof AnalysisError) throw new AppError(422, `${file?.name ?? "The stored file"}: ${error.message}`, "file");
    throw error;
  }
  await db.transaction(async (tx) => {
    if (file) {
      const [saved] = await tx
        .insert(loggerFiles)
        .values({ cycleId: id, name: file.name, sizeBytes: bytes.byteLength, sha256: analysis.sha256, contentType: file.contentType || "text/csv", bytes: Buffer.from(bytes), dialect: analysis.dialect, mapping: analysis.mapping, uploadedBy: actor.id })
        .returning({ id: loggerFiles.id });
      fileId = saved.id;
    }
    const [saved] = await tx
      .insert(analyses)
      .values({ cycleId: id, loggerFileId: fileId!, engineVersion: analysis.engineVersion, inputHash: analysis.inputHash, limits: analysis.limits, result: analysis.result, verdict: analysis.result.verdict, createdBy: actor.id })
      .returning({ id: analyses.id });
    await tx.update(cycles).set({ currentAnalysisId: saved.id, verdict: analysis.result.verdict, updatedAt: new Date().toISOString() }).where(eq(cycles.id, id));
    await appendAuditEvent(tx, {
      actorId: actor.id,
      actorEmail: actor.email,
      siteId: cycle.siteId,
      action: "cycle.reanalyse",
      entityType: "cycle",
      entityId: id,
      oldValue: { analysis: cycle.currentAnalysisId, verdict: cycle.verdict },
      newValue: { analysis: saved.id, verdict: analysis.result.verdict, file: file ? { name: file.name, sha256: analysis.sha256 } : null, mapping: mapping ?? null },
    });
    if (analysis.result.verdict === "fail") await notifyFailure(tx, id, analysis.result);
  });
  return { id, analysis: analysis.result };
}
