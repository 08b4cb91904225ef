export { renderCycleReport } from "./render";
export { downsampleForReport } from "./downsample";
export { REPORT_CHART_POINTS, REPORT_LAYOUT_VERSION, REPORT_PHASE_POINTS, type ReportModel } from "./model";
export { pdfText } from "./text";
