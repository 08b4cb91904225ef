import "server-only";
import { and, desc, eq } from "drizzle-orm";
import { getDb } from "@/db";
import { studies, studyReports, studySignatures, sterilizers } from "@/db/schema";
import type { Actor } from "./users";

/** The archived report of a study of the actor's site, if any (one per study). */
export async function getStudyReportOfStudy({ actor, studyId }: { actor: Actor; studyId: string }) {
  const [row] = await getDb()
    .select({ id: studyReports.id, studyId: studyReports.studyId, reportNumber: studyReports.reportNumber, sha256: studyReports.sha256, bytes: studyReports.bytes, createdAt: studyReports.createdAt })
    .from(studyReports)
    .innerJoin(studies, eq(studyReports.studyId, studies.id))
    .where(and(eq(studyReports.studyId, studyId), eq(studies.siteId, actor.siteId ?? "")))
    .orderBy(desc(studyReports.createdAt))
    .limit(1);
  return row;
}

/** A study report of the actor's site with this SHA-256 (the report checker's candidate; the bytes confirm it). */
export async function findStudyReportBySha256({ actor, sha256 }: { actor: Actor; sha256: string }) {
  const [row] = await getDb()
    .select({
      id: studyReports.id,
      studyId: studyReports.studyId,
      reportNumber: studyReports.reportNumber,
      stored: studyReports.bytes,
      createdAt: studyReports.createdAt,
      studyNumber: studies.studyNumber,
    })
    .from(studyReports)
    .innerJoin(studies, eq(studyReports.studyId, studies.id))
    .where(and(eq(studyReports.sha256, sha256), eq(studies.siteId, actor.siteId ?? "")))
    .limit(1);
  return row;
}

/** The site's archived study reports, newest first, for the archive page (a study has one report, so the list stays short). */
export async function listStudyReports({ actor, limit = 100 }: { actor: Actor; limit?: number }) {
  return getDb()
    .select({
      id: studyReports.id,
      reportNumber: studyReports.reportNumber,
      sha256: studyReports.sha256,
      sizeBytes: studyReports.sizeBytes,
      createdAt: studyReports.createdAt,
      studyId: studies.id,
      studyNumber: studies.studyNumber,
      title: studies.title,
      status: studies.status,
      sterilizerName: sterilizers.name,
      signerName: studySignatures.printedName,
    })
    .from(studyReports)
    .innerJoin(studies, eq(studyReports.studyId, studies.id))
    .innerJoin(sterilizers, eq(studies.sterilizerId, sterilizers.id))
    .leftJoin(studySignatures, eq(studyReports.signatureId, studySignatures.id))
    .where(eq(studies.siteId, actor.siteId ?? ""))
    .orderBy(desc(studyReports.createdAt))
    .limit(limit);
}
