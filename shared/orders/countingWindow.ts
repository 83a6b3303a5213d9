/** An FSR must span this many samples at least for any order to be placed in it (common practice). */
const MIN_SAMPLES_PER_FSR = 10

/**
 * The stretch of the calibrated axis (FSR units, TEM00 at whole numbers) over which the orders' powers are counted:
 * every order resonates exactly once in any one-FSR stretch. With two or more TEM00 in view it runs from the first to
 * the last of them (whole periods between measured TEM00). With one, it is the one-FSR stretch inside the sweep whose
 * ends lie farthest from any predicted line (so that no line sits half in, half out). Null when the sweep holds less
 * than one FSR, or when the TEM00 indices span more FSRs than the sweep or its `sweepSamples` can hold.
 */
export function countingWindow(fsrIndex: number[], sweepFsr: [number, number], lineOffsetsFsr: number[], sweepSamples = Infinity): { first: number; last: number } | null {
  const first = Math.min(...fsrIndex)
  const last = Math.max(...fsrIndex)
  // TEM00 stand inside the sweep, so their indices span no more FSRs than the calibrated sweep does, nor more than the
  // record can resolve; a reading whose indices claim more (a calibration gone non-monotonic) has nothing to count.
  const possible = Math.min(Math.abs(sweepFsr[1] - sweepFsr[0]) + 1, sweepSamples / MIN_SAMPLES_PER_FSR)
  if (last > first) return last - first <= possible ? { first, last } : null
  const margin = 0.01
  const lo = Math.min(...sweepFsr) + margin
  const hi = Math.max(...sweepFsr) - margin - 1
  if (!(hi >= lo)) return null
  const places = [0, ...lineOffsetsFsr].map((o) => o - Math.floor(o))
  const clearance = (x: number) => Math.min(...places.map((p) => Math.abs(circular(x - p))))
  let best = lo
  let bestClearance = clearance(lo)
  const steps = 200
  for (let k = 1; k <= steps; k++) {
    const x = lo + ((hi - lo) * k) / steps
    const c = clearance(x)
    if (c > bestClearance) {
      best = x
      bestClearance = c
    }
  }
  return { first: best, last: best + 1 }
}

function circular(d: number): number {
  return d - Math.round(d)
}
