export const INSTRUMENT_KIND_LABELS: Record<string, string> = {
  logger: "Data logger",
  "pressure-sensor": "Pressure sensor",
  "temperature-probe": "Temperature probe",
  "reference-thermometer": "Reference thermometer",
};
