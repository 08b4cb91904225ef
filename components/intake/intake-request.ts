import type { InspectResponse, MappingOverrides } from "@/lib/cycles/contracts";
import { guessSensorPosition, type ChannelPlacements, type LoadType, type ProfileBasis, type TestKind } from "@/lib/domain";
import { createCycleFieldsSchema, mappingProblems, parseElapsedInput, pressureReferenceProblem, type CreateCycleField } from "@/lib/validations/intake";
import { timeFormatHasDate } from "@/lib/cycles/start-time";
import type { MappedColumn } from "./mapping-table";

export type IntakeSterilizer = {
  id: string;
  name: string;
  serialNumber: string;
  chamberVolumeL: number;
  defaultProfileId: string | null;
  /** whether it may be used now; an out-of-use sterilizer still takes test cycles (that is how it is re-qualified) */
  status?: "in-use" | "out-of-use";
  statusReason?: string;
  statusSince?: string;
};
export type IntakeProfile = { id: string; name: string; sterilizationTempC: number; holdingTimeS: number; bandK: number; basis: ProfileBasis };
export type IntakeInstrument = { id: string; name: string; serialNumber: string; kind: string; hasSavedMapping: boolean };

/** The cycle details as the form holds them; startedAt is a datetime-local value, read in the site's time zone. */
/** leakT1: an air leakage test's t1 as typed (m:ss or seconds since the first sample); empty lets Papin find it in the trace. */
export type IntakeFields = {
  sterilizerId: string;
  profileId: string;
  instrumentId: string;
  cycleNumber: string;
  load: string;
  /** "" while none is chosen */
  loadType: LoadType | "";
  loadLot: string;
  testKind: TestKind;
  startedAt: string;
  leakT1?: string;
  /** asked for only once the server says another cycle of the site already holds the file */
  duplicateReason: string;
};
export type FieldErrors = Partial<Record<CreateCycleField | "leakMarks", string>>;

export const FIELD_NAMES: readonly string[] = ["sterilizerId", "profileId", "instrumentId", "cycleNumber", "load", "loadType", "loadLot", "testKind", "startedAt", "leakMarks", "duplicateReason"];

/** The air leakage test's marked t1 in seconds: null when none is given or the test kind is another, NaN when it cannot be read. */
export function markedT1(fields: IntakeFields): number | null {
  return fields.testKind === "air-leakage" ? parseElapsedInput(fields.leakT1 ?? "") : null;
}

/** Whether the inspected file leaves the start time to the user: elapsed times or clock times without a date. */
export function needsStartTime(inspect: InspectResponse | null): boolean {
  return inspect !== null && !timeFormatHasDate(inspect.dialect.timeFormat);
}

/** Where a pressure column's absolute or gauge came from: its header marker, the instrument's saved mapping, or the user here; null while nobody has said. */
export function gaugeSourceOf(inspect: InspectResponse): MappedColumn["gaugeFrom"] {
  const source = inspect.pressureReference?.source;
  if (source === "header") return "header";
  if (source === "user" || source === "option") return "saved";
  return null;
}

export function columnsFrom(inspect: InspectResponse): MappedColumn[] {
  const gaugeFrom = gaugeSourceOf(inspect);
  return inspect.columns.map((c) => {
    const pressure = c.role === "pressure";
    // An assumed reference is left open: the user must choose, nothing is pre-selected.
    const gauge = pressure ? (gaugeFrom ? c.gauge : null) : false;
    return { index: c.index, header: c.header, role: c.role, unit: c.unit, gauge, gaugeFrom: pressure ? gaugeFrom : null, unsure: c.unsure, edited: false };
  });
}

/**
 * The confirmed mapping as the server takes it: every column named, nothing left to guess. Absolute
 * or gauge is sent only when someone confirmed it (the user, or the saved mapping they kept); a
 * header marker speaks for itself. The free-space sensor is always named ("" for none), so the
 * analysis uses exactly what the table shows.
 */
export function toMappingOverrides(columns: readonly MappedColumn[], referenceColumn: string | null, freeSpaceColumn: string | null = null, placements: ChannelPlacements = {}): MappingOverrides {
  const time = columns.find((c) => c.role === "time");
  const pressure = columns.find((c) => c.role === "pressure");
  const confirmed = (c: MappedColumn) => (c.gaugeFrom === "user" || c.gaugeFrom === "saved") && c.gauge !== null;
  const overrides: MappingOverrides = { columns: {} };
  for (const c of columns) {
    if (c.header === "" && c.role === "ignored") continue;
    if (c.role === "temperature") overrides.columns![c.header] = { role: "temperature", unit: c.unit ?? "C" };
    else if (c.role === "pressure") overrides.columns![c.header] = confirmed(c) ? { role: "pressure", unit: c.unit ?? "kPa", gauge: c.gauge! } : { role: "pressure", unit: c.unit ?? "kPa" };
    else if (c.role === "time") overrides.columns![c.header] = c.unit ? { role: "time", unit: c.unit } : { role: "time" };
    else overrides.columns![c.header] = { role: "ignored" };
  }
  if (time) overrides.timeColumn = time.header;
  if (pressure) {
    overrides.pressureColumn = pressure.header;
    if (pressure.unit) overrides.pressureUnit = pressure.unit as MappingOverrides["pressureUnit"];
    if (confirmed(pressure)) overrides.pressureGauge = pressure.gauge!;
  }
  if (referenceColumn) overrides.referenceColumn = referenceColumn;
  overrides.freeSpaceColumn = freeSpaceColumn && columns.some((c) => c.role === "temperature" && c.header === freeSpaceColumn) ? freeSpaceColumn : "";
  const placed = columns.filter((c) => c.role === "temperature" && Object.hasOwn(placements, c.header));
  if (placed.length > 0) overrides.positions = Object.fromEntries(placed.map((c) => [c.header, placements[c.header]]));
  return overrides;
}

