import "server-only";
import type { z } from "zod";
import type { Cycle } from "@/db/schema";
import { getCycleRow } from "@/db/queries/cycles";
import { getAttachmentOfSite, insertIndicatorSheet, listAttachmentsOf, listIndicatorSheetsOfCycle, setCycleVerdict, type NewAttachment } from "@/db/queries/attachments";
import { AppError } from "@/lib/errors";
import { can } from "@/lib/auth/permissions";
import { sha256Hex } from "@/lib/integrity";
import { checkIndicatorPhoto, evaluateBowieDick } from "@/lib/periodic-tests/bowie-dick";
import type { IndicatorSheetResult } from "@/lib/domain";
import type { cycleIndicatorSheetSchema, UploadedBlob } from "@/lib/validations/periodic-tests";
import { assertAllowed, type Actor } from "./access";

export type IndicatorPhoto = { name: string; bytes: Uint8Array; contentType: string; sha256: string };

/** Reads and checks an uploaded photo of an indicator sheet: JPEG or PNG by its content, at most 10 MB; refused with a plain sentence on the `photo` field. */
export async function readIndicatorPhoto(photo: UploadedBlob): Promise<IndicatorPhoto> {
  const name = (photo.name || "photo").slice(0, 255);
  const bytes = new Uint8Array(await photo.arrayBuffer());
  const check = checkIndicatorPhoto({ name, bytes });
  if (!check.ok) throw new AppError(bytes.byteLength > 0 && /at most 10 MB/.test(check.message) ? 413 : 422, check.message, "photo");
  return { name, bytes, contentType: check.contentType, sha256: sha256Hex(bytes) };
}

export function photoAttachment(actor: Actor, siteId: string, ownerKind: NewAttachment["ownerKind"], photo: IndicatorPhoto): NewAttachment {
  return { siteId, ownerKind, name: photo.name, contentType: photo.contentType, sizeBytes: photo.bytes.byteLength, sha256: photo.sha256, bytes: Buffer.from(photo.bytes), uploadedBy: actor.id };
}

const verdictOfSheet = (result: IndicatorSheetResult) => (evaluateBowieDick(result).passed ? "pass" : "fail");
const EDITABLE_STATUSES: readonly string[] = ["draft", "returned", "rejected"];

/**
 * The indicator-sheet reading of a Bowie-Dick cycle with its photo. The cycle's verdict follows
 * the sheet, never the thermometric analysis of a logged file. A second reading replaces the
 * first only with a reason; both stay on the record.
 */
export async function recordCycleIndicatorSheet({ actor, cycleId, input }: { actor: Actor; cycleId: string; input: z.infer<typeof cycleIndicatorSheetSchema> }) {
  assertAllowed(actor, "cycle:create", "record indicator sheets");
  const cycle = await getCycleRow({ actor, id: cycleId });
  if (!cycle) throw new AppError(404, "That cycle was not found.");
  if (cycle.testKind !== "bowie-dick") throw new AppError(409, "This cycle is not a Bowie-Dick test; only a Bowie-Dick cycle is judged by an indicator sheet.");
  if (!EDITABLE_STATUSES.includes(cycle.status)) {
    throw new AppError(
      409,
      cycle.status === "submitted" ? "This cycle is waiting for review; its sheet can be changed once it is returned." : "This cycle is signed and locked; its sheet cannot be changed.",
    );
  }
  const earlier = await listIndicatorSheetsOfCycle({ cycleId });
  if (earlier.length > 0 && !input.reason) throw new AppError(422, "This cycle already has a sheet reading; give the reason for recording another one.", "reason");
  const photo = await readIndicatorPhoto(input.photo);
  const verdict = verdictOfSheet(input.outcome);
  const saved = await insertIndicatorSheet({
    cycleId,
    fromStatus: cycle.status,
    sheet: { result: input.outcome, indicatorLot: input.indicatorLot, reason: input.reason, recordedBy: actor.id },
    photo: photoAttachment(actor, cycle.siteId, "cycle", photo),
    verdict,
    audit: ({ sheetId, attachmentId }) => ({
      actorId: actor.id,
      actorEmail: actor.email,
      siteId: cycle.siteId,
      action: "cycle.indicator-sheet",
      entityType: "cycle",
      entityId: cycleId,
      oldValue: { verdict: cycle.verdict, sheet: earlier[0] ? { id: earlier[0].id, result: earlier[0].result, indicatorLot: earlier[0].indicatorLot } : null },
      newValue: { verdict, sheet: { id: sheetId, result: input.outcome, indicatorLot: input.indicatorLot }, photo: { attachment: attachmentId, name: photo.name, sha256: photo.sha256 } },
      reason: input.reason,
    }),
  });
  if (!saved) throw new AppError(409, "The cycle changed while the sheet was being saved; reload it and try again.");
  return { cycleId, verdict, sheetId: saved.sheetId, photoSha256: photo.sha256 };
}

/** A Bowie-Dick cycle's verdict comes from its sheet; any other kind keeps the analysis verdict. */
export function verdictOfNewCycle(testKind: string, analysisVerdict: "pass" | "fail"): "pass" | "fail" | null {
  return testKind === "bowie-dick" ? null : analysisVerdict;
}

/** After a new analysis of a Bowie-Dick cycle: the verdict goes back to its sheet's (none without one). */
export async function settleBowieDickVerdict({ cycleId, testKind }: { cycleId: string; testKind: string }) {
  if (testKind !== "bowie-dick") return;
  const [latest] = await listIndicatorSheetsOfCycle({ cycleId });
  await setCycleVerdict({ cycleId, verdict: latest ? verdictOfSheet(latest.result) : null });
}

