/**
 * The values an audit event recorded, as a reader takes them: each field with its label and unit,
 * ids replaced by the names of the records they stand for, nested values spelt out. Never raw
 * JSON and never "[object Object]".
 */
import { CYCLE_STATUS_LABELS, SIGNATURE_MEANING_LABELS } from "./cycles";
import { PROFILE_BASIS_LABELS } from "./profile-basis";
import { ROLE_LABELS } from "./roles";
import { STERILIZER_STATUS_LABELS } from "./sterilizer-status";
import { INDICATOR_SHEET_RESULT_LABELS, testKindLabel } from "./test-kinds";
import { DEVIATION_SOURCE_LABELS, INDICATOR_KIND_LABELS, INDICATOR_RESULT_LABELS, STUDY_KIND_LABELS, STUDY_STATUS_LABELS } from "./studies";

type Field = { label: string; short?: string; unit?: string; words?: Record<string, string>; hidden?: boolean };

// A study's "draft" or "approved" reads as a cycle's; its own statuses (running, ready-for-review …) get its words.
const STATUS_WORDS: Record<string, string> = { ...STUDY_STATUS_LABELS, ...CYCLE_STATUS_LABELS, ...STERILIZER_STATUS_LABELS };
const KIND_WORDS: Record<string, string> = { ...STUDY_KIND_LABELS, ...INDICATOR_KIND_LABELS };

