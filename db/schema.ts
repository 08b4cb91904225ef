import { relations, sql } from "drizzle-orm";
import { blob, check, index, integer, primaryKey, real, sqliteTable, text, uniqueIndex } from "drizzle-orm/sqlite-core";

const id = () =>
  text("id")
    .primaryKey()
    .$defaultFn(() => crypto.randomUUID());
const createdAt = () =>
  text("created_at")
    .notNull()
    .default(sql`(strftime('%Y-%m-%dT%H:%M:%fZ', 'now'))`);

import {
  API_TOKEN_SCOPES,
  ATTACHMENT_OWNER_KINDS,
  CYCLE_STATUSES,
  INDICATOR_SHEET_RESULTS,
  INSTRUMENT_KINDS,
  LOAD_TYPES,
  MAIL_STATUSES,
  PERIODIC_RECORD_STATUSES,
  PERIODIC_SIGNATURE_MEANINGS,
  PERIODIC_TEST_KINDS,
  PROFILE_BASES,
  ROLES,
  SIGNATURE_MEANINGS,
  STATUS_EVENT_KINDS,
  STERILIZER_STATUSES,
  TEST_KINDS,
  VERDICTS,
  STUDY_KINDS,
  STUDY_STATUSES,
  STUDY_SIGNATURE_MEANINGS,
  INDICATOR_KINDS,
  INDICATOR_RESULTS,
  DEVIATION_SOURCES,
  DEVIATION_STATUSES,
  type PatternItem,
  type PatternPosition,
} from "../lib/domain";

// The enums live in lib/domain; the database layer may keep taking them from here.
export { CYCLE_STATUSES, PERIODIC_TEST_KINDS, ROLES, SIGNATURE_MEANINGS, TEST_KINDS, type CycleStatus, type PeriodicTestKind, type Role, type SignatureMeaning, type TestKind } from "../lib/domain";

export const sites = sqliteTable("sites", {
  id: id(),
  name: text("name").notNull(),
  code: text("code").notNull().unique(),
  timeZone: text("time_zone").notNull().default("UTC"),
  // Local barometric pressure for gauge→absolute conversion; when null, derived from altitude.
  atmosphereKpa: real("atmosphere_kpa"),
  altitudeM: real("altitude_m"),
  address: text("address"),
  createdAt: createdAt(),
});
export type Site = typeof sites.$inferSelect;
export type NewSite = typeof sites.$inferInsert;

export const users = sqliteTable(
  "users",
  {
    id: id(),
    siteId: text("site_id").references(() => sites.id),
    email: text("email").notNull(),
    name: text("name").notNull(),
    role: text("role", { enum: ROLES }).notNull(),
    passwordHash: text("password_hash").notNull(),
    disabled: integer("disabled", { mode: "boolean" }).notNull().default(false),
    failedSigningAttempts: integer("failed_signing_attempts").notNull().default(0),
    signingLockedUntil: text("signing_locked_until"),
    lastSignInAt: text("last_sign_in_at"),
    // Sessions carry the version they were issued under; bumping it ends every older session.
    sessionVersion: integer("session_version").notNull().default(0),
    // A one-time password set by an administrator: the person must choose their own before anything else.
    mustChangePassword: integer("must_change_password", { mode: "boolean" }).notNull().default(false),
    createdAt: createdAt(),
    updatedAt: text("updated_at"),
  },
  (t) => [uniqueIndex("users_email_unique").on(t.email)],
);
export type User = typeof users.$inferSelect;
export type NewUser = typeof users.$inferInsert;

/**
 * Sign-in failures per bucket ("account:<e-mail>" or "address:<client address>"); a row goes away when its
 * failures are old and it is not locked, so an unknown e-mail costs one short-lived row and nothing else.
 */
export const signInThrottle = sqliteTable("sign_in_throttle", {
  key: text("key").primaryKey(),
  failures: integer("failures").notNull().default(0),
  lockedUntil: text("locked_until"),
  lastFailureAt: text("last_failure_at").notNull(),
});
export type SignInThrottleRow = typeof signInThrottle.$inferSelect;

/** Hashes of a user's earlier passwords (argon2id), so a new password cannot repeat one of the last few. */
export const passwordHistory = sqliteTable(
  "password_history",
  {
    id: id(),
    userId: text("user_id")
      .notNull()
      .references(() => users.id),
    passwordHash: text("password_hash").notNull(),
    createdAt: createdAt(),
  },
  (t) => [index("password_history_user_idx").on(t.userId, t.createdAt)],
);

