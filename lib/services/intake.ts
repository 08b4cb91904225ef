import "server-only";
import { findCyclesHoldingFiles, getAnalysedFile, getCycleRow, insertCorrection, insertCycleRecord } from "@/db/queries/cycles";
import { getInstrumentForSite, getProfileForSite, getSterilizerForSite, listInstrumentsForSite, listProfilesForSite } from "@/db/queries/catalog";
import { getSiteById } from "@/db/queries/sites";
import { enqueueAnalysisFailedMail } from "@/lib/services/mail";
import type { TestKind } from "@/db/schema";
import { CYCLE_STATUS_LABELS, isLockedCycleStatus, type ChannelPlacements, type LoadType } from "@/lib/domain";
import { AppError } from "@/lib/errors";
import { AnalysisError } from "@/lib/analysis";
import type { CycleAnalysis } from "@/lib/analysis/types";
import type { AirLeakageMarks } from "@/lib/analysis/air-leakage-types";
import { inspectLoggerFile, LoggerFileError, type MappingOverrides } from "@/lib/logger-files";
import { analyzeLoggerBytes, siteAtmosphereKpa, type FileAnalysis } from "@/lib/cycles/analyze-file";
import { recordingToColumns, seriesOverviewOf } from "@/lib/cycles/series";
import { insertSeriesOfCurrentAnalysis } from "@/db/queries/analysis-series";
import { resolveCycleStart, siteClockStamp } from "@/lib/cycles/start-time";
import { canonicalJson, sha256Hex } from "@/lib/integrity";
import type { CreateCycleResponse, InspectResponse } from "@/lib/cycles/contracts";
import { assertAllowed, type Actor } from "./access";
import { listSterilizerCatalog } from "./catalog";
import { settleBowieDickVerdict, verdictOfNewCycle } from "./bowie-dick";
import { assertTokenCoversSterilizer, viaApiToken } from "./api-tokens";
import { answerOnce, type IdempotentAnswer, type RecordAnswer } from "./idempotency";

export type UploadedFile = { name: string; bytes: Uint8Array; contentType: string };

export type CreateCycleInput = {
  actor: Actor;
  sterilizerId: string;
  profileId: string;
  instrumentId?: string | null;
  cycleNumber?: string | null;
  load?: string | null;
  /** the test pack or load that was run, and its lot or batch */
  loadType?: LoadType | null;
  loadLot?: string | null;
  testKind?: TestKind;
  /** ISO 8601; used only when the file holds elapsed times without a date */
  startedAt?: string | null;
  files: UploadedFile[];
  mapping?: MappingOverrides;
  saveMapping?: boolean;
  supersedesId?: string | null;
  /** stores the answer of an Idempotency-Key request in the transaction that makes the cycle */
  recordAnswer?: RecordAnswer;
  /** an air leakage test's times marked by the user; they override what the trace shows */
  leakMarks?: AirLeakageMarks | null;
  /** why a file another cycle of the site already holds is attached here too (one file holding several cycles) */
  duplicateReason?: string | null;
};

/** The choices of the intake form: the site's active sterilizers, profiles and instruments, and its time zone. */
export async function getIntakeOptions({ actor }: { actor: Actor }) {
  assertAllowed(actor, "cycle:create", "register cycles");
  const [sterilizers, profiles, instruments, site] = await Promise.all([
    listSterilizerCatalog({ actor }),
    listProfilesForSite({ actor }),
    listInstrumentsForSite({ actor }),
    actor.siteId ? getSiteById({ id: actor.siteId }) : undefined,
  ]);
  return {
    timeZone: site?.timeZone ?? "UTC",
    sterilizers: sterilizers.map((s) => ({
      id: s.id,
      name: s.name,
      serialNumber: s.serialNumber,
      chamberVolumeL: s.chamberVolumeL,
      defaultProfileId: s.defaultProfileId,
      status: s.status,
      statusReason: s.statusReason,
      statusSince: s.statusSince,
    })),
    profiles: profiles.map((p) => ({ id: p.id, name: p.name, sterilizationTempC: p.sterilizationTempC, holdingTimeS: p.holdingTimeS, bandK: p.bandK, basis: p.basis })),
    instruments: instruments.map((i) => ({ id: i.id, name: i.name, serialNumber: i.serialNumber, kind: i.kind, hasSavedMapping: i.hasSavedMapping })),
  };
}