/**
 * The positions the form starts from: the saved mapping's for the channels it names, else the drain (reference) and
 * free-space sensors by their role, else a guess from the header; the user confirms or changes each.
 */
export function initialPlacements(inspect: InspectResponse, columns: readonly MappedColumn[], referenceColumn: string | null): ChannelPlacements {
  const saved = inspect.savedMapping?.positions ?? {};
  const placements: ChannelPlacements = {};
  for (const c of columns) {
    if (c.role !== "temperature") continue;
    const guess = c.header === referenceColumn ? "reference-drain" : c.header === inspect.freeSpaceColumn ? "free-space" : guessSensorPosition(c.header);
    if (Object.hasOwn(saved, c.header)) placements[c.header] = saved[c.header];
    else if (guess) placements[c.header] = { position: guess };
  }
  return placements;
}

export type IntakeDraft = {
  files: readonly File[];
  inspect: InspectResponse | null;
  columns: readonly MappedColumn[];
  referenceColumn: string | null;
  freeSpaceColumn: string | null;
  fields: IntakeFields;
  saveMapping: boolean;
  placements: ChannelPlacements;
};

export type DraftProblems = { fieldErrors: FieldErrors; mappingErrors: string[]; pressureReferenceError: string | null; fileError: string | null };

/** What stops the draft from being analysed, field by field; all empty when it may be sent. */
export function draftProblems(draft: IntakeDraft): DraftProblems {
  const askStart = needsStartTime(draft.inspect);
  const parsed = createCycleFieldsSchema.safeParse({ ...draft.fields, startedAt: askStart ? draft.fields.startedAt : undefined });
  const fieldErrors: FieldErrors = {};
  if (!parsed.success) {
    for (const issue of parsed.error.issues) {
      const name = String(issue.path[0]) as CreateCycleField;
      fieldErrors[name] ??= issue.message;
    }
  }
  if (askStart && !draft.fields.startedAt.trim()) fieldErrors.startedAt ??= "This file holds elapsed times without a date: give the date and time the cycle started.";
  const t1 = markedT1(draft.fields);
  if (t1 !== null && Number.isNaN(t1)) fieldErrors.leakMarks = "Write t1 as minutes:seconds (or seconds) after the first sample, e.g. 4:30, or leave it empty.";
  const mappingErrors = draft.inspect ? mappingProblems(draft.columns, draft.referenceColumn, { pressureOnly: draft.fields.testKind === "air-leakage" }) : [];
  const pressureReferenceError = draft.inspect ? pressureReferenceProblem(draft.columns) : null;
  let fileError: string | null = null;
  if (!draft.files[0] || !draft.inspect) fileError = draft.files[0] ? "The file could not be read; choose another one." : "Add the logger file first.";
  return { fieldErrors, mappingErrors, pressureReferenceError, fileError };
}

export function hasProblems(problems: DraftProblems): boolean {
  return Object.keys(problems.fieldErrors).length > 0 || problems.mappingErrors.length > 0 || problems.pressureReferenceError !== null || problems.fileError !== null;
}

/** The multipart body of POST /api/cycles. */
export function cycleForm(draft: IntakeDraft): FormData {
  const { fields } = draft;
  const form = new FormData();
  for (const file of draft.files) form.append("files", file);
  form.append("sterilizerId", fields.sterilizerId);
  form.append("profileId", fields.profileId);
  if (fields.instrumentId) form.append("instrumentId", fields.instrumentId);
  if (fields.cycleNumber.trim()) form.append("cycleNumber", fields.cycleNumber.trim());
  if (fields.load.trim()) form.append("load", fields.load.trim());
  if (fields.loadType) form.append("loadType", fields.loadType);
  if (fields.loadLot.trim()) form.append("loadLot", fields.loadLot.trim());
  form.append("testKind", fields.testKind);
  if (needsStartTime(draft.inspect) && fields.startedAt.trim()) form.append("startedAt", fields.startedAt.trim());
  if (fields.duplicateReason.trim()) form.append("duplicateReason", fields.duplicateReason.trim());
  form.append("mapping", JSON.stringify(toMappingOverrides(draft.columns, draft.referenceColumn, draft.freeSpaceColumn, draft.placements)));
  const t1 = markedT1(fields);
  if (t1 !== null && Number.isFinite(t1)) form.append("leakMarks", JSON.stringify({ t1S: t1 }));
  if (draft.saveMapping && fields.instrumentId) form.append("saveMapping", "true");
  return form;
}

/** The multipart body of POST /api/logger-files/inspect. */
export function inspectForm(file: File, instrumentId: string): FormData {
  const form = new FormData();
  form.append("file", file);
  if (instrumentId) form.append("instrumentId", instrumentId);
  return form;
}