/** What the record page shows of a Bowie-Dick cycle's sheet: every reading, newest first, with its photo. */
export async function getCycleIndicatorSheets({ actor, cycleId }: { actor: Actor; cycleId: string }) {
  const cycle = await getCycleRow({ actor, id: cycleId });
  if (!cycle || cycle.testKind !== "bowie-dick") return null;
  const [sheets, photos] = await Promise.all([listIndicatorSheetsOfCycle({ cycleId: cycle.id }), listAttachmentsOf({ ownerKind: "cycle", ownerId: cycle.id })]);
  const photoBy = new Map(photos.map((p) => [p.id, p]));
  const readings = sheets.map((s) => {
    const photo = photoBy.get(s.attachmentId);
    return {
      id: s.id,
      result: s.result,
      passed: evaluateBowieDick(s.result).passed,
      indicatorLot: s.indicatorLot,
      reason: s.reason,
      recordedBy: s.recordedBy,
      recordedByName: s.recordedByName,
      recordedAt: s.recordedAt,
      photo: photo ? { id: photo.id, name: photo.name, contentType: photo.contentType, sizeBytes: photo.sizeBytes, sha256: photo.sha256, url: `/api/attachments/${photo.id}` } : null,
    };
  });
  return { readings, mayRecord: can(actor.role, "cycle:create") && EDITABLE_STATUSES.includes(cycle.status) };
}
export type CycleIndicatorSheets = NonNullable<Awaited<ReturnType<typeof getCycleIndicatorSheets>>>;

/** The current sheet of a cycle with its photo's bytes, as a report prints it; null for other kinds or without a sheet. */
export async function getIndicatorSheetForReport({ cycleId, testKind }: { cycleId: string; testKind: string }) {
  if (testKind !== "bowie-dick") return undefined;
  const [latest] = await listIndicatorSheetsOfCycle({ cycleId });
  if (!latest) return null;
  const photo = (await listAttachmentsOf({ ownerKind: "cycle", ownerId: cycleId })).find((p) => p.id === latest.attachmentId);
  return {
    result: latest.result,
    passed: evaluateBowieDick(latest.result).passed,
    indicatorLot: latest.indicatorLot,
    recordedByName: latest.recordedByName,
    recordedAt: latest.recordedAt,
    photo: photo ? { name: photo.name, contentType: photo.contentType, sha256: sha256Hex(new Uint8Array(photo.bytes)), bytes: new Uint8Array(photo.bytes) } : null,
  };
}

type Executor = NonNullable<Parameters<typeof listIndicatorSheetsOfCycle>[0]["tx"]>;

/** What a signature on a Bowie-Dick cycle binds besides the logged file: the current sheet reading and its photo's hash, recomputed from the bytes. */
export async function indicatorSheetBundle({ cycleId, tx }: { cycleId: string; tx?: Executor }) {
  const [latest] = await listIndicatorSheetsOfCycle({ cycleId, tx });
  if (!latest) return undefined;
  const photo = (await listAttachmentsOf({ ownerKind: "cycle", ownerId: cycleId, tx })).find((p) => p.id === latest.attachmentId);
  return { id: latest.id, result: latest.result, indicatorLot: latest.indicatorLot, photoSha256: photo ? sha256Hex(new Uint8Array(photo.bytes)) : null };
}

/**
 * Closing a Bowie-Dick cycle (approved or failure-confirmed) needs its sheet and photo; the
 * meaning must match the sheet, and whoever recorded a reading cannot sign it.
 */
export async function assertBowieDickSignable({ actor, cycle, meaning }: { actor: Actor; cycle: Pick<Cycle, "id" | "testKind">; meaning: string }) {
  if (cycle.testKind !== "bowie-dick" || !["approved", "failure-confirmed"].includes(meaning)) return;
  const sheets = await listIndicatorSheetsOfCycle({ cycleId: cycle.id });
  const latest = sheets[0];
  if (!latest) throw new AppError(409, "A Bowie-Dick cycle is judged by its indicator sheet: record the sheet's result, lot and photo before it can be signed.");
  const photos = await listAttachmentsOf({ ownerKind: "cycle", ownerId: cycle.id });
  if (!photos.some((p) => p.id === latest.attachmentId)) throw new AppError(409, "The photo of this cycle's indicator sheet is missing; record the sheet again with its photo.");
  const passed = evaluateBowieDick(latest.result).passed;
  if (meaning === "approved" && !passed) throw new AppError(409, "The indicator sheet did not change uniformly, so this Bowie-Dick test failed; it cannot be approved.");
  if (meaning === "failure-confirmed" && passed) throw new AppError(409, "The indicator sheet changed uniformly, so this Bowie-Dick test passed; a failure cannot be confirmed.");
  if (sheets.some((s) => s.recordedBy === actor.id)) throw new AppError(403, "You recorded this cycle's indicator sheet yourself; another engineer must sign it.");
}

/** An attachment (a photo) of the actor's site, for the record that shows it; 404 off the site. */
export async function getAttachmentForViewing({ actor, id }: { actor: Actor; id: string }) {
  if (!actor.siteId) throw new AppError(404, "That attachment was not found.");
  const row = await getAttachmentOfSite({ siteId: actor.siteId, id });
  if (!row) throw new AppError(404, "That attachment was not found.");
  const permission = row.ownerKind === "cycle" ? "cycle:read" : "equipment:read";
  if (!can(actor.role, permission)) throw new AppError(403, "Your role does not allow you to see this record's attachments.");
  return { name: row.name, contentType: row.contentType, sha256: row.sha256, bytes: new Uint8Array(row.bytes) };
}