/**
 * The guessed mapping of one logger file, before anything is stored; an instrument's saved mapping
 * is applied when it fits the file, else the plain guess is shown with a warning.
 */
export async function inspectLoggerUpload({ actor, file, instrumentId }: { actor: Actor; file: UploadedFile; instrumentId?: string }): Promise<InspectResponse> {
  assertAllowed(actor, "cycle:create", "upload logger files");
  let savedMapping: MappingOverrides | null = null;
  if (instrumentId) {
    const instrument = await getInstrumentForSite({ actor, id: instrumentId });
    if (!instrument) throw new AppError(404, "That instrument was not found on your site.", "instrumentId");
    savedMapping = (instrument.savedMapping as MappingOverrides | null) ?? null;
  }
  const warnings: string[] = [];
  let inspected;
  try {
    try {
      inspected = inspectLoggerFile(file.bytes, savedMapping ?? undefined);
    } catch (error) {
      // A saved mapping that does not fit this file (other column names) must not block the upload.
      if (!savedMapping || !(error instanceof LoggerFileError)) throw error;
      warnings.push(`The mapping saved for this instrument does not fit this file (${error.message}); the guess is shown instead.`);
      savedMapping = null;
      inspected = inspectLoggerFile(file.bytes);
    }
  } catch (error) {
    if (error instanceof LoggerFileError) throw new AppError(422, `${file.name}: ${error.message}`, "file");
    throw error;
  }
  warnings.push(...inspected.problems.map((p) => `${p} below.`));
  return { ...inspected, name: file.name, size: file.bytes.byteLength, sha256: sha256Hex(file.bytes), warnings, savedMapping };
}

/** The first file that reads as a logger file, analysed; any others (photos, printouts) are kept beside it. */
function analyseFirstReadable(files: UploadedFile[], analyse: (bytes: Uint8Array) => FileAnalysis) {
  let firstProblem: string | undefined;
  for (const [index, file] of files.entries()) {
    try {
      return { primaryIndex: index, analysis: analyse(file.bytes) };
    } catch (error) {
      if (!(error instanceof LoggerFileError || error instanceof AnalysisError)) throw error;
      firstProblem ??= `${file.name}: ${error.message}`;
    }
  }
  throw new AppError(422, firstProblem ?? "None of the files could be read as a logger file.", "files");
}

/**
 * A new cycle from uploaded files. Bytes, hashes, mapping, analysis, cycle and audit event are
 * written in one transaction, so a failure leaves nothing behind.
 */
