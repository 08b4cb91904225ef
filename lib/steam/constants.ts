/** IAPWS-IF97: triple point 273.16 K, 611.657 Pa. */
export const TRIPLE_POINT = { temperatureC: 0.01, pressureKpa: 0.611657 } as const;

/** IAPWS-IF97: critical point 647.096 K, 22.064 MPa. */
export const CRITICAL_POINT = { temperatureC: 373.946, pressureKpa: 22064 } as const;

export const STANDARD_ATMOSPHERE_KPA = 101.325;

/**
 * The atmospheric pressures Papin accepts for making gauge readings absolute, kPa: the standard
 * atmosphere near 5500 m is 50 kPa and no weather at sea level reaches 110 kPa (common practice).
 * A value outside is a typing or unit mistake that would shift every saturation temperature.
 */
export const ATMOSPHERE_RANGE_KPA = { min: 50, max: 110 } as const;

export const KELVIN_OFFSET = 273.15;

/** Specific gas constant of water used throughout IF97, kJ/(kg·K). */
export const IF97_GAS_CONSTANT = 0.461526;