export const acceptanceProfiles = sqliteTable(
  "acceptance_profiles",
  {
    id: id(),
    siteId: text("site_id")
      .notNull()
      .references(() => sites.id),
    name: text("name").notNull(),
    sterilizationTempC: real("sterilization_temp_c").notNull(),
    bandK: real("band_k").notNull().default(3),
    holdingTimeS: real("holding_time_s").notNull(),
    maxEquilibrationS: real("max_equilibration_s").notNull().default(15),
    maxSpreadK: real("max_spread_k").notNull().default(2),
    saturationLimitK: real("saturation_limit_k").notNull().default(2),
    f0ReferenceC: real("f0_reference_c").notNull().default(121.1),
    f0ZK: real("f0_z_k").notNull().default(10),
    // Longest interval between samples allowed inside the plateau; null: 3× the record's median interval.
    maxSampleIntervalS: real("max_sample_interval_s"),
    // Free-space sensor (small-load test): excess over the reference allowed early in the plateau and after (DOMAIN §2.3 e, from memory).
    freeSpaceEarlyK: real("free_space_early_k").notNull().default(5),
    freeSpaceEarlyS: real("free_space_early_s").notNull().default(60),
    freeSpaceK: real("free_space_k").notNull().default(2),
    // Logged air leakage test (DOMAIN §2.5): leak-rate limit (EN 285 / HTM 2010 0.13 kPa/min) and the vacuum set point (EN 285 below 7 kPa abs, from memory).
    leakRateLimitKpaPerMin: real("leak_rate_limit_kpa_per_min").notNull().default(0.13),
    leakVacuumSetPointKpaAbs: real("leak_vacuum_set_point_kpa_abs").notNull().default(7),
    // The standard the limits claim, or "local" with basis_reason (lib/domain/profile-basis.ts).
    basis: text("basis", { enum: PROFILE_BASES }).notNull(),
    basisReason: text("basis_reason"),
    active: integer("active", { mode: "boolean" }).notNull().default(true),
    createdAt: createdAt(),
  },
  (t) => [
    check("acceptance_profiles_basis_known", sql`${t.basis} in (${sql.raw(PROFILE_BASES.map((b) => `'${b}'`).join(", "))})`),
    // Local practice never stands without its reason.
    check("acceptance_profiles_local_reason", sql`${t.basis} <> 'local' or length(trim(coalesce(${t.basisReason}, ''))) > 0`),
  ],
);
export type AcceptanceProfile = typeof acceptanceProfiles.$inferSelect;
export type NewAcceptanceProfile = typeof acceptanceProfiles.$inferInsert;

export const sterilizers = sqliteTable(
  "sterilizers",
  {
    id: id(),
    siteId: text("site_id")
      .notNull()
      .references(() => sites.id),
    name: text("name").notNull(),
    serialNumber: text("serial_number").notNull(),
    model: text("model"),
    chamberVolumeL: real("chamber_volume_l").notNull(),
    location: text("location"),
    airDetectorFitted: integer("air_detector_fitted", { mode: "boolean" }).notNull().default(true),
    defaultProfileId: text("default_profile_id").references(() => acceptanceProfiles.id),
    active: integer("active", { mode: "boolean" }).notNull().default(true),
    // The cached result of the status rule (lib/periodic-tests/status.ts); sterilizer_status_events holds its history.
    status: text("status", { enum: STERILIZER_STATUSES }).notNull().default("in-use"),
    statusReason: text("status_reason"),
    statusSince: text("status_since"),
    createdAt: createdAt(),
  },
  // The cycles list sorted by sterilizer walks the site's sterilizers in name order (migration 0018).
  (t) => [uniqueIndex("sterilizers_site_name_idx").on(t.siteId, t.name, t.id)],
);
export type Sterilizer = typeof sterilizers.$inferSelect;

// Append-only (triggers): each change of a sterilizer's status, found by the rule or decided and signed by an engineer.
export const sterilizerStatusEvents = sqliteTable(
  "sterilizer_status_events",
  {
    id: id(),
    sterilizerId: text("sterilizer_id")
      .notNull()
      .references(() => sterilizers.id),
    status: text("status", { enum: STERILIZER_STATUSES }).notNull(),
    reason: text("reason").notNull(),
    // when the event was recorded, and when the state it records began (a test falls due at midnight, found later)
    at: text("at").notNull(),
    since: text("since").notNull(),
    kind: text("kind", { enum: STATUS_EVENT_KINDS }).notNull(),
    cause: text("cause").notNull(),
    userId: text("user_id").references(() => users.id),
    printedName: text("printed_name"),
    role: text("role", { enum: ROLES }),
    passwordReauthenticated: integer("password_reauthenticated", { mode: "boolean" }).notNull().default(false),
    // a release: the confirmed failures it acknowledged ("cycle:<id>", "periodic-test:<id>")
    acknowledged: text("acknowledged", { mode: "json" }).$type<string[]>(),
  },
  (t) => [index("sterilizer_status_events_idx").on(t.sterilizerId, t.at)],
);
export type SterilizerStatusEvent = typeof sterilizerStatusEvents.$inferSelect;
export type NewSterilizer = typeof sterilizers.$inferInsert;

export const instruments = sqliteTable("instruments", {
  id: id(),
  siteId: text("site_id")
    .notNull()
    .references(() => sites.id),
  name: text("name").notNull(),
  serialNumber: text("serial_number").notNull(),
  kind: text("kind", { enum: INSTRUMENT_KINDS }).notNull().default("logger"),
  channelCount: integer("channel_count"),
  // A mapping confirmed by a user, applied automatically to this instrument's next files.
  savedMapping: text("saved_mapping", { mode: "json" }),
  active: integer("active", { mode: "boolean" }).notNull().default(true),
  createdAt: createdAt(),
});
export type Instrument = typeof instruments.$inferSelect;
export type NewInstrument = typeof instruments.$inferInsert;