export async function createCycleFromUpload(input: CreateCycleInput): Promise<CreateCycleResponse & { fileAnalysis: FileAnalysis }> {
  const { actor } = input;
  assertAllowed(actor, "cycle:create", "register cycles");
  const site = actor.siteId ? await getSiteById({ id: actor.siteId }) : undefined;
  if (!site) throw new AppError(403, "Your account is not attached to a site, so it cannot register cycles.");
  const sterilizer = await getSterilizerForSite({ actor, id: input.sterilizerId });
  if (!sterilizer) throw new AppError(404, "That sterilizer was not found on your site.", "sterilizerId");
  assertTokenCoversSterilizer(actor, sterilizer.id);
  const profile = await getProfileForSite({ actor, id: input.profileId });
  if (!profile) throw new AppError(404, "That acceptance profile was not found on your site.", "profileId");
  const instrument = input.instrumentId ? await getInstrumentForSite({ actor, id: input.instrumentId }) : undefined;
  if (input.instrumentId && !instrument) throw new AppError(404, "That instrument was not found on your site.", "instrumentId");
  if (input.files.length === 0) throw new AppError(400, "Attach at least one logger file.", "files");

  const mapping: MappingOverrides = input.mapping ?? (instrument?.savedMapping as MappingOverrides | null) ?? {};
  const atmosphereKpa = siteAtmosphereKpa(site);
  if (input.leakMarks && input.testKind !== "air-leakage") throw new AppError(422, "Marked times (t1, t2, t3) belong to an air leakage test; choose that test kind or leave them out.", "leakMarks");
  const choice = { testKind: input.testKind, marks: input.leakMarks };
  // A saved mapping's positions for channels this file does not have are dropped; the user's own are checked.
  const analyse = (bytes: Uint8Array) => {
    const first = analyzeLoggerBytes(bytes, profile, mapping, atmosphereKpa, choice);
    const fitted = input.mapping ? checkedPlacements(first) : fittedPlacements(first);
    return fitted === mapping.positions ? first : analyzeLoggerBytes(bytes, profile, { ...mapping, positions: fitted }, atmosphereKpa, choice);
  };
  const { primaryIndex, analysis } = analyseFirstReadable(input.files, analyse);
  const start = resolveCycleStart({ fileStartedAt: analysis.startedAt, givenStartedAt: input.startedAt, timeZone: site.timeZone });
  if (!start.ok) throw new AppError(start.status, start.message, start.field);
  const cycleNumber = input.cycleNumber?.trim() || `${sterilizer.serialNumber}-${siteClockStamp(start.startedAt, site.timeZone)}`;
  const files = input.files.map((file, index) => ({ file, primary: index === primaryIndex, sha256: index === primaryIndex ? analysis.sha256 : sha256Hex(file.bytes) }));
  const shared = await sharedFileReasons({ siteId: site.id, files, duplicateReason: input.duplicateReason });
  const audited = { actorId: actor.id, actorEmail: actor.email, siteId: site.id };

  const id = await insertCycleRecord({
    cycle: {
      siteId: site.id,
      sterilizerId: sterilizer.id,
      profileId: profile.id,
      instrumentId: instrument?.id ?? null,
      cycleNumber,
      testKind: input.testKind ?? "thermometric-small-load",
      loadDescription: input.load?.trim() ?? "",
      loadType: input.loadType ?? null,
      loadLot: input.loadLot?.trim() ?? "",
      status: "draft",
      verdict: verdictOfNewCycle(input.testKind ?? "thermometric-small-load", analysis.result.verdict),
      startedAt: start.startedAt,
      createdBy: actor.id,
      supersedesId: input.supersedesId ?? null,
    },
    files: files.map(({ file, primary, sha256 }) => ({
      primary,
      name: file.name,
      sizeBytes: file.bytes.byteLength,
      sha256,
      contentType: file.contentType || "application/octet-stream",
      bytes: Buffer.from(file.bytes),
      dialect: primary ? analysis.dialect : null,
      mapping: primary ? analysis.mapping : null,
      duplicateReason: shared.get(sha256)?.reason ?? null,
      uploadedBy: actor.id,
    })),
    analysis: analysisRow(analysis, actor),
    savedMapping:
      input.saveMapping && instrument && input.mapping
        ? {
            instrumentId: instrument.id,
            mapping: input.mapping,
            audit: { ...audited, action: "instrument.mapping-saved", entityType: "instrument", entityId: instrument.id, oldValue: instrument.savedMapping ?? null, newValue: input.mapping },
          }
        : undefined,
    audit: (cycleId) => ({
      ...audited,
      action: "cycle.create",
      entityType: "cycle",
      entityId: cycleId,
      newValue: {
        cycleNumber,
        sterilizer: sterilizer.name,
        profile: profile.name,
        ...(input.loadType ? { loadType: input.loadType, loadLot: input.loadLot?.trim() ?? "" } : {}),
        ...(analysis.mapping.positions ? { positions: analysis.mapping.positions } : {}),
        files: files.map(({ file, sha256 }) => ({
          name: file.name,
          size: file.bytes.byteLength,
          sha256,
          ...(shared.has(sha256) ? { sameFileAs: shared.get(sha256)!.cycles, duplicateReason: shared.get(sha256)!.reason } : {}),
        })),
        verdict: analysis.result.verdict,
        inputHash: analysis.inputHash,
        supersedes: input.supersedesId ?? null,
        ...viaApiToken(actor),
      },
    }),
    inside: async (tx, cycleId) => {
      await insertSeriesOfCurrentAnalysis(tx, { cycleId, columns: { ...recordingToColumns(analysis.recording), overview: seriesOverviewOf(analysis.recording, analysis.result) } });
      await notifyFailure(tx, cycleId, analysis.result);
      await input.recordAnswer?.(tx, { status: 201, body: { id: cycleId, status: "draft", analysis: analysis.result } satisfies CreateCycleResponse });
    },
  });
  return { id, status: "draft", analysis: analysis.result, fileAnalysis: analysis };
}

