export const TEMPERATURE_UNITS = ["C", "F", "K"] as const;
export type TemperatureUnit = (typeof TEMPERATURE_UNITS)[number];

export const PRESSURE_UNITS = ["Pa", "kPa", "MPa", "bar", "mbar", "psi", "mmHg", "inHg"] as const;
export type PressureUnit = (typeof PRESSURE_UNITS)[number];

export const TEMPERATURE_UNIT_SYMBOL: Record<TemperatureUnit, string> = { C: "°C", F: "°F", K: "K" };

/** Whether a pressure is read against vacuum or against the atmosphere. */
export const PRESSURE_REFERENCES = ["abs", "gauge"] as const;
export type PressureReference = (typeof PRESSURE_REFERENCES)[number];
