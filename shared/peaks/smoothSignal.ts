import { EngineError } from '../errors'

export interface SmoothSignalOptions {
  /** Half-width of the centred moving average, in samples (0 returns a copy). @default 1 */
  halfWidth?: number
}

/**
 * Centred moving average over 2·halfWidth + 1 samples (shorter at the ends), NaN samples skipped: a boxcar
 * smoothing at the resonance's own scale raises a peak's signal-to-noise by about √(2·halfWidth + 1) before
 * thresholding, as a matched filter does for a known width (common practice; Press et al., "Numerical Recipes",
 * §14.8 on smoothing).
 */
export function smoothSignal(values: Float64Array, options: SmoothSignalOptions = {}): Float64Array {
  const { halfWidth = 1 } = options
  if (!Number.isInteger(halfWidth) || halfWidth < 0) {
    throw new EngineError('invalid_argument', `halfWidth must be a non-negative integer, got ${String(halfWidth)}`)
  }
  const n = values.length
  const out = new Float64Array(n)
  if (halfWidth === 0) {
    for (let i = 0; i < n; i++) out[i] = Number.isFinite(values[i]) ? values[i] : 0
    return out
  }
  // Running sum: each step adds the sample entering the window and drops the one leaving it.
  let sum = 0
  let count = 0
  for (let k = 0; k < Math.min(n, halfWidth); k++) {
    const v = values[k]
    if (v - v === 0) { sum += v; count++ }
  }
  for (let i = 0; i < n; i++) {
    const entering = i + halfWidth
    if (entering < n) {
      const v = values[entering]
      if (v - v === 0) { sum += v; count++ }
    }
    const leaving = i - halfWidth - 1
    if (leaving >= 0) {
      const v = values[leaving]
      if (v - v === 0) { sum -= v; count-- }
    }
    out[i] = count > 0 ? sum / count : 0
  }
  return out
}
