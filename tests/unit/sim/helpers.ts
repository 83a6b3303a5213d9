/** Small tools for the generator's tests (no physics here: just reading a sampled trace, or catching a refusal). */

import { isEngineError } from '../../../shared/errors'
import { generateSweptTrace, type SweptTraceOptions } from '../../../shared/sim'

/** The code and message of the EngineError that `generateSweptTrace(options)` throws; fails the test if it does not. */
export function errorOf(options: SweptTraceOptions): { code: string; message: string } {
  try {
    generateSweptTrace(options)
  } catch (error) {
    if (isEngineError(error)) return { code: error.code, message: error.message }
    throw error
  }
  throw new Error('expected an EngineError')
}

/** Index of the sample nearest to time t. */
export function indexAt(tSeconds: Float64Array, t: number): number {
  const dt = tSeconds[1] - tSeconds[0]
  return Math.min(tSeconds.length - 1, Math.max(0, Math.round((t - tSeconds[0]) / dt)))
}

/** Index of the largest value in [from, to). */
export function argMax(values: Float64Array, from: number, to: number): number {
  let best = from
  for (let i = from; i < to; i++) if (values[i] > values[best]) best = i
  return best
}

/** Vertex of the parabola through the maximum and its two neighbours, as a time. */
export function refinedPeakTime(tSeconds: Float64Array, values: Float64Array, peakIndex: number): number {
  const a = values[peakIndex - 1]
  const b = values[peakIndex]
  const c = values[peakIndex + 1]
  const shift = (0.5 * (a - c)) / (a - 2 * b + c)
  return tSeconds[peakIndex] + shift * (tSeconds[1] - tSeconds[0])
}

/** Full width at half of (max − base), by linear interpolation of the two half-level crossings, in seconds. */
export function fullWidthAtHalfMaximum(tSeconds: Float64Array, values: Float64Array, peakIndex: number, baseV = 0): number {
  const half = baseV + (values[peakIndex] - baseV) / 2
  let left = peakIndex
  while (values[left - 1] > half) left--
  let right = peakIndex
  while (values[right + 1] > half) right++
  const dt = tSeconds[1] - tSeconds[0]
  const leftT = tSeconds[left - 1] + ((half - values[left - 1]) / (values[left] - values[left - 1])) * dt
  const rightT = tSeconds[right] + ((values[right] - half) / (values[right] - values[right + 1])) * dt
  return rightT - leftT
}

/** Sum of values × dt over [from, to). */
export function areaBetween(values: Float64Array, dt: number, from: number, to: number): number {
  let sum = 0
  for (let i = from; i < to; i++) sum += values[i]
  return sum * dt
}

/** Strict local maxima in (from, to) that rise at least `minRiseV` above the lower of the neighbouring minima. */
export function countLocalMaxima(values: Float64Array, from: number, to: number, minRiseV: number): number {
  let count = 0
  let lastMin = values[from]
  let candidate: number | null = null
  for (let i = from + 1; i < to - 1; i++) {
    if (values[i] > values[i - 1] && values[i] >= values[i + 1]) candidate = values[i]
    if (values[i] < values[i - 1] && values[i] <= values[i + 1]) {
      if (candidate !== null && candidate - Math.max(lastMin, values[i]) >= minRiseV) count++
      candidate = null
      lastMin = values[i]
    }
  }
  return count
}

/** Amplitude of the component at `frequencyHz`: single-bin DFT of the linearly detrended stretch with a Hann window. */
export function amplitudeAt(values: Float64Array, dt: number, from: number, to: number, frequencyHz: number): number {
  const n = to - from
  // Least-squares line through the stretch, so the slope of a peak does not leak into the bin.
  let sx = 0
  let sy = 0
  let sxx = 0
  let sxy = 0
  for (let k = 0; k < n; k++) {
    sx += k
    sy += values[from + k]
    sxx += k * k
    sxy += k * values[from + k]
  }
  const slope = (n * sxy - sx * sy) / (n * sxx - sx * sx)
  const intercept = (sy - slope * sx) / n
  let re = 0
  let im = 0
  let weightSum = 0
  for (let k = 0; k < n; k++) {
    const w = 0.5 - 0.5 * Math.cos((2 * Math.PI * k) / (n - 1))
    const residual = values[from + k] - (intercept + slope * k)
    const phase = 2 * Math.PI * frequencyHz * k * dt
    re += w * residual * Math.cos(phase)
    im -= w * residual * Math.sin(phase)
    weightSum += w
  }
  return (2 * Math.hypot(re, im)) / weightSum
}
