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
}

/**
 * Dark level of a transmission record: per block, the median of the samples left after iteratively
 * removing those more than `clipSigma`·σ above the current median (sigma clipping, common practice).
 * The mean of what remains, taken symmetrically about that median, is an unbiased level for symmetric noise,
 * unlike a low quantile.
 */
export function estimateBaseline(values: Float64Array, sigmaV: number, options: EstimateBaselineOptions = {}): BaselineEstimate {
  const { blockCount = 16, clipSigma = 3, followDrift = true } = options
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
    levels.push(clippedMedian(scratch.subarray(0, count).sort(), sigmaV, clipSigma))
    centres.push((i0 + i1 - 1) / 2)
  }
  const finiteLevels = levels.filter(Number.isFinite)
  if (finiteLevels.length === 0) throw new EngineError('no_numeric_data', 'The transmission channel holds no finite values')
  const darkLevelV = median(finiteLevels.slice())
  for (let b = 0; b < levels.length; b++) if (!Number.isFinite(levels[b])) levels[b] = darkLevelV
  const baselineV = interpolateLevels(levels, centres, n)
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

function clippedMedian(sample: Float64Array, sigmaV: number, clipSigma: number): number {
  if (sample.length === 0) return NaN
  let level = sample[Math.floor(sample.length / 2)]
  let count = sample.length
  for (let iteration = 0; iteration < 8; iteration++) {
    const limit = level + clipSigma * sigmaV
    let k = count
    while (k > 1 && sample[k - 1] > limit) k--
    const next = sample[Math.floor(k / 2)]
    if (next === level && k === count) break
    level = next
    count = k
  }
  // Mean of the samples symmetric about the median: resolves levels finer than an 8-bit step.
  const half = Math.max(clipSigma * sigmaV, 1e-300)
  let sum = 0
  let used = 0
  for (let i = 0; i < count; i++) {
    if (Math.abs(sample[i] - level) <= half) { sum += sample[i]; used++ }
  }
  return used > 0 ? sum / used : level
}

function median(values: number[]): number {
  values.sort((a, b) => a - b)
  const m = values.length >> 1
  return values.length % 2 ? values[m] : (values[m - 1] + values[m]) / 2
}
