import { CRITICAL_POINT, IF97_GAS_CONSTANT, KELVIN_OFFSET, TRIPLE_POINT } from "./constants";
import { SteamRangeError } from "./errors";

// IAPWS R7-97(2012), Table 34. n5 ends in ...22333 (a public copy with ...23333 is wrong).
const N1 = 0.11670521452767e4;
const N2 = -0.72421316703206e6;
const N3 = -0.17073846940092e2;
const N4 = 0.1202082470247e5;
const N5 = -0.32325550322333e7;
const N6 = 0.1491510861353e2;
const N7 = -0.48232657361591e4;
const N8 = 0.40511340542057e6;
const N9 = -0.23855557567849;
const N10 = 0.65017534844798e3;

// Plain numbers: imported bindings compiled to CommonJS are getters, slow in the hot path.
const KELVIN = KELVIN_OFFSET;
const TRIPLE_KPA = TRIPLE_POINT.pressureKpa;
const CRITICAL_KPA = CRITICAL_POINT.pressureKpa;
const TRIPLE_K = TRIPLE_POINT.temperatureC + KELVIN_OFFSET;
const CRITICAL_K = CRITICAL_POINT.temperatureC + KELVIN_OFFSET;
const TRIPLE_MPA = TRIPLE_POINT.pressureKpa / 1000;
const CRITICAL_MPA = CRITICAL_POINT.pressureKpa / 1000;
// Rounding in the last digit of the bounds must not reject the bounds themselves.
const EDGE = 1e-9;

function formatNumber(value: number): string {
  return Number.isFinite(value) ? String(Number(value.toPrecision(6))) : String(value);
}

function checkTemperatureK(temperatureK: number, temperatureC: number): void {
  if (!Number.isFinite(temperatureC)) {
    throw new SteamRangeError(`Temperature ${formatNumber(temperatureC)} °C is not a finite number`);
  }
  if (temperatureK < TRIPLE_K * (1 - EDGE)) {
    throw new SteamRangeError(`${formatNumber(temperatureC)} °C is below the triple point (${TRIPLE_POINT.temperatureC} °C): water has no liquid–vapour line there`);
  }
  if (temperatureK > CRITICAL_K * (1 + EDGE)) {
    throw new SteamRangeError(`${formatNumber(temperatureC)} °C is above the critical point (${CRITICAL_POINT.temperatureC} °C): water has no liquid–vapour line there`);
  }
}

/** IF97 Eq. 30: saturation pressure in MPa from temperature in K (no range check). */
export function saturationPressureMpaFromKelvin(temperatureK: number): number {
  const theta = temperatureK + N9 / (temperatureK - N10);
  const a = theta * theta + N1 * theta + N2;
  const b = N3 * theta * theta + N4 * theta + N5;
  const c = N6 * theta * theta + N7 * theta + N8;
  const x = (2 * c) / (-b + Math.sqrt(b * b - 4 * a * c));
  const x2 = x * x;
  return x2 * x2;
}

/** IF97 Eq. 31: saturation temperature in K from pressure in MPa (no range check). */
export function saturationTemperatureKelvinFromMpa(pressureMpa: number): number {
  const beta = Math.sqrt(Math.sqrt(pressureMpa));
  const e = beta * beta + N3 * beta + N6;
  const f = N1 * beta * beta + N4 * beta + N7;
  const g = N2 * beta * beta + N5 * beta + N8;
  const d = (2 * g) / (-f - Math.sqrt(f * f - 4 * e * g));
  const sum = N10 + d;
  return (sum - Math.sqrt(sum * sum - 4 * (N9 + N10 * d))) / 2;
}

/** Saturation (vapour) pressure of water in kPa absolute at a temperature in °C, IF97 region 4. */
export function saturationPressureKpa(temperatureC: number): number {
  const temperatureK = temperatureC + KELVIN_OFFSET;
  checkTemperatureK(temperatureK, temperatureC);
  return saturationPressureMpaFromKelvin(Math.min(Math.max(temperatureK, TRIPLE_K), CRITICAL_K)) * 1000;
}

/** Saturation temperature of water in °C at a pressure in kPa absolute, IF97 region 4. */
export function saturationTemperatureC(pressureKpaAbs: number): number {
  // Comparisons written so that NaN falls through to the error.
  if (pressureKpaAbs >= TRIPLE_KPA && pressureKpaAbs <= CRITICAL_KPA) {
    return saturationTemperatureKelvinFromMpa(pressureKpaAbs / 1000) - KELVIN;
  }
  return saturationTemperatureSlowPath(pressureKpaAbs);
}