/**
 * POST /api/cycles. With an Idempotency-Key (and the hash of what was sent), a retry after a lost answer gets the
 * first answer back and creates nothing; see answerOnce.
 */
export async function registerUploadedCycle(input: CreateCycleInput, idempotency: { key: string | null; requestHash: string }): Promise<IdempotentAnswer> {
  assertAllowed(input.actor, "cycle:create", "register cycles");
  return answerOnce({ actor: input.actor, ...idempotency }, async (recordAnswer) => {
    const created = await createCycleFromUpload({ ...input, recordAnswer });
    return { status: 201, body: { id: created.id, status: created.status, analysis: created.analysis } satisfies CreateCycleResponse };
  });
}

/**
 * The files whose bytes another cycle of the site already holds. Refused (409, naming the cycle) unless the user says
 * why, e.g. one logger file holding several cycles; then each such file keeps that reason and the cycles it shares.
 */
async function sharedFileReasons({
  siteId,
  files,
  duplicateReason,
  exceptCycleId,
}: {
  siteId: string;
  files: Array<{ file: UploadedFile; sha256: string }>;
  duplicateReason?: string | null;
  exceptCycleId?: string;
}) {
  const holders = await findCyclesHoldingFiles({ siteId, sha256s: files.map((f) => f.sha256), exceptCycleId });
  const shared = new Map<string, { reason: string; cycles: string[] }>();
  if (holders.length === 0) return shared;
  const reason = duplicateReason?.trim();
  if (!reason) {
    const { file } = files.find((f) => f.sha256 === holders[0].sha256)!;
    const names = [...new Set(holders.map((h) => h.cycleNumber))].join(", ");
    throw new AppError(
      409,
      `${file.name} is the same file (SHA-256 ${holders[0].sha256.slice(0, 12)}…) as cycle ${names} on this site. If one file holds several cycles, say why under “Why this file belongs to this cycle too”; otherwise attach this cycle's own file.`,
      "duplicateReason",
    );
  }
  for (const h of holders) shared.set(h.sha256, { reason, cycles: [...(shared.get(h.sha256)?.cycles ?? []), h.cycleNumber] });
  return shared;
}

export type CorrectionInput = {
  actor: Actor;
  id: string;
  file?: UploadedFile;
  mapping?: MappingOverrides;
  /** why the cycle is analysed again: required, kept with the analysis */
  reason: string;
  duplicateReason?: string | null;
  details?: { profileId?: string; instrumentId?: string; load?: string; loadType?: LoadType; loadLot?: string };
  /** new sensor positions for the current mapping (a correction of where the probes sat); a new mapping brings its own */
  positions?: ChannelPlacements;
  /** an air leakage test's times marked by the user; undefined keeps those marked on the same file */
  leakMarks?: AirLeakageMarks | null;
};

/**
 * A correction of a draft or returned cycle: a new file, a new mapping and/or changed details (profile, instrument,
 * load) give a new analysis with its reason; earlier files and analyses stay on the record. Signed records are locked.
 */
