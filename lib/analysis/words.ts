/** Rounding and wording shared by the analysis steps; the figures and sentences of the result depend on them exactly. */
export const round = (value: number, digits = 3) => {
  const f = 10 ** digits;
  return Math.round(value * f) / f;
};

export const fmt = (value: number, digits = 1) => value.toFixed(digits);

export const seconds = (value: number) => `${fmt(value, Number.isInteger(value) ? 0 : 1)} s`;

export function describeDuration(s: number): string {
  if (s < 120) return seconds(s);
  const minutes = Math.floor(s / 60);
  const rest = Math.round(s - minutes * 60);
  return rest === 0 ? `${minutes} min` : `${minutes} min ${rest} s`;
}