function saturationTemperatureSlowPath(pressureKpaAbs: number): number {
  if (!Number.isFinite(pressureKpaAbs)) {
    throw new SteamRangeError(`Pressure ${formatNumber(pressureKpaAbs)} kPa is not a finite number`);
  }
  const pressureMpa = pressureKpaAbs / 1000;
  if (pressureMpa < TRIPLE_MPA * (1 - EDGE)) {
    throw new SteamRangeError(`${formatNumber(pressureKpaAbs)} kPa abs is below the triple point (${TRIPLE_POINT.pressureKpa} kPa): water has no liquid–vapour line there`);
  }
  if (pressureMpa > CRITICAL_MPA * (1 + EDGE)) {
    throw new SteamRangeError(`${formatNumber(pressureKpaAbs)} kPa abs is above the critical point (${CRITICAL_POINT.pressureKpa} kPa): water has no liquid–vapour line there`);
  }
  const clamped = Math.min(Math.max(pressureMpa, TRIPLE_MPA), CRITICAL_MPA);
  return saturationTemperatureKelvinFromMpa(clamped) - KELVIN_OFFSET;
}

// Region 1 (IF97-Rev Table 2): [I, J, n]
const REGION1: ReadonlyArray<readonly [number, number, number]> = [
  [0, -2, 0.14632971213167],
  [0, -1, -0.84548187169114],
  [0, 0, -0.3756360367204e1],
  [0, 1, 0.33855169168385e1],
  [0, 2, -0.95791963387872],
  [0, 3, 0.15772038513228],
  [0, 4, -0.16616417199501e-1],
  [0, 5, 0.81214629983568e-3],
  [1, -9, 0.28319080123804e-3],
  [1, -7, -0.60706301565874e-3],
  [1, -1, -0.18990068218419e-1],
  [1, 0, -0.32529748770505e-1],
  [1, 1, -0.21841717175414e-1],
  [1, 3, -0.5283835796993e-4],
  [2, -3, -0.47184321073267e-3],
  [2, 0, -0.30001780793026e-3],
  [2, 1, 0.47661393906987e-4],
  [2, 3, -0.44141845330846e-5],
  [2, 17, -0.72694996297594e-15],
  [3, -4, -0.31679644845054e-4],
  [3, 0, -0.28270797985312e-5],
  [3, 6, -0.85205128120103e-9],
  [4, -5, -0.22425281908e-5],
  [4, -2, -0.65171222895601e-6],
  [4, 10, -0.14341729937924e-12],
  [5, -8, -0.40516996860117e-6],
  [8, -11, -0.12734301741641e-8],
  [8, -6, -0.17424871230634e-9],
  [21, -29, -0.68762131295531e-18],
  [23, -31, 0.14478307828521e-19],
  [29, -38, 0.26335781662795e-22],
  [30, -39, -0.11947622640071e-22],
  [31, -40, 0.18228094581404e-23],
  [32, -41, -0.93537087292458e-25],
];

// Region 2 ideal-gas part (Table 10): [J°, n°]
const REGION2_IDEAL: ReadonlyArray<readonly [number, number]> = [
  [0, -0.96927686500217e1],
  [1, 0.10086655968018e2],
  [-5, -0.5608791128302e-2],
  [-4, 0.71452738081455e-1],
  [-3, -0.40710498223928],
  [-2, 0.14240819171444e1],
  [-1, -0.4383951131945e1],
  [2, -0.28408632460772],
  [3, 0.21268463753307e-1],
];

// Region 2 residual part (Table 11): [I, J, n]
const REGION2_RESIDUAL: ReadonlyArray<readonly [number, number, number]> = [
  [1, 0, -0.17731742473213e-2],
  [1, 1, -0.17834862292358e-1],
  [1, 2, -0.45996013696365e-1],
  [1, 3, -0.57581259083432e-1],
  [1, 6, -0.5032527872793e-1],
  [2, 1, -0.33032641670203e-4],
  [2, 2, -0.18948987516315e-3],
  [2, 4, -0.39392777243355e-2],
  [2, 7, -0.43797295650573e-1],
  [2, 36, -0.26674547914087e-4],
  [3, 0, 0.20481737692309e-7],
  [3, 1, 0.43870667284435e-6],
  [3, 3, -0.3227767723857e-4],
  [3, 6, -0.15033924542148e-2],
  [3, 35, -0.40668253562649e-1],
  [4, 1, -0.78847309559367e-9],
  [4, 2, 0.12790717852285e-7],
  [4, 3, 0.48225372718507e-6],
  [5, 7, 0.22922076337661e-5],
  [6, 3, -0.16714766451061e-10],
  [6, 16, -0.21171472321355e-2],
  [6, 35, -0.23895741934104e2],
  [7, 0, -0.5905956432427e-17],
  [7, 11, -0.12621808899101e-5],
  [7, 25, -0.38946842435739e-1],
  [8, 8, 0.11256211360459e-10],
  [8, 36, -0.82311340897998e1],
  [9, 13, 0.19809712802088e-7],
  [10, 4, 0.10406965210174e-18],
  [10, 10, -0.10234747095929e-12],
  [10, 14, -0.10018179379511e-8],
  [16, 29, -0.80882908646985e-10],
  [16, 50, 0.10693031879409],
  [18, 57, -0.33662250574171],
  [20, 20, 0.89185845355421e-24],
  [20, 35, 0.30629316876232e-12],
  [20, 48, -0.42002467698208e-5],
  [21, 21, -0.59056029685639e-25],
  [22, 53, 0.37826947613457e-5],
  [23, 39, -0.12768608934681e-14],
  [24, 26, 0.73087610595061e-28],
  [24, 40, 0.55414715350778e-16],
  [24, 58, -0.9436970724121e-6],
];

