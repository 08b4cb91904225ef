import { renderToBuffer } from "@react-pdf/renderer";
import { CycleReportDocument } from "./document";
import { registerReportFonts } from "./fonts";
import type { ReportModel } from "./model";

/**
 * Renders a cycle's PDF report. A pure function of the model: the PDF's dates come from
 * generatedAt and its file identifier is derived from them, so the same model gives the same
 * bytes, which is what lets an archived report be checked by its hash.
 */
export async function renderCycleReport(model: ReportModel): Promise<Buffer> {
  if (Number.isNaN(new Date(model.generatedAt).getTime())) {
    throw new RangeError(`The report's generatedAt "${model.generatedAt}" is not a date and time`);
  }
  registerReportFonts();
  return renderToBuffer(<CycleReportDocument model={model} />);
}