export const calibrationCertificates = sqliteTable(
  "calibration_certificates",
  {
    id: id(),
    instrumentId: text("instrument_id")
      .notNull()
      .references(() => instruments.id),
    certificateNumber: text("certificate_number").notNull(),
    issuedBy: text("issued_by").notNull(),
    calibratedOn: text("calibrated_on").notNull(),
    dueOn: text("due_on").notNull(),
    uncertaintyK: real("uncertainty_k"),
    notes: text("notes"),
    createdAt: createdAt(),
  },
  (t) => [index("calibration_due_idx").on(t.dueOn)],
);
export type CalibrationCertificate = typeof calibrationCertificates.$inferSelect;

export const cycles = sqliteTable(
  "cycles",
  {
    id: id(),
    siteId: text("site_id")
      .notNull()
      .references(() => sites.id),
    sterilizerId: text("sterilizer_id")
      .notNull()
      .references(() => sterilizers.id),
    profileId: text("profile_id")
      .notNull()
      .references(() => acceptanceProfiles.id),
    instrumentId: text("instrument_id").references(() => instruments.id),
    cycleNumber: text("cycle_number").notNull(),
    testKind: text("test_kind", { enum: TEST_KINDS }).notNull().default("thermometric-small-load"),
    loadDescription: text("load_description").notNull().default(""),
    // The test pack or load that was run, and its lot or batch (migration 0020); null: not recorded.
    loadType: text("load_type", { enum: LOAD_TYPES }),
    loadLot: text("load_lot").notNull().default(""),
    status: text("status", { enum: CYCLE_STATUSES }).notNull().default("draft"),
    verdict: text("verdict", { enum: VERDICTS }),
    startedAt: text("started_at"),
    currentAnalysisId: text("current_analysis_id"),
    // An approved record is never edited; a correction is a new cycle pointing at the old one.
    supersedesId: text("supersedes_id"),
    createdBy: text("created_by")
      .notNull()
      .references(() => users.id),
    submittedBy: text("submitted_by").references(() => users.id),
    submittedAt: text("submitted_at"),
    createdAt: createdAt(),
    updatedAt: text("updated_at"),
  },
  // One index per list order (site, sort column, id): a page is read in index order, never sorted whole (migration 0016).
  (t) => [
    index("cycles_site_started_idx").on(t.siteId, t.startedAt, t.id),
    index("cycles_site_created_idx").on(t.siteId, t.createdAt, t.id),
    index("cycles_site_number_idx").on(t.siteId, t.cycleNumber, t.id),
    index("cycles_site_submitted_idx").on(t.siteId, t.submittedAt, t.id),
    index("cycles_site_status_started_idx").on(t.siteId, t.status, t.startedAt, t.id),
    index("cycles_site_status_submitted_idx").on(t.siteId, t.status, t.submittedAt, t.id),
    index("cycles_site_verdict_started_idx").on(t.siteId, t.verdict, t.startedAt, t.id),
    index("cycles_sterilizer_started_idx").on(t.sterilizerId, t.startedAt, t.id),
    // The status board's latest confirmed outcome, each sterilizer's latest cycles, the auditor's recent approvals (migration 0019).
    index("cycles_outcome_idx")
      .on(t.sterilizerId, t.testKind, sql`(case when ${t.status} = 'failure-confirmed' then 'fail' else ${t.verdict} end)`, sql`coalesce(${t.startedAt}, ${t.createdAt})`)
      .where(sql`${t.status} = 'failure-confirmed' or (${t.status} = 'approved' and ${t.verdict} in ('pass', 'fail'))`),
    index("cycles_sterilizer_at_idx").on(t.sterilizerId, sql`coalesce(${t.startedAt}, ${t.createdAt})`, t.id),
    index("cycles_site_status_updated_idx").on(t.siteId, t.status, t.updatedAt, t.id),
  ],
);
// Free-text search of cycles (number, load, sterilizer name) lives outside Drizzle in migration 0018: the FTS5 table
// cycles_search (trigram tokenizer) and its keys cycle_search_rows, kept in step by triggers on cycles and sterilizers.
export type Cycle = typeof cycles.$inferSelect;
export type NewCycle = typeof cycles.$inferInsert;

export const loggerFiles = sqliteTable(
  "logger_files",
  {
    id: id(),
    cycleId: text("cycle_id")
      .notNull()
      .references(() => cycles.id),
    name: text("name").notNull(),
    sizeBytes: integer("size_bytes").notNull(),
    sha256: text("sha256").notNull(),
    contentType: text("content_type").notNull().default("text/csv"),
    bytes: blob("bytes", { mode: "buffer" }).notNull(),
    dialect: text("dialect", { mode: "json" }),
    mapping: text("mapping", { mode: "json" }),
    // Why a file whose SHA-256 another cycle of the site already holds was accepted (one file holding several cycles).
    duplicateReason: text("duplicate_reason"),
    uploadedBy: text("uploaded_by")
      .notNull()
      .references(() => users.id),
    uploadedAt: createdAt(),
  },
  (t) => [index("logger_files_cycle_idx").on(t.cycleId), index("logger_files_sha_idx").on(t.sha256)],
);
export type LoggerFile = typeof loggerFiles.$inferSelect;
export type NewLoggerFile = typeof loggerFiles.$inferInsert;

