import "server-only";
import { BROAD_SEARCH_MATCHES, countCycles, countSearchMatchesUpTo, getCycleRecordRows, getCycleRow, listCycles as listCycleRows, type CycleFilter, type CycleSortKey } from "@/db/queries/cycles";
import { listAuditEventsForEntity, recordAuditEvent } from "@/db/queries/audit";
import { isIndexedSearch } from "@/db/queries/search";
import { listInstrumentsForSite, listProfilesForSite, listSterilizersForSite } from "@/db/queries/catalog";
import { listContributions } from "@/db/queries/reviews";
import { listCertificatesOfInstrument } from "@/db/queries/instruments";
import { getSiteById } from "@/db/queries/sites";
import { can } from "@/lib/auth/permissions";
import { AppError } from "@/lib/errors";
import { siteAtmosphereKpa } from "@/lib/cycles/analyze-file";
import { toCsv, type CsvCell } from "@/lib/csv-export";
import { isEditableCycleStatus, testKindLabel, cycleStatusLabel } from "@/lib/domain";
import type { CycleAnalysis } from "@/lib/analysis/types";
import type { CycleDetail, CycleListItem, CycleListResponse, HistoryEntry, InstrumentCalibration, MappingOverrides } from "@/lib/cycles/contracts";
import { channelPositionsOf, positionRefusalOf } from "@/lib/cycles/positions";
import { describeReplacement, recordedChannels, recordedStart } from "@/lib/cycles/file-replacement";
import { certificateOnDate } from "@/lib/periodic-tests/calibration";
import { localDate } from "@/lib/periodic-tests/schedule";
import { assertAllowed, type Actor } from "./access";
import { checkSignature } from "./record-bundle";
import { cachedPage, cachedTotal, ledgerSeq } from "./list-totals";

export type CycleListQuery = CycleFilter & { page?: number; pageSize?: number; sort?: string };

