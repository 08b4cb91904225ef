import "server-only";
import { AppError } from "@/lib/errors";
import type { StudyDetail } from "@/lib/studies/contracts";

/**
 * The study report's bytes for the archive at QA approval. S4's renderer (lib/services/study-report.ts,
 * renderStudyReportPdf) is called here; until it is merged, approval is refused rather than archiving anything else.
 */
export async function renderStudyReportForArchive(detail: StudyDetail, options: { reportNumber: string; generatedAt: string; timeZone: string }): Promise<Uint8Array> {
  void detail;
  void options;
  throw new AppError(503, "The study report cannot be produced on this server yet, so the study was not approved; nothing was changed.");
}
