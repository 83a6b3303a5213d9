import { EngineError } from '../errors'

export interface NoiseEstimate {
  /** Robust white-noise standard deviation of one sample, volts. */
  sigmaV: number
  /** Smallest step between sample values (digitiser resolution), volts; 0 when not quantised. */
  quantumV: number
}

export interface EstimateNoiseOptions {
  /** Use every `stride`-th first difference (speed on long records; each one is still a true neighbour difference). @default ceil(n / 65536) */
  stride?: number
}

/**
 * White-noise level from the median absolute first difference: σ = 1.4826·MAD(Δy)/√2 (common practice;
 * the MAD scale factor is that of a normal distribution, Hampel, J. Am. Stat. Assoc. 69, 383 (1974)).
 * Peaks are sparse, so they barely move the median. Never below the digitiser's quantisation noise q/√12.
 * The median comes from a selection in linear time (Hoare's FIND, Commun. ACM 4, 321 (1961)) over at most
 * 65,536 differences: no sort, and the sampling error of the median stays under 1 %.
 */
export function estimateNoise(values: Float64Array, options: EstimateNoiseOptions = {}): NoiseEstimate {
  const n = values.length
  const { stride = Math.max(1, Math.ceil(n / 65_536)) } = options
  if (n < 3) throw new EngineError('too_few_samples', `Noise needs at least 3 samples, got ${n}`)
  if (!Number.isInteger(stride) || stride < 1) throw new EngineError('invalid_argument', `stride must be a positive integer, got ${String(stride)}`)
  const diffs = new Float64Array(Math.ceil((n - 1) / stride))
  let count = 0
  let quantumV = Infinity
  for (let i = 1; i < n; i += stride) {
    const d = Math.abs(values[i] - values[i - 1])
    if (!(d < Infinity)) continue
    diffs[count++] = d
    if (d > 0 && d < quantumV) quantumV = d
  }
  if (count === 0) throw new EngineError('no_numeric_data', 'The transmission channel holds no finite values')
  const used = diffs.subarray(0, count)
  // Only call it quantised when the steps are a sizeable part of the spread (8-bit records); probe before the
  // selection reorders the differences.
  if (!Number.isFinite(quantumV)) quantumV = 0
  const quantised = quantumV > 0 && isQuantised(used, quantumV)
  const mad = selectKth(used, count >> 1)
  const sigmaFromDiffs = (1.4826 * mad) / Math.SQRT2
  const sigmaV = Math.max(sigmaFromDiffs, quantised ? quantumV / Math.sqrt(12) : 0)
  return { sigmaV, quantumV: quantised ? quantumV : 0 }
}

function isQuantised(diffs: Float64Array, quantumV: number): boolean {
  const step = Math.max(1, Math.floor(diffs.length / 2000))
  let onGrid = 0
  let count = 0
  for (let i = 0; i < diffs.length; i += step) {
    const r = diffs[i] / quantumV
    if (Math.abs(r - Math.round(r)) < 1e-3) onGrid++
    count++
  }
  return onGrid / count > 0.95
}

/** k-th smallest value (0-based), reordering `a` in place: Hoare's selection with a median-of-three pivot. */
function selectKth(a: Float64Array, k: number): number {
  let lo = 0
  let hi = a.length - 1
  while (hi > lo) {
    const mid = (lo + hi) >> 1
    // Median of three as the pivot: keeps sorted or quantised input from the quadratic worst case.
    const x = a[lo]
    const y = a[mid]
    const z = a[hi]
    const pivot = x < y ? (y < z ? y : x < z ? z : x) : x < z ? x : y < z ? z : y
    let i = lo
    let j = hi
    while (i <= j) {
      while (a[i] < pivot) i++
      while (a[j] > pivot) j--
      if (i <= j) {
        const t = a[i]
        a[i] = a[j]
        a[j] = t
        i++
        j--
      }
    }
    if (k <= j) hi = j
    else if (k >= i) lo = i
    else return a[k]
  }
  return a[k]
}
