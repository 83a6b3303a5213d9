import { EngineError } from '../errors'

export interface NoiseEstimate {
  /** Robust white-noise standard deviation of one sample, volts; never below the digitiser's q/√12. */
  sigmaV: number
  /** The digitiser step found in the data (one code), volts; 0 when the samples sit on no common grid. */
  quantumV: number
}

export interface EstimateNoiseOptions {
  /** Use every `stride`-th first difference (speed on long records; each one is still a true neighbour difference). @default ceil(n / 65536) */
  stride?: number
}

/** At most this many nonzero differences are looked at to find the digitiser step. */
const QUANTUM_SAMPLE = 4096
/** Fewer nonzero differences than this cannot show a grid: chance alignment is then too likely. */
const QUANTUM_MIN_DIFFS = 20
/** A difference is on the grid when it lies within this fraction of a step of a whole number (≥ 1) of steps. */
const QUANTUM_TOLERANCE = 0.15
/** Share of nonzero differences that must lie on the grid. */
const QUANTUM_ON_GRID = 0.9
/** The step is looked for as the lower-decile difference divided by 1, 2, … up to this (codes skipped on steep flanks). */
const QUANTUM_MAX_DIVISOR = 64

/**
 * White-noise level from the median absolute first difference: σ = 1.4826·MAD(Δy)/√2 (common practice;
 * the MAD scale factor is that of a normal distribution, Hampel, J. Am. Stat. Assoc. 69, 383 (1974)).
 * Peaks are sparse, so they barely move the median. The median comes from a selection in linear time (Hoare's
 * FIND, Commun. ACM 4, 321 (1961)) over at most 65,536 differences: no sort, and its sampling error stays under 1 %.
 * On a digitiser grid of step q the differences are whole numbers of steps: the median is then interpolated inside
 * its step (the grouped-data median, common practice), and σ is never below the quantisation noise q/√12 (Bennett,
 * Bell Syst. Tech. J. 27, 446 (1948); Widrow & Kollár, "Quantization Noise" (2008)), even when a quiet baseline
 * sits on one code and every difference off the peaks is 0.
 */
export function estimateNoise(values: Float64Array, options: EstimateNoiseOptions = {}): NoiseEstimate {
  const n = values.length
  const { stride = Math.max(1, Math.ceil(n / 65_536)) } = options
  if (n < 3) throw new EngineError('too_few_samples', `Noise needs at least 3 samples, got ${n}`)
  if (!Number.isInteger(stride) || stride < 1) throw new EngineError('invalid_argument', `stride must be a positive integer, got ${String(stride)}`)
  const diffs = new Float64Array(Math.ceil((n - 1) / stride))
  let count = 0
  for (let i = 1; i < n; i += stride) {
    const d = Math.abs(values[i] - values[i - 1])
    if (!(d < Infinity)) continue
    diffs[count++] = d
  }
  if (count === 0) throw new EngineError('no_numeric_data', 'The transmission channel holds no finite values')
  const used = diffs.subarray(0, count)
  // The step first: the selection below reorders the differences.
  const quantumV = digitiserStep(used)
  const middle = count >> 1
  const mad = selectKth(used, middle)
  const spread = quantumV > 0 ? groupedMedian(used, mad, quantumV, middle) : mad
  const sigmaV = Math.max((1.4826 * spread) / Math.SQRT2, quantumV / Math.sqrt(12))
  return { sigmaV, quantumV }
}

/**
 * The digitiser step: the largest q such that nine in ten nonzero differences are whole multiples of it. Tried as the
 * lower-decile difference over 1, 2, 3, …: robust to a few off-grid samples (a glitch, an edited value) and to
 * codes skipped on steep flanks; then refined as Σd / Σk over the differences on the grid (which also averages
 * out the rounding of printed values). 0 when no grid fits (unquantised data, or noise of many codes).
 */
function digitiserStep(diffs: Float64Array): number {
  let nonzero = 0
  for (let i = 0; i < diffs.length; i++) if (diffs[i] > 0) nonzero++
  if (nonzero < QUANTUM_MIN_DIFFS) return 0
  const step = Math.max(1, Math.floor(nonzero / QUANTUM_SAMPLE))
  const sample = new Float64Array(Math.ceil(nonzero / step))
  let seen = 0
  let m = 0
  for (let i = 0; i < diffs.length; i++) {
    if (!(diffs[i] > 0)) continue
    if (seen++ % step === 0) sample[m++] = diffs[i]
  }
  const d = sample.subarray(0, m).sort()
  const base = d[Math.floor(0.1 * m)]
  for (let divisor = 1; divisor <= QUANTUM_MAX_DIVISOR; divisor++) {
    const q = base / divisor
    let onGrid = 0
    let sumD = 0
    let sumK = 0
    for (let i = 0; i < m; i++) {
      const k = Math.round(d[i] / q)
      if (k >= 1 && Math.abs(d[i] / q - k) < QUANTUM_TOLERANCE) {
        onGrid++
        sumD += d[i]
        sumK += k
      }
    }
    if (onGrid >= QUANTUM_ON_GRID * m) return sumD / sumK
  }
  return 0
}

/**
 * Median of differences that are whole numbers of steps q, interpolated inside its step: with k = mad/q, the class
 * [(k − ½)q, (k + ½)q) (from 0 for k = 0) is taken as evenly filled. Without it the median jumps between 0 and q as
 * the noise passes about half a step.
 */
function groupedMedian(diffs: Float64Array, mad: number, q: number, middle: number): number {
  const k = Math.round(mad / q)
  const lower = Math.max(0, (k - 0.5) * q)
  const upper = (k + 0.5) * q
  let below = 0
  let inside = 0
  for (let i = 0; i < diffs.length; i++) {
    const v = diffs[i]
    if (v < lower) below++
    else if (v < upper) inside++
  }
  if (inside === 0) return mad
  return lower + ((middle + 0.5 - below) / inside) * (upper - lower)
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