export const analyses = sqliteTable(
  "analyses",
  {
    id: id(),
    cycleId: text("cycle_id")
      .notNull()
      .references(() => cycles.id),
    loggerFileId: text("logger_file_id")
      .notNull()
      .references(() => loggerFiles.id),
    engineVersion: text("engine_version").notNull(),
    // SHA-256 over file bytes + mapping + limits: the same input always gives the same analysis.
    inputHash: text("input_hash").notNull(),
    limits: text("limits", { mode: "json" }).notNull(),
    result: text("result", { mode: "json" }).notNull(),
    verdict: text("verdict", { enum: VERDICTS }).notNull(),
    // Why this analysis was made (a new file, a new mapping, changed details); null for a cycle's first analysis.
    reason: text("reason"),
    // The mapping this analysis read, sensor positions included (migration 0020); null before it: the file's mapping.
    mapping: text("mapping", { mode: "json" }),
    createdBy: text("created_by").references(() => users.id),
    createdAt: createdAt(),
  },
  (t) => [index("analyses_cycle_idx").on(t.cycleId)],
);
export type Analysis = typeof analyses.$inferSelect;
export type NewAnalysis = typeof analyses.$inferInsert;

/**
 * The recording an analysis read, kept in columns so the chart and the report never fetch and parse
 * the logger file again: little-endian Float64 samples (times, then each temperature channel, then
 * chamber pressure, sample_count each), so the series answer is exactly the one a re-parse gives.
 */
export const analysisSeries = sqliteTable("analysis_series", {
  analysisId: text("analysis_id")
    .primaryKey()
    .references(() => analyses.id),
  // startedAt, temperature headers, pressure header, reference and free-space index, the reader's source notes
  meta: text("meta", { mode: "json" }).notNull(),
  sampleCount: integer("sample_count").notNull(),
  timesS: blob("times_s", { mode: "buffer" }).notNull(),
  channelValues: blob("channel_values", { mode: "buffer" }).notNull(),
  // The chart's whole-record view (lib/cycles/series.ts seriesOverviewOf), built once at analysis so a first chart
  // request reads a few hundred kilobytes instead of decoding every sample; null for analyses stored before it.
  overview: text("overview", { mode: "json" }),
  createdAt: createdAt(),
});

export const signatures = sqliteTable(
  "signatures",
  {
    id: id(),
    cycleId: text("cycle_id")
      .notNull()
      .references(() => cycles.id),
    analysisId: text("analysis_id")
      .notNull()
      .references(() => analyses.id),
    userId: text("user_id")
      .notNull()
      .references(() => users.id),
    printedName: text("printed_name").notNull(),
    role: text("role", { enum: ROLES }).notNull(),
    meaning: text("meaning", { enum: SIGNATURE_MEANINGS }).notNull(),
    reason: text("reason"),
    signedAt: text("signed_at").notNull(),
    bundleHash: text("bundle_hash").notNull(),
  },
  (t) => [index("signatures_cycle_idx").on(t.cycleId)],
);
export type Signature = typeof signatures.$inferSelect;
export type NewSignature = typeof signatures.$inferInsert;

export const reports = sqliteTable(
  "reports",
  {
    id: id(),
    cycleId: text("cycle_id")
      .notNull()
      .references(() => cycles.id),
    signatureId: text("signature_id").references(() => signatures.id),
    reportNumber: text("report_number").notNull().unique(),
    sha256: text("sha256").notNull(),
    sizeBytes: integer("size_bytes").notNull(),
    bytes: blob("bytes", { mode: "buffer" }).notNull(),
    createdAt: createdAt(),
  },
  (t) => [index("reports_created_idx").on(t.createdAt), index("reports_cycle_idx").on(t.cycleId)],
);
export type Report = typeof reports.$inferSelect;

// The latest draft PDF of a cycle not yet signed: a cache, not a record (the record is the cycle and its analyses).
// Rendered when the cycle is analysed or first asked for, served again while the hash of what it prints
// (`input_sha256`) is unchanged, and only when its bytes still match `sha256`; anything else is rendered afresh.
export const reportDrafts = sqliteTable("report_drafts", {
  cycleId: text("cycle_id")
    .primaryKey()
    .references(() => cycles.id),
  inputSha256: text("input_sha256").notNull(),
  sha256: text("sha256").notNull(),
  bytes: blob("bytes", { mode: "buffer" }).notNull(),
  renderedAt: text("rendered_at").notNull(),
});

