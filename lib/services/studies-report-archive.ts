import "server-only";
import type { StudyDetail } from "@/lib/studies/contracts";
import { renderStudyReportPdf } from "./study-report";

/** The study report's bytes for the archive at QA approval (S4's renderer), rendered before the signature's transaction. */
export async function renderStudyReportForArchive(detail: StudyDetail, options: { reportNumber: string; generatedAt: string; site: { name: string; timeZone: string } }): Promise<Uint8Array> {
  return renderStudyReportPdf(detail, { reportNumber: options.reportNumber, generatedAt: options.generatedAt, draft: false, site: options.site });
}
