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