// Append-only: triggers in the migrations refuse UPDATE and DELETE; each row carries the hash of
// the previous one so that a row changed behind the triggers' back breaks the chain.
export const auditEvents = sqliteTable(
  "audit_events",
  {
    seq: integer("seq").primaryKey({ autoIncrement: true }),
    at: text("at").notNull(),
    actorId: text("actor_id"),
    actorEmail: text("actor_email"),
    siteId: text("site_id"),
    action: text("action").notNull(),
    entityType: text("entity_type").notNull(),
    entityId: text("entity_id"),
    oldValue: text("old_value"),
    newValue: text("new_value"),
    reason: text("reason"),
    prevHash: text("prev_hash").notNull(),
    hash: text("hash").notNull(),
  },
  (t) => [
    index("audit_entity_idx").on(t.entityType, t.entityId),
    index("audit_action_idx").on(t.action),
    index("audit_site_seq_idx").on(t.siteId, t.seq),
    index("audit_site_action_idx").on(t.siteId, t.action, t.seq),
    index("audit_site_entity_idx").on(t.siteId, t.entityType, t.entityId, t.seq),
  ],
);
export type AuditEvent = typeof auditEvents.$inferSelect;

export const mailOutbox = sqliteTable(
  "mail_outbox",
  {
    id: id(),
    to: text("to", { mode: "json" }).$type<string[]>().notNull(),
    subject: text("subject").notNull(),
    html: text("html").notNull(),
    text: text("text").notNull(),
    status: text("status", { enum: MAIL_STATUSES }).notNull().default("pending"),
    attempts: integer("attempts").notNull().default(0),
    lastError: text("last_error"),
    nextAttemptAt: text("next_attempt_at"),
    providerId: text("provider_id"),
    relatedCycleId: text("related_cycle_id"),
    // The site whose administrators see the mail; a mail without one is seen by none (fail closed).
    siteId: text("site_id").references(() => sites.id),
    createdAt: createdAt(),
    sentAt: text("sent_at"),
  },
  (t) => [index("mail_outbox_status_idx").on(t.status, t.nextAttemptAt), index("mail_outbox_site_idx").on(t.siteId, t.createdAt)],
);
export type OutboxMail = typeof mailOutbox.$inferSelect;

export const periodicTests = sqliteTable(
  "periodic_tests",
  {
    id: id(),
    siteId: text("site_id")
      .notNull()
      .references(() => sites.id),
    sterilizerId: text("sterilizer_id")
      .notNull()
      .references(() => sterilizers.id),
    kind: text("kind", { enum: PERIODIC_TEST_KINDS }).notNull(),
    performedAt: text("performed_at").notNull(),
    performedBy: text("performed_by")
      .notNull()
      .references(() => users.id),
    measurements: text("measurements", { mode: "json" }),
    result: text("result", { enum: VERDICTS }).notNull(),
    status: text("status", { enum: PERIODIC_RECORD_STATUSES }).notNull().default("approved"),
    notes: text("notes"),
    cycleId: text("cycle_id").references(() => cycles.id),
    createdAt: createdAt(),
  },
  (t) => [index("periodic_tests_sterilizer_idx").on(t.sterilizerId, t.kind, t.performedAt)],
);
export type PeriodicTest = typeof periodicTests.$inferSelect;

// Evidence files that are not logger files (a photo of an indicator sheet), kept with their SHA-256. Append-only (triggers).
export const attachments = sqliteTable(
  "attachments",
  {
    id: id(),
    siteId: text("site_id")
      .notNull()
      .references(() => sites.id),
    ownerKind: text("owner_kind", { enum: ATTACHMENT_OWNER_KINDS }).notNull(),
    ownerId: text("owner_id").notNull(),
    name: text("name").notNull(),
    contentType: text("content_type").notNull(),
    sizeBytes: integer("size_bytes").notNull(),
    sha256: text("sha256").notNull(),
    bytes: blob("bytes", { mode: "buffer" }).notNull(),
    uploadedBy: text("uploaded_by")
      .notNull()
      .references(() => users.id),
    uploadedAt: text("uploaded_at")
      .notNull()
      .default(sql`(strftime('%Y-%m-%dT%H:%M:%fZ', 'now'))`),
  },
  (t) => [index("attachments_owner_idx").on(t.ownerKind, t.ownerId)],
);
export type Attachment = typeof attachments.$inferSelect;

// The indicator-sheet reading of a Bowie-Dick cycle; a correction adds a row, the latest counts. Append-only (triggers).
export const indicatorSheets = sqliteTable(
  "indicator_sheets",
  {
    id: id(),
    cycleId: text("cycle_id")
      .notNull()
      .references(() => cycles.id),
    result: text("result", { enum: INDICATOR_SHEET_RESULTS }).notNull(),
    indicatorLot: text("indicator_lot"),
    attachmentId: text("attachment_id")
      .notNull()
      .references(() => attachments.id),
    reason: text("reason"),
    recordedBy: text("recorded_by")
      .notNull()
      .references(() => users.id),
    recordedAt: text("recorded_at")
      .notNull()
      .default(sql`(strftime('%Y-%m-%dT%H:%M:%fZ', 'now'))`),
  },
  (t) => [index("indicator_sheets_cycle_idx").on(t.cycleId, t.recordedAt)],
);
export type IndicatorSheet = typeof indicatorSheets.$inferSelect;

