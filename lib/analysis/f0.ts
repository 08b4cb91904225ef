/**
 * Lethality F(Tref, z) in minutes: the trapezoid integral of 10^((T − Tref)/z) over time.
 * With Tref = 121.1 °C and z = 10 K this is F0.
 */
export function lethalityMinutes(timesS: ArrayLike<number>, temperaturesC: ArrayLike<number>, referenceC = 121.1, zK = 10, fromIndex = 0, toIndex = timesS.length - 1): number {
  const k = Math.LN10 / zK;
  let sumSeconds = 0;
  let previousRate = Math.exp((temperaturesC[fromIndex] - referenceC) * k);
  for (let i = fromIndex + 1; i <= toIndex; i++) {
    const rate = Math.exp((temperaturesC[i] - referenceC) * k);
    sumSeconds += (timesS[i] - timesS[i - 1]) * (rate + previousRate);
    previousRate = rate;
  }
  return sumSeconds / 2 / 60;
}

export function lethalRate(temperatureC: number, referenceC = 121.1, zK = 10): number {
  return Math.pow(10, (temperatureC - referenceC) / zK);
}

/**
 * Each temperature channel's F(Tref, z) over the whole record, minutes, in channel order. Only
 * trapezoids between consecutive readings of the channel count, and none across an interval longer
 * than maxIntervalS: what a gap or a missing reading hides adds no lethality.
 */
export function channelLethalities(temperatures: ReadonlyArray<{ values: ArrayLike<number> }>, timesS: ArrayLike<number>, referenceC: number, zK: number, maxIntervalS = Infinity): number[] {
  const k = Math.LN10 / zK;
  const longest = maxIntervalS + 1e-6;
  return temperatures.map(({ values }) => {
    let sumSeconds = 0;
    let previous = -1;
    let previousRate = 0;
    for (let i = 0; i < timesS.length; i++) {
      const t = values[i];
      if (t !== t) continue;
      const rate = Math.exp((t - referenceC) * k);
      if (previous >= 0 && i === previous + 1 && timesS[i] - timesS[previous] <= longest) sumSeconds += (timesS[i] - timesS[previous]) * (rate + previousRate);
      previous = i;
      previousRate = rate;
    }
    return sumSeconds / 2 / 60;
  });
}
