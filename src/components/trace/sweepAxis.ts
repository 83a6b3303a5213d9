/**
 * The calibrated sweep axis: TEM00 resonances sit exactly one free spectral range apart in optical
 * frequency (Siegman, "Lasers" (1986), §11.3), so the k-th TEM00 in time order marks k FSR. Between two
 * TEM00s the axis is interpolated linearly, beyond the outer ones it is extended with the nearest spacing.
 * The result is in FSR units counted from the first TEM00; multiply by the FSR for frequency.
 */
export function timeToFsr(tSeconds: ArrayLike<number>, fundamentalTimes: readonly number[]): Float64Array {
  const marks = [...fundamentalTimes].filter(Number.isFinite).sort((a, b) => a - b)
  if (marks.length < 2) throw new RangeError(`at least two TEM00 resonances are needed to calibrate the sweep (got ${marks.length})`)
  const out = new Float64Array(tSeconds.length)
  let segment = 0
  for (let i = 0; i < tSeconds.length; i++) {
    const t = tSeconds[i]
    // Times are usually sorted, so the segment only moves forward; fall back to a search when not.
    if (segment > 0 && t < marks[segment]) segment = 0
    while (segment < marks.length - 2 && t > marks[segment + 1]) segment++
    const left = marks[segment]
    const right = marks[segment + 1]
    out[i] = segment + (t - left) / (right - left)
  }
  return out
}

/** Whether a result carries enough TEM00s for `timeToFsr`. */
export function canCalibrate(fundamentalTimes: readonly number[]): boolean {
  return fundamentalTimes.filter(Number.isFinite).length >= 2
}