export async function reanalyseCycle({ actor, id, file, mapping, positions, reason, duplicateReason, details = {}, leakMarks }: CorrectionInput) {
  assertAllowed(actor, "cycle:create", "correct cycles");
  const cycle = await getCycleRow({ actor, id });
  if (!cycle) throw new AppError(404, "That cycle was not found.");
  if (isLockedCycleStatus(cycle.status)) throw new AppError(409, `This cycle is ${CYCLE_STATUS_LABELS[cycle.status].toLowerCase()} and locked; a correction must be a new, linked record.`);
  if (cycle.status === "submitted") throw new AppError(409, "This cycle is waiting for review; it can be corrected once it is returned.");
  const cleanReason = reason.trim();
  if (!cleanReason) throw new AppError(422, "Say why the cycle is analysed again (a new file, a new mapping or changed details): the reason is kept with the analysis.", "reason");
  const [profile, site] = await Promise.all([getProfileForSite({ actor, id: details.profileId ?? cycle.profileId }), getSiteById({ id: cycle.siteId })]);
  if (!profile && details.profileId) throw new AppError(404, "That acceptance profile was not found on your site.", "profileId");
  if (!profile || !site) throw new AppError(409, "This cycle's acceptance profile or site is missing, so it cannot be analysed again.");
  const instrument = details.instrumentId ? await getInstrumentForSite({ actor, id: details.instrumentId }) : undefined;
  if (details.instrumentId && !instrument) throw new AppError(404, "That instrument was not found on your site.", "instrumentId");
  const stored = await getAnalysedFile({ analysisId: cycle.currentAnalysisId ?? "" });
  if (!file && !stored) throw new AppError(409, "This cycle has no logger file to analyse again; upload one.");
  const bytes = file ? file.bytes : new Uint8Array(stored!.bytes);
  // Without a new mapping the stored file is read as the current analysis read it: a change of details alone keeps the mapping.
  const currentMapping = ((stored?.analysisMapping ?? stored?.fileMapping) as MappingOverrides | null) ?? null;
  const baseMapping = mapping ?? (file ? {} : (currentMapping ?? {}));
  // A new file or mapping that gives no positions keeps the probes' positions for the channels it shares: the probes did not move.
  const carried = !positions && !mapping?.positions ? currentMapping?.positions : undefined;
  const placed = positions ?? carried;
  const effectiveMapping: MappingOverrides = placed ? { ...baseMapping, positions: placed } : baseMapping;
  let analysis: FileAnalysis;
  try {
    // The same file keeps the times marked on it unless new ones are given; a new file starts unmarked.
    const marks = leakMarks !== undefined ? leakMarks : file ? null : marksOf(stored?.result);
    const choice = { testKind: cycle.testKind, marks };
    analysis = analyzeLoggerBytes(bytes, profile, effectiveMapping, siteAtmosphereKpa(site), choice);
    const fitted = carried ? fittedPlacements(analysis) : checkedPlacements(analysis);
    if (fitted !== effectiveMapping.positions) analysis = analyzeLoggerBytes(bytes, profile, { ...effectiveMapping, positions: fitted }, siteAtmosphereKpa(site), choice);
  } catch (error) {
    if (error instanceof AppError) throw error;
    if (error instanceof LoggerFileError || error instanceof AnalysisError) throw new AppError(422, `${file?.name ?? "The stored file"}: ${error.message}`, "file");
    throw error;
  }
  const shared = file ? await sharedFileReasons({ siteId: site.id, files: [{ file, sha256: analysis.sha256 }], duplicateReason, exceptCycleId: id }) : new Map();
  const changed = changedDetails(cycle, { profileId: profile.id, instrumentId: instrument?.id, loadDescription: details.load?.trim(), loadType: details.loadType, loadLot: details.loadLot?.trim() });
  const placementChange = changedPlacements((currentMapping ?? {}).positions, analysis.mapping.positions);
  const savedId = await insertCorrection({
    cycleId: id,
    file: file
      ? {
          name: file.name,
          sizeBytes: bytes.byteLength,
          sha256: analysis.sha256,
          contentType: file.contentType || "text/csv",
          bytes: Buffer.from(bytes),
          dialect: analysis.dialect,
          mapping: analysis.mapping,
          duplicateReason: shared.get(analysis.sha256)?.reason ?? null,
          uploadedBy: actor.id,
        }
      : { existingId: stored!.fileId },
    analysis: { ...analysisRow(analysis, actor), reason: cleanReason },
    details: changed.next,
    audit: (analysisId) => ({
      actorId: actor.id,
      actorEmail: actor.email,
      siteId: cycle.siteId,
      action: "cycle.reanalyse",
      entityType: "cycle",
      entityId: id,
      oldValue: { analysis: cycle.currentAnalysisId, verdict: cycle.verdict, ...changed.previous, ...placementChange.previous },
      newValue: {
        analysis: analysisId,
        verdict: analysis.result.verdict,
        file: file ? { name: file.name, sha256: analysis.sha256, ...(shared.size ? { sameFileAs: shared.get(analysis.sha256)!.cycles, duplicateReason } : {}) } : null,
        mapping: mapping ?? null,
        ...changed.next,
        ...placementChange.next,
      },
      reason: cleanReason,
    }),
    inside: async (tx) => {
      await insertSeriesOfCurrentAnalysis(tx, { cycleId: id, columns: { ...recordingToColumns(analysis.recording), overview: seriesOverviewOf(analysis.recording, analysis.result) } });
      await notifyFailure(tx, id, analysis.result);
    },
  });
  if (!savedId) throw new AppError(409, "The cycle was submitted or signed while you were correcting it; reload it.");
  await settleBowieDickVerdict({ cycleId: id, testKind: cycle.testKind });
  return { id, analysis: analysis.result };
}

