import { EngineError } from '../errors'

export interface NoiseEstimate {
  /** Robust white-noise standard deviation of one sample, volts. */
  sigmaV: number
  /** Smallest step between sample values (digitiser resolution), volts; 0 when not quantised. */
  quantumV: number
}

export interface EstimateNoiseOptions {
  /** Use every `stride`-th difference (speed on long records). @default ceil(n / 200000) */
  stride?: number
}

/**
 * White-noise level from the median absolute first difference: σ = 1.4826·MAD(Δy)/√2 (common practice;
 * the MAD scale factor is that of a normal distribution, Hampel, J. Am. Stat. Assoc. 69, 383 (1974)).
 * Peaks are sparse, so they barely move the median. Never below the digitiser's quantisation noise q/√12.
 */
export function estimateNoise(values: Float64Array, options: EstimateNoiseOptions = {}): NoiseEstimate {
  const n = values.length
  const { stride = Math.max(1, Math.ceil(n / 200_000)) } = options
  if (n < 3) throw new EngineError('too_few_samples', `Noise needs at least 3 samples, got ${n}`)
  const diffs: number[] = []
  let quantumV = Infinity
  for (let i = 1; i < n; i += stride) {
    const d = Math.abs(values[i] - values[i - 1])
    if (!Number.isFinite(d)) continue
    diffs.push(d)
    if (d > 0 && d < quantumV) quantumV = d
  }
  if (diffs.length === 0) throw new EngineError('no_numeric_data', 'The transmission channel holds no finite values')
  diffs.sort((a, b) => a - b)
  const mad = diffs[Math.floor(diffs.length / 2)]
  if (!Number.isFinite(quantumV)) quantumV = 0
  // Only call it quantised when the steps are a sizeable part of the spread (8-bit records).
  const quantised = quantumV > 0 && isQuantised(diffs, quantumV)
  const sigmaFromDiffs = (1.4826 * mad) / Math.SQRT2
  const sigmaV = Math.max(sigmaFromDiffs, quantised ? quantumV / Math.sqrt(12) : 0)
  return { sigmaV, quantumV: quantised ? quantumV : 0 }
}

function isQuantised(sortedDiffs: number[], quantumV: number): boolean {
  const probe = sortedDiffs.length > 2000 ? 2000 : sortedDiffs.length
  const step = Math.max(1, Math.floor(sortedDiffs.length / probe))
  let onGrid = 0
  let count = 0
  for (let i = 0; i < sortedDiffs.length; i += step) {
    const r = sortedDiffs[i] / quantumV
    if (Math.abs(r - Math.round(r)) < 1e-3) onGrid++
    count++
  }
  return onGrid / count > 0.95
}
