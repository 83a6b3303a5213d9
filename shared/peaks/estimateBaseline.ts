import { EngineError } from '../errors'

export interface BaselineEstimate {
  /** Baseline per sample of the part, volts (piecewise linear through block levels: follows slow drift). */
  baselineV: Float64Array
  /** Median dark level over the part, volts. */
  darkLevelV: number
}

export interface EstimateBaselineOptions {
  /** Number of blocks the part is split into for slow drift. @default 16 */
  blockCount?: number
  /** Samples more than this many σ above the running level are treated as light, not baseline. @default 3 */
  clipSigma?: number
  /** Follow slow drift block by block (false: one constant level). @default true */
  followDrift?: boolean
  /**
   * Block levels that differ by less than this many σ are taken as one constant level: their differences are then
   * the resonance wings' share in each block, not drift, and following them would bend the lines' wings. @default 4
   */
  minDriftSigma?: number
  /**
   * Digitiser step, volts (0: not quantised). When the noise stays within a step, the level is read from how the
   * samples share the codes rather than from a Gaussian band. @default 0
   */
  quantumV?: number
}

/**
 * Dark level of a transmission record: per block, the median of the samples left after iteratively
 * removing those more than `clipSigma`·σ above the current median (sigma clipping, common practice).
 * The mean of what remains, taken symmetrically about that median, is an unbiased level for symmetric noise,
 * unlike a low quantile.
 */
export function estimateBaseline(values: Float64Array, sigmaV: number, options: EstimateBaselineOptions = {}): BaselineEstimate {
  const { blockCount = 16, clipSigma = 3, followDrift = true, minDriftSigma = 4, quantumV = 0 } = options
  const n = values.length
  if (n < 3) throw new EngineError('too_few_samples', `A baseline needs at least 3 samples, got ${n}`)
  if (!(sigmaV >= 0)) throw new EngineError('invalid_argument', `sigmaV must be a non-negative number, got ${sigmaV}`)
  const blocks = followDrift ? Math.max(1, Math.min(blockCount, Math.floor(n / 64))) : 1
  const stride = Math.max(1, Math.floor(n / blocks / 1500))
  const scratch = new Float64Array(Math.ceil(Math.ceil(n / blocks + 1) / stride) + 1)
  const levels: number[] = []
  const centres: number[] = []
  for (let b = 0; b < blocks; b++) {
    const i0 = Math.floor((b * n) / blocks)
    const i1 = Math.floor(((b + 1) * n) / blocks)
    let count = 0
    for (let i = i0; i < i1; i += stride) if (Number.isFinite(values[i])) scratch[count++] = values[i]
    // Native numeric sort of a typed array: no comparator calls, no boxed numbers.
    levels.push(clippedMedian(scratch.subarray(0, count).sort(), sigmaV, clipSigma, quantumV))
    centres.push((i0 + i1 - 1) / 2)
  }
  const finiteLevels = levels.filter(Number.isFinite)
  if (finiteLevels.length === 0) throw new EngineError('no_numeric_data', 'The transmission channel holds no finite values')
  const darkLevelV = median(finiteLevels.slice())
  for (let b = 0; b < levels.length; b++) if (!Number.isFinite(levels[b])) levels[b] = darkLevelV
  const spread = Math.max(...levels) - Math.min(...levels)
  const baselineV = spread < minDriftSigma * sigmaV ? new Float64Array(n).fill(darkLevelV) : interpolateLevels(levels, centres, n)
  return { baselineV, darkLevelV }
}

/** `sample` sorted ascending. */
/** Piecewise-linear level through the block centres, held flat beyond the first and last. */
function interpolateLevels(levels: number[], centres: number[], n: number): Float64Array {
  const baselineV = new Float64Array(n)
  if (levels.length === 1) return baselineV.fill(levels[0])
  let b = 0
  for (let i = 0; i < n; i++) {
    while (b + 2 < centres.length && i > centres[b + 1]) b++
    const f = Math.min(1, Math.max(0, (i - centres[b]) / (centres[b + 1] - centres[b])))
    baselineV[i] = levels[b] + f * (levels[b + 1] - levels[b])
  }
  return baselineV
}

function clippedMedian(sample: Float64Array, sigmaV: number, clipSigma: number, quantumV: number): number {
  if (sample.length === 0) return NaN
  let level = sample[Math.floor(sample.length / 2)]
  let count = sample.length
  // On a coarse grid the clip keeps the code above the median: noise of a fraction of a step fills it.
  const reach = Math.max(clipSigma * sigmaV, 1.5 * quantumV)
  for (let iteration = 0; iteration < 8; iteration++) {
    const limit = level + reach
    let k = count
    while (k > 1 && sample[k - 1] > limit) k--
    const next = sample[Math.floor(k / 2)]
    if (next === level && k === count) break
    level = next
    count = k
  }
  if (quantumV > 0 && sigmaV < quantumV) return groupedLevel(sample.subarray(0, count), level, quantumV)
  // Mean of the samples within clipSigma·σ below the median (those equal to it counted half), moved up by the
  // mean distance of that band for Gaussian noise, σ(φ(0) − φ(k))/(Φ(0) − Φ(−k)): resolves levels finer than an
  // 8-bit step, and, unlike a band about the median, it holds no resonance wings (they lie above the dark level),
  // so block levels do not follow the wings' share of each block.
  const band = Math.max(clipSigma * sigmaV, 1e-300)
  let sum = 0
  let used = 0
  for (let i = 0; i < count; i++) {
    const d = level - sample[i]
    if (d < 0 || d > band) continue
    const w = d === 0 ? 0.5 : 1
    sum += w * sample[i]
    used += w
  }
  if (!(used > 0) || !(sigmaV > 0)) return level
  const k = clipSigma
  const phi = (x: number) => Math.exp(-0.5 * x * x) / Math.sqrt(2 * Math.PI)
  const lowerBandMean = (phi(0) - phi(k)) / (0.5 - normalTail(k))
  return sum / used + lowerBandMean * sigmaV
}

/**
 * Level of samples on a grid of step q whose noise stays within about a step: the median interpolated inside its code,
 * c − q/2 + q·(n/2 − below)/inside, the grouped-data median (common practice). A quiet baseline all on one code reads
 * as that code (where it lies within the step cannot be known without noise to dither it, Widrow & Kollár,
 * "Quantization Noise" (2008), ch. 2); noise of a fraction of a step moves it by the share of samples on either
 * neighbour. The Gaussian band below would read a code as about 0.8σ higher.
 */
function groupedLevel(sample: Float64Array, code: number, q: number): number {
  const lower = code - q / 2
  const upper = code + q / 2
  let below = 0
  let inside = 0
  for (let i = 0; i < sample.length; i++) {
    if (sample[i] < lower) below++
    else if (sample[i] < upper) inside++
  }
  return inside > 0 ? lower + (q * (sample.length / 2 - below)) / inside : code
}

/** Upper tail of the standard normal, Q(x) for x ≥ 0 (Abramowitz & Stegun 26.2.17, error < 7.5e-8). */
function normalTail(x: number): number {
  const t = 1 / (1 + 0.2316419 * x)
  const poly = t * (0.31938153 + t * (-0.356563782 + t * (1.781477937 + t * (-1.821255978 + t * 1.330274429))))
  return (Math.exp(-0.5 * x * x) / Math.sqrt(2 * Math.PI)) * poly
}

function median(values: number[]): number {
  values.sort((a, b) => a - b)
  const m = values.length >> 1
  return values.length % 2 ? values[m] : (values[m - 1] + values[m]) / 2
}