export type StateProperties = {
  /** specific enthalpy, kJ/kg */
  enthalpyKjPerKg: number;
  /** specific volume, m³/kg */
  specificVolumeM3PerKg: number;
};

/** IF97 region 1 (compressed liquid): h and v from temperature in K and pressure in MPa. */
export function region1(temperatureK: number, pressureMpa: number): StateProperties {
  const pi = pressureMpa / 16.53;
  const tau = 1386 / temperatureK;
  const a = 7.1 - pi;
  const b = tau - 1.222;
  let gammaPi = 0;
  let gammaTau = 0;
  for (const [i, j, n] of REGION1) {
    gammaPi -= n * i * a ** (i - 1) * b ** j;
    gammaTau += n * a ** i * j * b ** (j - 1);
  }
  const rt = IF97_GAS_CONSTANT * temperatureK;
  return {
    enthalpyKjPerKg: rt * tau * gammaTau,
    specificVolumeM3PerKg: (rt / (pressureMpa * 1000)) * pi * gammaPi,
  };
}

/** IF97 region 2 (vapour): h and v from temperature in K and pressure in MPa. */
export function region2(temperatureK: number, pressureMpa: number): StateProperties {
  const pi = pressureMpa;
  const tau = 540 / temperatureK;
  let gammaIdealTau = 0;
  for (const [j, n] of REGION2_IDEAL) gammaIdealTau += n * j * tau ** (j - 1);
  let gammaResidualTau = 0;
  let gammaResidualPi = 0;
  const b = tau - 0.5;
  for (const [i, j, n] of REGION2_RESIDUAL) {
    gammaResidualTau += n * pi ** i * j * b ** (j - 1);
    gammaResidualPi += n * i * pi ** (i - 1) * b ** j;
  }
  const rt = IF97_GAS_CONSTANT * temperatureK;
  return {
    enthalpyKjPerKg: rt * tau * (gammaIdealTau + gammaResidualTau),
    specificVolumeM3PerKg: (rt / (pressureMpa * 1000)) * pi * (1 / pi + gammaResidualPi),
  };
}

// Regions 1 and 2 meet region 3 at 623.15 K; beyond it the saturated states need region 3.
const REGION_1_2_LIMIT_C = 350;

function saturatedState(temperatureC: number): { temperatureK: number; pressureMpa: number } {
  const pressureKpa = saturationPressureKpa(temperatureC);
  if (temperatureC > REGION_1_2_LIMIT_C) {
    throw new SteamRangeError(`${formatNumber(temperatureC)} °C is above ${REGION_1_2_LIMIT_C} °C, where saturated enthalpies need IF97 region 3, which Papin does not implement`);
  }
  return { temperatureK: temperatureC + KELVIN_OFFSET, pressureMpa: pressureKpa / 1000 };
}

/** h′: specific enthalpy of saturated liquid water, kJ/kg. */
export function saturatedLiquidEnthalpy(temperatureC: number): number {
  const { temperatureK, pressureMpa } = saturatedState(temperatureC);
  return region1(temperatureK, pressureMpa).enthalpyKjPerKg;
}

/** h″: specific enthalpy of saturated steam, kJ/kg. */
export function saturatedVapourEnthalpy(temperatureC: number): number {
  const { temperatureK, pressureMpa } = saturatedState(temperatureC);
  return region2(temperatureK, pressureMpa).enthalpyKjPerKg;
}

/** v″: specific volume of saturated steam, m³/kg. */
export function saturatedVapourVolume(temperatureC: number): number {
  const { temperatureK, pressureMpa } = saturatedState(temperatureC);
  return region2(temperatureK, pressureMpa).specificVolumeM3PerKg;
}

/** h_fg = h″ − h′, kJ/kg. */
export function latentHeat(temperatureC: number): number {
  return saturatedVapourEnthalpy(temperatureC) - saturatedLiquidEnthalpy(temperatureC);
}
