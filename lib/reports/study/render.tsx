import { renderToBuffer } from "@react-pdf/renderer";
import { registerReportFonts } from "../fonts";
import { StudyReportDocument } from "./document";
import type { StudyReportDetail, StudyReportOptions } from "./model";

/**
 * Renders a study's PDF report. A pure function of the study and the options: the PDF's dates come from generatedAt,
 * so the same input gives the same bytes, which is what lets the archived copy be checked by its hash.
 */
export async function renderStudyReport(detail: StudyReportDetail, options: StudyReportOptions): Promise<Buffer> {
  if (Number.isNaN(new Date(options.generatedAt).getTime())) throw new RangeError(`The report's generatedAt "${options.generatedAt}" is not a date and time`);
  registerReportFonts();
  return renderToBuffer(<StudyReportDocument detail={detail} options={options} />);
}