/** Known fields; any other key is spelt out from its name ("chamberVolumeL" → "chamber volume l"). */
export const AUDIT_FIELDS: Record<string, Field> = {
  name: { label: "Name" },
  status: { label: "Status", words: STATUS_WORDS },
  verdict: { label: "Verdict" },
  role: { label: "Role", words: ROLE_LABELS },
  disabled: { label: "Disabled" },
  active: { label: "Active" },
  sessions: { label: "Sessions" },
  password: { label: "Password" },
  oneTimePassword: { label: "One-time password in use" },
  signInLockedUntil: { label: "Sign-in locked until" },
  signingLockedUntil: { label: "Signing locked until" },
  lockedUntil: { label: "Locked until" },
  address: { label: "Address" },
  kind: { label: "Test" },
  intervalDays: { label: "Interval", short: "every", unit: "days" },
  requiredBeforeUse: { label: "Required before use" },
  defaultProfileId: { label: "Default profile" },
  profileId: { label: "Profile" },
  profile: { label: "Profile" },
  instrumentId: { label: "Instrument" },
  sterilizerId: { label: "Sterilizer" },
  sterilizer: { label: "Sterilizer" },
  sterilizers: { label: "Sterilizers" },
  sterilizersMoved: { label: "Sterilizers moved to the new version" },
  serialNumber: { label: "Serial number" },
  model: { label: "Model" },
  location: { label: "Location" },
  chamberVolumeL: { label: "Chamber volume", unit: "l" },
  airDetectorFitted: { label: "Air detector fitted" },
  vacuumAirRemoval: { label: "Vacuum air removal" },
  schedule: { label: "Test schedule" },
  cycleNumber: { label: "Cycle number" },
  loadDescription: { label: "Load" },
  files: { label: "Files" },
  file: { label: "File" },
  mapping: { label: "Column mapping" },
  savedMapping: { label: "Saved mapping" },
  inputHash: { label: "Input hash (SHA-256)" },
  performedAt: { label: "Performed" },
  result: { label: "Result", words: { ...INDICATOR_RESULT_LABELS, ...INDICATOR_SHEET_RESULT_LABELS } },
  measurements: { label: "Measurements" },
  notes: { label: "Notes" },
  sheet: { label: "Indicator sheet" },
  indicatorLot: { label: "Indicator lot" },
  photo: { label: "Photo" },
  report: { label: "Report" },
  reportNumber: { label: "Report" },
  reportSha256: { label: "Report SHA-256" },
  storedSha256: { label: "Stored SHA-256" },
  bytesSha256: { label: "SHA-256 of the bytes" },
  bundleHash: { label: "Signed record hash" },
  recordHash: { label: "Signed record hash" },
  acknowledgedReplacement: { label: "Acknowledged replacement" },
  meaning: { label: "Meaning", words: SIGNATURE_MEANING_LABELS },
  sha256: { label: "SHA-256" },
  size: { label: "Size", unit: "bytes" },
  match: { label: "Matched the archive" },
  problem: { label: "Problem" },
  reason: { label: "Reason" },
  since: { label: "Since" },
  cause: {
    label: "Cause",
    words: {
      "periodic-test.sign.approved": "a periodic test approved",
      "periodic-test.sign.failure-confirmed": "a periodic test's failure confirmed",
      "periodic-test.sign.returned": "a periodic test returned",
    },
  },
  decision: { label: "Decision", words: STATUS_WORDS },
  acknowledged: { label: "Acknowledged" },
  rows: { label: "Rows" },
  events: { label: "Events" },
  format: { label: "Format" },
  filter: { label: "Filter" },
  route: { label: "Route" },
  prefix: { label: "Token prefix" },
  scope: { label: "Scope" },
  expiresAt: { label: "Expires" },
  revoked: { label: "Revoked" },
  revokedAt: { label: "Revoked at" },
  certificateNumber: { label: "Certificate" },
  issuedBy: { label: "Issued by" },
  calibratedOn: { label: "Calibrated on" },
  dueOn: { label: "Due on" },
  attempts: { label: "Attempts" },
  nextAttemptAt: { label: "Next attempt" },
  timeZone: { label: "Time zone" },
  atmosphereKpa: { label: "Atmosphere", unit: "kPa" },
  altitudeM: { label: "Altitude", unit: "m" },
  sameFileAs: { label: "Same file as" },
  duplicateReason: { label: "Why the same file again" },
  supersedes: { label: "Replaces version" },
  replacedBy: { label: "Replaced by version" },
  ledgerHead: { label: "Ledger head" },
  lastSeq: { label: "Last event" },
  lastHash: { label: "Last hash" },
  fileName: { label: "File name" },
  auditExtract: { label: "Extract recorded in event" },
  sterilizationTempC: { label: "Sterilization temperature", short: "temperature", unit: "°C" },
  bandK: { label: "Band width", short: "band", unit: "K" },
  holdingTimeS: { label: "Holding time", short: "hold", unit: "s" },
  maxEquilibrationS: { label: "Equilibration time limit", short: "equilibration limit", unit: "s" },
  maxSpreadK: { label: "Spread limit", unit: "K" },
  saturationLimitK: { label: "Saturation limit", unit: "K" },
  f0ReferenceC: { label: "F0 reference temperature", short: "F0 reference", unit: "°C" },
  f0ZK: { label: "F0 z-value", short: "z", unit: "K" },
  maxSampleIntervalS: { label: "Longest sample interval", unit: "s" },
  freeSpaceEarlyK: { label: "Free space, first period", unit: "K" },
  freeSpaceEarlyS: { label: "Free space, first period length", unit: "s" },
  freeSpaceK: { label: "Free space after", unit: "K" },
  leakRateLimitKpaPerMin: { label: "Leak rate limit", unit: "kPa/min" },
  leakVacuumSetPointKpaAbs: { label: "Leak test vacuum set point", unit: "kPa abs" },
  basis: { label: "Basis", words: PROFILE_BASIS_LABELS },
  basisReason: { label: "Reason for the basis" },
  // qualification studies (issue 14)
  studyNumber: { label: "Study" },
  title: { label: "Title" },
  loadingPattern: { label: "Loading pattern" },
  loadingPatternId: { label: "Loading pattern" },
  description: { label: "Description" },
  loadType: { label: "Load type" },
  items: { label: "Items" },
  positions: { label: "Positions" },
  runsRequired: { label: "Consecutive runs required" },
  minF0Min: { label: "Minimum F0 at every position", short: "minimum F0", unit: "min" },
  indicatorsRequired: { label: "Indicators required" },
  protocol: { label: "Protocol" },
  requalificationMonths: { label: "Requalification interval", unit: "months" },
  requalificationDueOn: { label: "Requalification due on" },
  runNumber: { label: "Run" },
  sensorMap: { label: "Sensor map (channel → position)" },
  judgement: { label: "Judgement" },
  reasons: { label: "Why" },
  contentHash: { label: "Signed content hash" },
  source: { label: "Source", words: DEVIATION_SOURCE_LABELS },
  what: { label: "What happened" },
  impact: { label: "Impact assessment" },
  rootCause: { label: "Root cause" },
  capaReference: { label: "CAPA reference" },
  positionId: { label: "Position" },
  organism: { label: "Organism" },
  lot: { label: "Lot" },
  population: { label: "Population per carrier" },
  incubation: { label: "Incubation" },
  readBy: { label: "Read by" },
  readAt: { label: "Read at" },
  recordedAt: { label: "Recorded at" },
  // internal ids the reader does not need: the record itself is linked
  id: { label: "Id", hidden: true },
  analysis: { label: "Analysis", hidden: true },
  signature: { label: "Signature", hidden: true },
  certificateId: { label: "Certificate id", hidden: true },
  cycleId: { label: "Cycle", hidden: true },
  attachment: { label: "Attachment", hidden: true },
  run: { label: "Run", hidden: true },
  studyRunId: { label: "Run", hidden: true },
  deviation: { label: "Deviation", hidden: true },
  study: { label: "Study", hidden: true },
  siteId: { label: "Site", hidden: true },
  createdBy: { label: "Created by", hidden: true },
  recordedBy: { label: "Recorded by", hidden: true },
  openedBy: { label: "Opened by", hidden: true },
  analysisId: { label: "Analysis", hidden: true },
};

const UUID = /^[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}$/i;
export const isRecordId = (value: unknown): value is string => typeof value === "string" && UUID.test(value);

/** "chamberVolumeL" → "Chamber volume l": the fallback label of a field this version does not know. */
function spelt(key: string): string {
  const words = key
    .replace(/([a-z0-9])([A-Z])/g, "$1 $2")
    .replace(/[-_.]+/g, " ")
    .toLowerCase()
    .trim();
  return words.charAt(0).toUpperCase() + words.slice(1);
}