/** The actor's site's cycles, one page, filtered and sorted (GET /api/cycles). */
export async function listCycles({ actor, query }: { actor: Actor; query: CycleListQuery }): Promise<CycleListResponse> {
  assertAllowed(actor, "cycle:read", "read cycles");
  const { page: rawPage, pageSize: rawPageSize, sort: rawSort, ...filter } = query;
  const pageSize = Math.min(Math.max(Math.trunc(rawPageSize ?? 25), 1), 1000);
  const page = Math.max(Math.trunc(rawPage ?? 1), 1);
  const [sortKey, sortDir] = (rawSort ?? "startedAt:desc").split(":");
  const key: CycleSortKey = (["startedAt", "createdAt", "cycleNumber", "status", "verdict", "sterilizer", "submittedAt"] as const).find((k) => k === sortKey) ?? "startedAt";
  const siteId = actor.siteId ?? "";
  const sort = { key, direction: sortDir === "asc" ? ("asc" as const) : ("desc" as const) };
  // One read of the ledger's head serves the page, its total and the search's breadth (lib/services/list-totals.ts).
  const seq = await ledgerSeq();
  const broad = await isBroadSearch(filter.q, seq);
  const [rows, total] = await Promise.all([
    cachedPage({ list: "cycles", siteId, query: { filter, sort, page, pageSize }, seq, read: () => listCycleRows({ actor, filter, page, pageSize, sort, broad }) }),
    cachedTotal({ list: "cycles", siteId, filter, seq, count: () => countCycles({ actor, filter, broad }) }),
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

/**
 * Whether a search text matches so many cycles that its pages are read row by row (db/queries/cycles.ts): the trigram
 * index is counted (up to BROAD_SEARCH_MATCHES, every site's) once per text while the ledger does not move on, not per page.
 */
async function isBroadSearch(text: string | undefined, seq: number): Promise<boolean> {
  if (!text || !isIndexedSearch(text)) return false;
  const matches = await cachedTotal({ list: "search-matches", siteId: "", filter: { text }, seq, count: () => countSearchMatchesUpTo(text, BROAD_SEARCH_MATCHES) });
  return matches >= BROAD_SEARCH_MATCHES;
}

/** One cycle of the actor's site as GET /api/cycles/{id} sends it; undefined when not there. */
export async function getCycleDetail({ actor, id }: { actor: Actor; id: string }): Promise<CycleDetail | undefined> {
  assertAllowed(actor, "cycle:read", "read cycles");
  const rows = await getCycleRecordRows({ actor, id });
  if (!rows) return undefined;
  const { cycle, site, sterilizer, profile, instrument, files, analysisRows, signatureRows, report, duplicates } = rows;
  const currentRow = analysisRows.find((a) => a.analysis.id === cycle.currentAnalysisId) ?? analysisRows[0];
  const current = currentRow?.analysis;
  const currentAnalysis = (current?.result as CycleAnalysis | undefined) ?? null;
  const readMapping = (current?.mapping ?? files.find((f) => f.id === current?.loggerFileId)?.mapping ?? null) as MappingOverrides | null;
  const positions = channelPositionsOf(currentAnalysis, readMapping?.positions);
  const firstRow = analysisRows[analysisRows.length - 1];
  const calibration = instrument ? await calibrationOnTestDate(instrument.id, cycle.startedAt ?? cycle.createdAt, site.timeZone) : null;
  const signatures = await Promise.all(
    signatureRows.map(async (s) => ({
      id: s.id,
      printedName: s.printedName,
      role: s.role,
      meaning: s.meaning,
      reason: s.reason,
      signedAt: s.signedAt,
      bundleHash: s.bundleHash,
      ...(await checkSignature({ signature: s })),
    })),
  );
  return {
    id: cycle.id,
    cycleNumber: cycle.cycleNumber,
    status: cycle.status,
    verdict: cycle.verdict,
    testKind: cycle.testKind,
    loadDescription: cycle.loadDescription,
    loadType: cycle.loadType ?? null,
    loadLot: cycle.loadLot,
    startedAt: cycle.startedAt,
    createdAt: cycle.createdAt,
    submittedAt: cycle.submittedAt,
    createdBy: { id: cycle.createdBy, name: rows.creatorName },
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
      basisReason: profile.basisReason,
    },
    instrument: instrument ? { id: instrument.id, name: instrument.name, serialNumber: instrument.serialNumber, calibration } : null,
    files: files.map((f) => ({ ...f, dialect: (f.dialect ?? null) as CycleDetail["files"][number]["dialect"], mapping: (f.mapping ?? null) as MappingOverrides | null })),
    analysis: currentAnalysis,
    analysisId: current?.id ?? null,
    positions,
    positionProblem: positionRefusalOf({ testKind: cycle.testKind, analysis: currentAnalysis, positions }),
    analysisHistory: analysisRows.map(({ analysis: a, fileName, fileSha256, analystName }) => ({
      id: a.id,
      createdAt: a.createdAt,
      verdict: a.verdict,
      engineVersion: a.engineVersion,
      inputHash: a.inputHash,
      reason: a.reason,
      createdByName: analystName,
      fileName,
      fileSha256,
    })),
    fileReplacement: currentRow && firstRow ? describeReplacement(recordingOf(firstRow), recordingOf(currentRow)) : null,
    sharedFiles: duplicates.map((d) => ({ fileName: d.fileName, sha256: d.sha256, cycleId: d.cycleId, cycleNumber: d.cycleNumber, reason: d.reason ?? d.otherReason })),
    signatures,
    supersedesId: cycle.supersedesId,
    report: report ?? null,
  };
}

type AnalysisRow = NonNullable<Awaited<ReturnType<typeof getCycleRecordRows>>>["analysisRows"][number];

const recordingOf = ({ analysis, fileName, fileSha256 }: AnalysisRow) => ({
  fileName,
  sha256: fileSha256,
  startedAt: recordedStart(analysis.result),
  channels: recordedChannels(analysis.result),
});

/** The instrument's certificate in force on the test's day at the site, and whether it had lapsed by then. */
async function calibrationOnTestDate(instrumentId: string, testedAt: string, timeZone: string): Promise<InstrumentCalibration | null> {
  const testDate = localDate(testedAt, timeZone);
  const found = certificateOnDate(await listCertificatesOfInstrument({ instrumentId }), testDate);
  if (!found) return null;
  const { certificateNumber, calibratedOn, dueOn } = found.certificate;
  return { certificateNumber, calibratedOn, dueOn, testDate, lapsed: found.lapsed };
}

/** The cycle's id and status if the actor may read it on their site (403 for a refused role), else undefined. */
export async function findCycle({ actor, id }: { actor: Actor; id: string }) {
  assertAllowed(actor, "cycle:read", "read cycles");
  const row = await getCycleRow({ actor, id });
  return row ? { id: row.id, status: row.status } : undefined;
}

/**
 * The cycle record page: the cycle, its history from the ledger, whether the actor gave it an input (then they cannot
 * decide it), and, while it is open to correction and the actor may correct it, the profiles and instruments to choose
 * from. 404 off the actor's site.
 */
export async function getCycleRecord({ actor, id }: { actor: Actor; id: string }) {
  const detail = await getCycleDetail({ actor, id });
  if (!detail) throw new AppError(404, "That cycle was not found.");
  const correcting = can(actor.role, "cycle:create") && isEditableCycleStatus(detail.status);
  const [events, contributions, profiles, instruments] = await Promise.all([
    listAuditEventsForEntity({ entityType: "cycle", entityId: detail.id }),
    listContributions({ cycleId: detail.id }),
    correcting ? listProfilesForSite({ actor }) : [],
    correcting ? listInstrumentsForSite({ actor }) : [],
  ]);
  const history: HistoryEntry[] = events.map((e) => ({ seq: e.seq, at: e.at, actorEmail: e.actorEmail, action: e.action, reason: e.reason, newValue: e.newValue }));
  const correctionChoices = correcting
    ? {
        profiles: [...(profiles.some((p) => p.id === detail.profile.id) ? [] : [detail.profile]), ...profiles].map((p) => ({ id: p.id, name: p.name })),
        instruments: instruments.map((i) => ({ id: i.id, name: i.name, serialNumber: i.serialNumber })),
      }
    : null;
  return { detail, history, contributed: contributions.some((c) => c.userId === actor.id), correctionChoices };
}

/** What the cycle list and review queue pages show around the table: filters and the site's time zone. */
export async function getCycleListContext({ actor, queue = false }: { actor: Actor; queue?: boolean }) {
  if (queue) assertAllowed(actor, "review:queue", "review cycles");
  else assertAllowed(actor, "cycle:read", "read cycles");
  const [sterilizers, site] = await Promise.all([listSterilizersForSite({ actor }), actor.siteId ? getSiteById({ id: actor.siteId }) : undefined]);
  return {
    sterilizers: sterilizers.map((s) => ({ id: s.id, name: s.name })),
    timeZone: site?.timeZone ?? "UTC",
    mayCreate: can(actor.role, "cycle:create"),
  };
}

// Big enough for years of a unit's cycles; beyond it, narrow the filters.
const MAX_EXPORT_ROWS = 50_000;
const EXPORT_PAGE = 1000;

const EXPORT_HEADER = ["Cycle number", "Started (UTC)", "Registered (UTC)", "Sterilizer", "Acceptance profile", "Kind of test", "Load", "Status", "Verdict", "Registered by", "Record ID"];

function exportRow(c: CycleListItem): CsvCell[] {
  return [
    c.cycleNumber,
    c.startedAt,
    c.createdAt,
    c.sterilizer.name,
    c.profile.name,
    testKindLabel(c.testKind),
    c.loadDescription,
    cycleStatusLabel(c.status),
    c.verdict ?? "not analysed",
    c.createdByName,
    c.id,
  ];
}

/** The filtered cycles of the actor's site as CSV, safe to open in a spreadsheet; the export is audited. */
export async function exportCyclesCsv({ actor, query }: { actor: Actor; query: CycleListQuery }) {
  assertAllowed(actor, "cycle:read", "export cycles");
  const { page: _page, pageSize: _pageSize, ...filter } = query;
  const items: CycleListItem[] = [];
  for (let page = 1; ; page++) {
    const batch = await listCycles({ actor, query: { ...filter, page, pageSize: EXPORT_PAGE } });
    if (batch.total > MAX_EXPORT_ROWS) {
      throw new AppError(
        413,
        `These filters match ${batch.total.toLocaleString("en-GB")} cycles; an export holds at most ${MAX_EXPORT_ROWS.toLocaleString("en-GB")}. Narrow the dates or other filters.`,
      );
    }
    items.push(...batch.items);
    if (batch.items.length < EXPORT_PAGE || items.length >= batch.total) break;
  }
  await recordAuditEvent({
    actorId: actor.id,
    actorEmail: actor.email,
    siteId: actor.siteId,
    action: "cycles.export",
    entityType: "cycle",
    entityId: null,
    newValue: { filter, rows: items.length, format: "csv" },
  });
  const stamp = new Date().toISOString().slice(0, 10);
  return { csv: toCsv(EXPORT_HEADER, items.map(exportRow)), fileName: `papin-cycles-${stamp}.csv` };
}