// Electronic signatures on periodic-test records (21 CFR 11.50/11.70), bound to the record's content hash. Append-only (triggers).
export const periodicTestSignatures = sqliteTable(
  "periodic_test_signatures",
  {
    id: id(),
    periodicTestId: text("periodic_test_id")
      .notNull()
      .references(() => periodicTests.id),
    userId: text("user_id")
      .notNull()
      .references(() => users.id),
    printedName: text("printed_name").notNull(),
    role: text("role", { enum: ROLES }).notNull(),
    meaning: text("meaning", { enum: PERIODIC_SIGNATURE_MEANINGS }).notNull(),
    reason: text("reason"),
    signedAt: text("signed_at").notNull(),
    recordHash: text("record_hash").notNull(),
  },
  (t) => [index("periodic_test_signatures_test_idx").on(t.periodicTestId)],
);
export type PeriodicTestSignature = typeof periodicTestSignatures.$inferSelect;

export const testSchedules = sqliteTable(
  "test_schedules",
  {
    id: id(),
    sterilizerId: text("sterilizer_id")
      .notNull()
      .references(() => sterilizers.id),
    kind: text("kind", { enum: PERIODIC_TEST_KINDS }).notNull(),
    intervalDays: integer("interval_days").notNull(),
    // Out of use while this test is due or has never passed (lib/periodic-tests/status.ts).
    requiredBeforeUse: integer("required_before_use", { mode: "boolean" }).notNull().default(false),
    createdAt: createdAt(),
  },
  (t) => [uniqueIndex("test_schedules_unique").on(t.sterilizerId, t.kind)],
);
export type TestSchedule = typeof testSchedules.$inferSelect;

// Logger-gateway tokens (lib/domain/api-tokens.ts): only the SHA-256 of a token is kept, with the first characters to recognise it.
export const apiTokens = sqliteTable(
  "api_tokens",
  {
    id: id(),
    siteId: text("site_id")
      .notNull()
      .references(() => sites.id),
    name: text("name").notNull(),
    prefix: text("prefix").notNull(),
    tokenHash: text("token_hash").notNull().unique(),
    scope: text("scope", { enum: API_TOKEN_SCOPES }).notNull().default("gateway"),
    // The sterilizers the token may upload for; null: every sterilizer of its site.
    sterilizerIds: text("sterilizer_ids", { mode: "json" }).$type<string[] | null>(),
    expiresAt: text("expires_at").notNull(),
    createdBy: text("created_by")
      .notNull()
      .references(() => users.id),
    createdAt: createdAt(),
    lastUsedAt: text("last_used_at"),
    revokedAt: text("revoked_at"),
    revokedBy: text("revoked_by").references(() => users.id),
  },
  (t) => [index("api_tokens_site_idx").on(t.siteId), check("api_tokens_scope_known", sql`${t.scope} in (${sql.raw(API_TOKEN_SCOPES.map((s) => `'${s}'`).join(", "))})`)],
);
export type ApiToken = typeof apiTokens.$inferSelect;
export type NewApiToken = typeof apiTokens.$inferInsert;

/** POST /api/cycles answers kept per (user, Idempotency-Key) for a day, so a retried upload replays instead of creating twice. */
export const idempotencyKeys = sqliteTable(
  "idempotency_keys",
  {
    userId: text("user_id")
      .notNull()
      .references(() => users.id),
    key: text("key").notNull(),
    requestHash: text("request_hash").notNull(),
    // Both null while the first request is still running.
    responseStatus: integer("response_status"),
    responseBody: text("response_body"),
    createdAt: createdAt(),
    expiresAt: text("expires_at").notNull(),
  },
  (t) => [primaryKey({ columns: [t.userId, t.key] }), index("idempotency_keys_expires_idx").on(t.expiresAt)],
);
export type IdempotencyKey = typeof idempotencyKeys.$inferSelect;

// ── Qualification studies (issue 14, migration 0021) ──────────────────────────────────────────────────────────────

/** A loading pattern of one sterilizer: what is loaded where, and the positions probes and indicators take. */
export const loadingPatterns = sqliteTable(
  "loading_patterns",
  {
    id: id(),
    siteId: text("site_id")
      .notNull()
      .references(() => sites.id),
    sterilizerId: text("sterilizer_id")
      .notNull()
      .references(() => sterilizers.id),
    name: text("name").notNull(),
    description: text("description").notNull().default(""),
    loadType: text("load_type", { enum: LOAD_TYPES }),
    items: text("items", { mode: "json" }).$type<PatternItem[]>().notNull(),
    positions: text("positions", { mode: "json" }).$type<PatternPosition[]>().notNull(),
    // a photo or sketch (attachments, owner kind "loading-pattern"); null: none uploaded
    photoAttachmentId: text("photo_attachment_id").references(() => attachments.id),
    // set by an approved study: the date (site calendar, YYYY-MM-DD) its requalification falls due; null: never qualified
    requalificationDueOn: text("requalification_due_on"),
    // when true, an overdue requalification takes this load type out of use on the status board (engineer's decision)
    requiredBeforeUse: integer("required_before_use", { mode: "boolean" }).notNull().default(false),
    createdBy: text("created_by")
      .notNull()
      .references(() => users.id),
    createdAt: createdAt(),
    updatedAt: text("updated_at"),
  },
  (t) => [index("loading_patterns_sterilizer_idx").on(t.sterilizerId, t.name), index("loading_patterns_site_due_idx").on(t.siteId, t.requalificationDueOn)],
);
export type LoadingPattern = typeof loadingPatterns.$inferSelect;
export type NewLoadingPattern = typeof loadingPatterns.$inferInsert;

