export { SteamRangeError } from "./errors";
export { TRIPLE_POINT, CRITICAL_POINT, STANDARD_ATMOSPHERE_KPA, ATMOSPHERE_RANGE_KPA, KELVIN_OFFSET, IF97_GAS_CONSTANT } from "./constants";
export {
  saturationPressureKpa,
  saturationTemperatureC,
  saturatedLiquidEnthalpy,
  saturatedVapourEnthalpy,
  saturatedVapourVolume,
  latentHeat,
  region1,
  region2,
  saturationPressureMpaFromKelvin,
  saturationTemperatureKelvinFromMpa,
  type StateProperties,
} from "./if97";
export {
  type TemperatureUnit,
  type PressureUnit,
  type PressureLabel,
  type GaugeOptions,
  TEMPERATURE_UNITS,
  PRESSURE_UNITS,
  TEMPERATURE_UNIT_SYMBOL,
  convertTemperature,
  convertPressure,
  toCelsius,
  fromCelsius,
  kpaPerUnit,
  toAbsoluteKpa,
  fromAbsoluteKpa,
  atmosphereAtAltitudeKpa,
  atmosphereOutOfRange,
  parseTemperatureUnit,
  parsePressureUnit,
  parsePressureLabel,
} from "./units";
export { saturationLine, type SaturationLine } from "./saturation-line";
