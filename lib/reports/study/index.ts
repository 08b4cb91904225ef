export { renderStudyReport } from "./render";
export { studyConclusion } from "./conclusion";
export { STUDY_REPORT_VERIFY_HINT, type StudyReportDetail, type StudyReportOptions } from "./model";