export const fieldLabel = (key: string): string => AUDIT_FIELDS[key]?.label ?? spelt(key);
export const isHiddenField = (key: string): boolean => AUDIT_FIELDS[key]?.hidden === true;

/** What the service found for the ids on a page: record id → its name ("P2-20261112-009", "Porous load 1"). */
export type RecordNames = ReadonlyMap<string, string>;

const plainNumber = (n: number): string => (Number.isFinite(n) ? String(Number(n.toPrecision(10))) : "—");
const ISO_INSTANT = /^\d{4}-\d{2}-\d{2}T\d{2}:\d{2}(:\d{2}(\.\d+)?)?(Z|[+-]\d{2}:?\d{2})$/;

/** One value in words, without its unit; `at` formats an instant (the site's clock). */
export function valueText(key: string, value: unknown, names: RecordNames, at: (iso: string) => string, depth = 0): string {
  if (value === null || value === undefined || value === "") return "none";
  if (typeof value === "boolean") return value ? "yes" : "no";
  if (typeof value === "number") return plainNumber(value);
  if (typeof value === "string") {
    const words = AUDIT_FIELDS[key]?.words;
    if (words && Object.hasOwn(words, value)) return words[value];
    if (key === "kind") return Object.hasOwn(KIND_WORDS, value) ? KIND_WORDS[value] : testKindLabel(value);
    if (isRecordId(value)) return names.get(value) ?? "a record not on file";
    if (ISO_INSTANT.test(value)) return at(value);
    return value;
  }
  if (depth >= 2) return "…";
  if (Array.isArray(value)) return value.length === 0 ? "none" : value.map((v) => valueText(key, v, names, at, depth + 1)).join(", ");
  if (typeof value === "object") {
    const entries = Object.entries(value as Record<string, unknown>).filter(([k, v]) => !isHiddenField(k) && v !== undefined);
    if (key === "files" || key === "file") {
      const f = value as { name?: unknown; size?: unknown; sha256?: unknown };
      if (typeof f.name === "string") return `${f.name}${typeof f.size === "number" ? ` (${plainNumber(f.size)} bytes)` : ""}${typeof f.sha256 === "string" ? `, SHA-256 ${f.sha256}` : ""}`;
    }
    return entries.map(([k, v]) => `${fieldLabel(k).toLowerCase()} ${withUnit(k, valueText(k, v, names, at, depth + 1))}`).join("; ");
  }
  return String(value);
}

/** A value with its field's unit after it, when it has one and a number was printed. */
export function withUnit(key: string, text: string): string {
  const unit = AUDIT_FIELDS[key]?.unit;
  return unit && /\d$/.test(text) ? `${text} ${unit}` : text;
}

export type AuditChange = { field: string; old: string | null; new: string | null };

function parsed(json: string | null): unknown {
  if (json === null) return null;
  try {
    return JSON.parse(json);
  } catch {
    return json;
  }
}

const objectOf = (value: unknown): Record<string, unknown> | null => (value !== null && typeof value === "object" && !Array.isArray(value) ? (value as Record<string, unknown>) : null);

/**
 * The old → new list: every field either side recorded whose value differs, labelled, with units.
 * A value that is not an object (a bare text) is one line of its own.
 */
export function auditChanges(oldJson: string | null, newJson: string | null, names: RecordNames, at: (iso: string) => string): AuditChange[] {
  const before = parsed(oldJson);
  const after = parsed(newJson);
  const oldObject = objectOf(before);
  const newObject = objectOf(after);
  if ((before !== null && !oldObject) || (after !== null && !newObject)) {
    const text = (v: unknown) => (v === null ? null : valueText("value", v, names, at));
    return [{ field: "Value", old: text(before), new: text(after) }];
  }
  const keys = [...new Set([...Object.keys(oldObject ?? {}), ...Object.keys(newObject ?? {})])].filter((k) => !isHiddenField(k));
  const changes: AuditChange[] = [];
  for (const key of keys) {
    const hadOld = oldObject !== null && Object.hasOwn(oldObject, key);
    const hasNew = newObject !== null && Object.hasOwn(newObject, key);
    if (hadOld && hasNew && JSON.stringify(oldObject[key]) === JSON.stringify(newObject[key])) continue;
    changes.push({
      field: fieldLabel(key),
      old: hadOld ? withUnit(key, valueText(key, oldObject[key], names, at)) : null,
      new: hasNew ? withUnit(key, valueText(key, newObject[key], names, at)) : null,
    });
  }
  return changes;
}

/** "hold 180 → 210 s": one change in the fewest words, for the event's one-line summary. */
export function shortChange(key: string, oldValue: unknown, newValue: unknown, names: RecordNames, at: (iso: string) => string): string {
  const field = AUDIT_FIELDS[key];
  const label = field?.short ?? fieldLabel(key).toLowerCase();
  const before = valueText(key, oldValue, names, at);
  const after = valueText(key, newValue, names, at);
  const unit = field?.unit && /\d$/.test(before) && /\d$/.test(after) ? ` ${field.unit}` : "";
  return `${label} ${before} → ${after}${unit}`;
}

export { parsed as parseAuditValue, objectOf as auditObject };
