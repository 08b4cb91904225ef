export const INSTRUMENT_KINDS = ["logger", "pressure-sensor", "temperature-probe", "reference-thermometer"] as const;
export type InstrumentKind = (typeof INSTRUMENT_KINDS)[number];

export const INSTRUMENT_KIND_LABELS: Record<InstrumentKind, string> = {
  logger: "Data logger",
  "pressure-sensor": "Pressure sensor",
  "temperature-probe": "Temperature probe",
  "reference-thermometer": "Reference thermometer",
};

export const MAIL_STATUSES = ["pending", "sent", "failed"] as const;
export type MailStatus = (typeof MAIL_STATUSES)[number];

/** The fields of an acceptance profile that a user sets: the form edits them, the audit trail records them old and new. */
export const PROFILE_FIELDS = [
  "name",
  "sterilizationTempC",
  "bandK",
  "holdingTimeS",
  "maxEquilibrationS",
  "maxSpreadK",
  "saturationLimitK",
  "f0ReferenceC",
  "f0ZK",
  "maxSampleIntervalS",
  "freeSpaceEarlyK",
  "freeSpaceEarlyS",
  "freeSpaceK",
  "leakRateLimitKpaPerMin",
  "leakVacuumSetPointKpaAbs",
  "basis",
  "basisReason",
] as const;
export type ProfileField = (typeof PROFILE_FIELDS)[number];