export const studies = sqliteTable(
  "studies",
  {
    id: id(),
    siteId: text("site_id")
      .notNull()
      .references(() => sites.id),
    // "QS-<year>-<nnn>" per site, for people and the report number
    studyNumber: text("study_number").notNull(),
    title: text("title").notNull(),
    sterilizerId: text("sterilizer_id")
      .notNull()
      .references(() => sterilizers.id),
    profileId: text("profile_id")
      .notNull()
      .references(() => acceptanceProfiles.id),
    loadingPatternId: text("loading_pattern_id")
      .notNull()
      .references(() => loadingPatterns.id),
    kind: text("kind", { enum: STUDY_KINDS }).notNull(),
    runsRequired: integer("runs_required").notNull().default(3),
    // minimum F0 at every load position, minutes; null: profileMinimumF0 of the profile (lib/domain/studies.ts)
    minF0Min: real("min_f0_min"),
    // largest spread between positions during holding, K; null: the profile's maxSpreadK
    maxSpreadK: real("max_spread_k"),
    indicatorsRequired: integer("indicators_required", { mode: "boolean" }).notNull().default(true),
    protocol: text("protocol").notNull().default(""),
    requalificationMonths: integer("requalification_months").notNull().default(12),
    status: text("status", { enum: STUDY_STATUSES }).notNull().default("draft"),
    createdBy: text("created_by")
      .notNull()
      .references(() => users.id),
    createdAt: createdAt(),
    updatedAt: text("updated_at"),
  },
  (t) => [
    uniqueIndex("studies_site_number_idx").on(t.siteId, t.studyNumber),
    index("studies_site_status_idx").on(t.siteId, t.status, t.createdAt),
    index("studies_pattern_idx").on(t.loadingPatternId),
  ],
);
export type Study = typeof studies.$inferSelect;
export type NewStudy = typeof studies.$inferInsert;

/** A signed cycle attached to a study in order, with the analysis it was judged on and where each channel sat. */
export const studyRuns = sqliteTable(
  "study_runs",
  {
    id: id(),
    studyId: text("study_id")
      .notNull()
      .references(() => studies.id),
    cycleId: text("cycle_id")
      .notNull()
      .references(() => cycles.id),
    analysisId: text("analysis_id")
      .notNull()
      .references(() => analyses.id),
    // 1-based order of attachment
    runNumber: integer("run_number").notNull(),
    // channel header (exactly as in the file) → pattern position id; channels left out are not load positions
    sensorMap: text("sensor_map", { mode: "json" }).$type<Record<string, string>>().notNull(),
    attachedBy: text("attached_by")
      .notNull()
      .references(() => users.id),
    attachedAt: text("attached_at")
      .notNull()
      .default(sql`(strftime('%Y-%m-%dT%H:%M:%fZ', 'now'))`),
  },
  (t) => [uniqueIndex("study_runs_study_cycle_idx").on(t.studyId, t.cycleId), uniqueIndex("study_runs_study_number_idx").on(t.studyId, t.runNumber)],
);
export type StudyRun = typeof studyRuns.$inferSelect;

// Indicator readings per run and position; a correction adds a row (with its reason), the latest counts. Append-only (triggers).
export const studyIndicators = sqliteTable(
  "study_indicators",
  {
    id: id(),
    studyRunId: text("study_run_id")
      .notNull()
      .references(() => studyRuns.id),
    positionId: text("position_id").notNull(),
    kind: text("kind", { enum: INDICATOR_KINDS }).notNull(),
    result: text("result", { enum: INDICATOR_RESULTS }).notNull(),
    // biological: the organism (e.g. Geobacillus stearothermophilus), its population per carrier and incubation
    organism: text("organism"),
    lot: text("lot").notNull(),
    population: real("population"),
    incubation: text("incubation"),
    readBy: text("read_by").notNull(),
    readAt: text("read_at").notNull(),
    reason: text("reason"),
    recordedBy: text("recorded_by")
      .notNull()
      .references(() => users.id),
    recordedAt: text("recorded_at")
      .notNull()
      .default(sql`(strftime('%Y-%m-%dT%H:%M:%fZ', 'now'))`),
  },
  (t) => [index("study_indicators_run_idx").on(t.studyRunId, t.positionId, t.kind, t.recordedAt)],
);
export type StudyIndicator = typeof studyIndicators.$inferSelect;

