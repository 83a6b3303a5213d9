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
  let sum = 0
  let count = 0
  let lo = 0
  let hi = -1
  for (let i = 0; i < n; i++) {
    const want1 = Math.min(n - 1, i + halfWidth)
    while (hi < want1) {
      hi++
      const v = values[hi]
      if (Number.isFinite(v)) { sum += v; count++ }
    }
    const want0 = i - halfWidth
    while (lo < want0) {
      const v = values[lo]
      if (Number.isFinite(v)) { sum -= v; count-- }
      lo++
    }
    out[i] = count > 0 ? sum / count : 0
  }
  return out
}