const marksOf = (result: unknown): AirLeakageMarks | null => ((result as CycleAnalysis | undefined)?.kind === "air-leakage" ? ((result as { marks: AirLeakageMarks | null }).marks ?? null) : null);

type DetailChange = { profileId?: string; instrumentId?: string | null; loadDescription?: string; loadType?: LoadType | null; loadLot?: string };
type DetailRow = { profileId: string; instrumentId: string | null; loadDescription: string; loadType: LoadType | null; loadLot: string };

/** The cycle's details that this correction changes: their old and new values, for the row and the ledger. */
function changedDetails(cycle: DetailRow, wanted: { profileId: string; instrumentId?: string; loadDescription?: string; loadType?: LoadType; loadLot?: string }) {
  const previous: DetailChange = {};
  const next: DetailChange = {};
  if (wanted.profileId !== cycle.profileId) [previous.profileId, next.profileId] = [cycle.profileId, wanted.profileId];
  if (wanted.instrumentId !== undefined && wanted.instrumentId !== cycle.instrumentId) [previous.instrumentId, next.instrumentId] = [cycle.instrumentId, wanted.instrumentId];
  if (wanted.loadDescription !== undefined && wanted.loadDescription !== cycle.loadDescription) [previous.loadDescription, next.loadDescription] = [cycle.loadDescription, wanted.loadDescription];
  if (wanted.loadType !== undefined && wanted.loadType !== cycle.loadType) [previous.loadType, next.loadType] = [cycle.loadType, wanted.loadType];
  if (wanted.loadLot !== undefined && wanted.loadLot !== cycle.loadLot) [previous.loadLot, next.loadLot] = [cycle.loadLot, wanted.loadLot];
  return { previous, next };
}

/** The temperature channels of what an analysis read. */
const temperatureHeaders = (analysis: FileAnalysis) => analysis.recording.temperatures.map((t) => t.header);

/** The user's positions must name temperature channels of the file: a position for another column is refused with its name. */
function checkedPlacements(analysis: FileAnalysis): ChannelPlacements | undefined {
  const positions = analysis.mapping.positions;
  if (!positions) return positions;
  const channels = temperatureHeaders(analysis);
  const stray = Object.keys(positions).find((header) => !channels.includes(header));
  if (stray !== undefined) {
    throw new AppError(
      422,
      `mapping.positions names "${stray}", which is not a temperature channel of the file (its temperature channels: ${channels.map((c) => `"${c}"`).join(", ") || "none"}).`,
      "mapping",
    );
  }
  return positions;
}

/** A saved mapping's positions kept only for the channels this file has (the same object when all fit). */
function fittedPlacements(analysis: FileAnalysis): ChannelPlacements | undefined {
  const positions = analysis.mapping.positions;
  if (!positions) return positions;
  const channels = temperatureHeaders(analysis);
  const kept = Object.entries(positions).filter(([header]) => channels.includes(header));
  return kept.length === Object.keys(positions).length ? positions : Object.fromEntries(kept);
}

/** Old and new sensor positions for the ledger, when a correction changes them. */
function changedPlacements(before: ChannelPlacements | undefined, after: ChannelPlacements | undefined) {
  if (canonicalJson(before ?? {}) === canonicalJson(after ?? {})) return { previous: {}, next: {} };
  return { previous: { positions: before ?? null }, next: { positions: after ?? null } };
}

function analysisRow(analysis: FileAnalysis, actor: Actor) {
  return {
    mapping: analysis.mapping,
    engineVersion: analysis.engineVersion,
    inputHash: analysis.inputHash,
    limits: analysis.limits,
    result: analysis.result,
    verdict: analysis.result.verdict,
    createdBy: actor.id,
  };
}

type Tx = Parameters<typeof enqueueAnalysisFailedMail>[0];

async function notifyFailure(tx: Tx, cycleId: string, result: CycleAnalysis) {
  if (result.verdict !== "fail") return;
  const failedChecks = result.checks.filter((c) => !c.passed).map((c) => c.label);
  await enqueueAnalysisFailedMail(tx, { cycleId, summary: result.summary, failedChecks });
}