export const studyDeviations = sqliteTable(
  "study_deviations",
  {
    id: id(),
    studyId: text("study_id")
      .notNull()
      .references(() => studies.id),
    studyRunId: text("study_run_id").references(() => studyRuns.id),
    source: text("source", { enum: DEVIATION_SOURCES }).notNull(),
    // what happened, in a sentence (opened automatically: written by Papin)
    what: text("what").notNull(),
    impact: text("impact").notNull().default(""),
    rootCause: text("root_cause").notNull().default(""),
    capaReference: text("capa_reference").notNull().default(""),
    status: text("status", { enum: DEVIATION_STATUSES }).notNull().default("open"),
    openedBy: text("opened_by").references(() => users.id),
    openedAt: text("opened_at")
      .notNull()
      .default(sql`(strftime('%Y-%m-%dT%H:%M:%fZ', 'now'))`),
    closedBy: text("closed_by").references(() => users.id),
    closedAt: text("closed_at"),
    closeReason: text("close_reason"),
    updatedAt: text("updated_at"),
  },
  (t) => [index("study_deviations_study_idx").on(t.studyId, t.status)],
);
export type StudyDeviation = typeof studyDeviations.$inferSelect;

// Electronic signatures on studies, bound to the study's content hash. Append-only (triggers).
export const studySignatures = sqliteTable(
  "study_signatures",
  {
    id: id(),
    studyId: text("study_id")
      .notNull()
      .references(() => studies.id),
    userId: text("user_id")
      .notNull()
      .references(() => users.id),
    printedName: text("printed_name").notNull(),
    role: text("role", { enum: ROLES }).notNull(),
    meaning: text("meaning", { enum: STUDY_SIGNATURE_MEANINGS }).notNull(),
    reason: text("reason"),
    signedAt: text("signed_at").notNull(),
    contentHash: text("content_hash").notNull(),
  },
  (t) => [index("study_signatures_study_idx").on(t.studyId, t.signedAt)],
);
export type StudySignature = typeof studySignatures.$inferSelect;

// The study report archived at approval, kept byte for byte. Append-only (triggers).
export const studyReports = sqliteTable(
  "study_reports",
  {
    id: id(),
    studyId: text("study_id")
      .notNull()
      .references(() => studies.id),
    signatureId: text("signature_id")
      .notNull()
      .references(() => studySignatures.id),
    reportNumber: text("report_number").notNull().unique(),
    sha256: text("sha256").notNull(),
    sizeBytes: integer("size_bytes").notNull(),
    bytes: blob("bytes", { mode: "buffer" }).notNull(),
    createdAt: createdAt(),
  },
  (t) => [index("study_reports_study_idx").on(t.studyId), index("study_reports_sha_idx").on(t.sha256)],
);
export type StudyReport = typeof studyReports.$inferSelect;

export const sitesRelations = relations(sites, ({ many }) => ({
  users: many(users),
  sterilizers: many(sterilizers),
  profiles: many(acceptanceProfiles),
  instruments: many(instruments),
}));
export const usersRelations = relations(users, ({ one }) => ({ site: one(sites, { fields: [users.siteId], references: [sites.id] }) }));
export const sterilizersRelations = relations(sterilizers, ({ one, many }) => ({
  site: one(sites, { fields: [sterilizers.siteId], references: [sites.id] }),
  defaultProfile: one(acceptanceProfiles, { fields: [sterilizers.defaultProfileId], references: [acceptanceProfiles.id] }),
  cycles: many(cycles),
  schedules: many(testSchedules),
}));
export const instrumentsRelations = relations(instruments, ({ one, many }) => ({
  site: one(sites, { fields: [instruments.siteId], references: [sites.id] }),
  certificates: many(calibrationCertificates),
}));
export const calibrationCertificatesRelations = relations(calibrationCertificates, ({ one }) => ({
  instrument: one(instruments, { fields: [calibrationCertificates.instrumentId], references: [instruments.id] }),
}));
export const cyclesRelations = relations(cycles, ({ one, many }) => ({
  site: one(sites, { fields: [cycles.siteId], references: [sites.id] }),
  sterilizer: one(sterilizers, { fields: [cycles.sterilizerId], references: [sterilizers.id] }),
  profile: one(acceptanceProfiles, { fields: [cycles.profileId], references: [acceptanceProfiles.id] }),
  instrument: one(instruments, { fields: [cycles.instrumentId], references: [instruments.id] }),
  creator: one(users, { fields: [cycles.createdBy], references: [users.id] }),
  files: many(loggerFiles),
  analyses: many(analyses),
  signatures: many(signatures),
}));
export const loggerFilesRelations = relations(loggerFiles, ({ one }) => ({
  cycle: one(cycles, { fields: [loggerFiles.cycleId], references: [cycles.id] }),
}));
export const analysesRelations = relations(analyses, ({ one }) => ({
  cycle: one(cycles, { fields: [analyses.cycleId], references: [cycles.id] }),
  file: one(loggerFiles, { fields: [analyses.loggerFileId], references: [loggerFiles.id] }),
}));
export const signaturesRelations = relations(signatures, ({ one }) => ({
  cycle: one(cycles, { fields: [signatures.cycleId], references: [cycles.id] }),
  user: one(users, { fields: [signatures.userId], references: [users.id] }),
}));
export const periodicTestsRelations = relations(periodicTests, ({ one }) => ({
  sterilizer: one(sterilizers, { fields: [periodicTests.sterilizerId], references: [sterilizers.id] }),
}));
export const testSchedulesRelations = relations(testSchedules, ({ one }) => ({
  sterilizer: one(sterilizers, { fields: [testSchedules.sterilizerId], references: [sterilizers.id] }),
}));
