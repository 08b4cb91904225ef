import "server-only";
import { getLoadingPatternOnSite, getProfileOnSite, getSterilizerOnSite, insertStudy, updateStudyDraftRow, countOtherStudiesOfPattern } from "@/db/queries/studies";
import type { Actor } from "@/db/queries/users";
import { AppError } from "@/lib/errors";
import { DEFAULT_REQUALIFICATION_MONTHS, DEFAULT_RUNS_REQUIRED, STUDY_KIND_LABELS } from "@/lib/domain/studies";
import type { StudyDraftChanges, StudyInput } from "@/lib/studies/contracts";
import { studyDraftChangesSchema, studyInputSchema } from "@/lib/validations/studies";
import { assertAllowed } from "./access";
import { auditActor, getSiteContext, siteIdOf } from "./site";
import { studyOfSite } from "./studies-detail";

/** Qualification studies (issue 14): planning. Runs, evidence and signatures live beside this file. */
export { getStudyDetail, listStudies } from "./studies-detail";
export { attachRun, listAttachableCycles, listStudyRuns, proposeSensorMap } from "./studies-runs";
export { closeDeviation, raiseDeviation, recordIndicator, updateDeviation } from "./studies-evidence";
export { signStudy } from "./studies-sign";

const studyTitle = (kind: StudyInput["kind"], patternName: string) => `${STUDY_KIND_LABELS[kind].replace(/ \(.*\)$/, "")}: ${patternName}`;

/** Plans a study in draft: the sterilizer, the profile and the pattern (an existing one of that sterilizer, or a new one). */
export async function createStudy({ actor, input }: { actor: Actor; input: StudyInput }): Promise<{ id: string; studyNumber: string }> {
  assertAllowed(actor, "study:plan", "plan qualification studies");
  const siteId = siteIdOf(actor, "studies");
  const data = studyInputSchema.parse(input);
  const sterilizer = await getSterilizerOnSite({ siteId, id: data.sterilizerId });
  if (!sterilizer) throw new AppError(404, "That sterilizer was not found on your site.", "sterilizerId");
  const profile = await getProfileOnSite({ siteId, id: data.profileId });
  if (!profile) throw new AppError(404, "That profile was not found on your site.", "profileId");
  if (!profile.active) throw new AppError(409, `The profile ${profile.name} is no longer in use; choose its current version.`, "profileId");
  const newPattern = typeof data.loadingPattern === "string" ? null : { ...data.loadingPattern, id: crypto.randomUUID() };
  let patternId: string;
  let patternName: string;
  if (newPattern) {
    patternId = newPattern.id;
    patternName = newPattern.name;
  } else {
    const existing = await getLoadingPatternOnSite({ siteId, id: data.loadingPattern as string });
    if (!existing) throw new AppError(404, "That loading pattern was not found on your site.", "loadingPattern");
    if (existing.sterilizerId !== sterilizer.id)
      throw new AppError(409, `The loading pattern ${existing.name} belongs to another sterilizer; plan a pattern for ${sterilizer.name}.`, "loadingPattern");
    patternId = existing.id;
    patternName = existing.name;
  }
  const { today } = await getSiteContext({ actor });
  const id = crypto.randomUUID();
  const study = {
    id,
    siteId,
    title: data.title || studyTitle(data.kind, patternName),
    sterilizerId: sterilizer.id,
    profileId: profile.id,
    loadingPatternId: patternId,
    kind: data.kind,
    runsRequired: data.runsRequired ?? DEFAULT_RUNS_REQUIRED,
    minF0Min: data.minF0Min ?? null,
    maxSpreadK: data.maxSpreadK ?? null,
    indicatorsRequired: data.indicatorsRequired ?? true,
    protocol: data.protocol ?? "",
    requalificationMonths: data.requalificationMonths ?? DEFAULT_REQUALIFICATION_MONTHS,
    createdBy: actor.id,
  };
  const pattern = newPattern
    ? {
        id: newPattern.id,
        siteId,
        sterilizerId: sterilizer.id,
        name: newPattern.name,
        description: newPattern.description ?? "",
        loadType: newPattern.loadType ?? null,
        items: newPattern.items,
        positions: newPattern.positions,
        createdBy: actor.id,
      }
    : undefined;
  return insertStudy({
    siteId,
    year: today.slice(0, 4),
    pattern,
    study,
    audit: (studyNumber) => [
      ...(pattern ? [{ ...auditActor(actor), action: "loading-pattern.create", entityType: "loading-pattern", entityId: pattern.id, newValue: pattern }] : []),
      { ...auditActor(actor), action: "study.create", entityType: "study", entityId: id, newValue: { ...study, studyNumber } },
    ],
  });
}

const EDITABLE = ["title", "kind", "profileId", "runsRequired", "minF0Min", "maxSpreadK", "indicatorsRequired", "protocol", "requalificationMonths"] as const;

/** Changes a draft's protocol, criteria or pattern; each change is audited old → new. Frozen once the protocol is approved. */
export async function updateStudyDraft({ actor, id, changes, reason }: { actor: Actor; id: string; changes: StudyDraftChanges; reason?: string | null }) {
  assertAllowed(actor, "study:plan", "plan qualification studies");
  const siteId = siteIdOf(actor, "studies");
  const study = await studyOfSite(actor, id);
  if (study.status !== "draft") throw new AppError(409, "The protocol was approved, so the study's protocol, criteria and loading pattern are frozen; plan a new study to change them.");
  const data = studyDraftChangesSchema.parse(changes);
  if (data.profileId && data.profileId !== study.profileId) {
    const profile = await getProfileOnSite({ siteId, id: data.profileId });
    if (!profile || !profile.active) throw new AppError(404, "That profile was not found on your site, or is no longer in use.", "profileId");
  }
  const oldValue: Record<string, unknown> = {};
  const newValue: Record<string, unknown> = {};
  const values: Record<string, unknown> = {};
  for (const key of EDITABLE) {
    if (data[key] === undefined || data[key] === study[key]) continue;
    oldValue[key] = study[key];
    newValue[key] = data[key];
    values[key] = data[key];
  }
  let pattern: { id: string; values: Record<string, unknown> } | undefined;
  if (data.loadingPattern) {
    const current = await getLoadingPatternOnSite({ siteId, id: study.loadingPatternId });
    if (!current) throw new AppError(404, "The study's loading pattern was not found.");
    if ((await countOtherStudiesOfPattern({ patternId: current.id, studyId: id })) > 0) {
      throw new AppError(409, `The loading pattern ${current.name} is used by another study, so it cannot change here; plan the study with a new pattern.`, "loadingPattern");
    }
    const next = {
      name: data.loadingPattern.name,
      description: data.loadingPattern.description ?? "",
      loadType: data.loadingPattern.loadType ?? null,
      items: data.loadingPattern.items,
      positions: data.loadingPattern.positions,
    };
    oldValue.loadingPattern = { name: current.name, description: current.description, loadType: current.loadType, items: current.items, positions: current.positions };
    newValue.loadingPattern = next;
    pattern = { id: current.id, values: next };
  }
  if (Object.keys(newValue).length === 0) return { id, changed: false };
  const moved = await updateStudyDraftRow({
    siteId,
    id,
    values,
    pattern,
    at: new Date().toISOString(),
    audit: { ...auditActor(actor), action: "study.edit", entityType: "study", entityId: id, oldValue, newValue, reason: reason?.trim() || null },
  });
  if (!moved) throw new AppError(409, "The study changed while you were editing it (its protocol was approved); reload it.");
  return { id, changed: true };
}
