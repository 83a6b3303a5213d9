import { EngineError } from '../errors'

export interface SweepSelection {
  /** First sample of the usable sweep (inclusive). */
  startIndex: number
  /** One past the last sample of the usable sweep. */
  endIndex: number
  /** Ramp slope over the chosen part; 'unknown' without a ramp. */
  rampDirection: 'rising' | 'falling' | 'unknown'
  /** How the part was chosen, in one sentence. */
  evidence: string
  /** Number of monotonic ramp segments seen (0 without a ramp). */
  segmentCount: number
}

export interface SelectSweepOptions {
  /** Hysteresis for turning points, as a fraction of the smoothed ramp's full range. @default 0.1 */
  turnFraction?: number
  /** Samples dropped on each side of a turning point (piezo settling). @default 0.005 × sampleCount */
  guardSamples?: number
  /** Index range chosen by the user (overrides detection). */
  range?: { startIndex: number; endIndex: number }
}

/**
 * Chooses the monotonic part of a swept trace from its ramp-monitor channel: the longest segment between
 * turning points of the smoothed ramp (a sawtooth's flyback and a triangle's turnaround are dropped; of a
 * triangle's two halves the longer is kept). Without a ramp the whole record is used.
 * Turning points are found with hysteresis so that 8-bit steps and noise on the ramp do not count (common practice).
 */
export function selectSweep(rampV: Float64Array | null, sampleCount: number, options: SelectSweepOptions = {}): SweepSelection {
  const {
    turnFraction = 0.1,
    guardSamples = Math.round(0.005 * sampleCount),
    range,
  } = options
  assertSampleCount(sampleCount)
  if (range) return userRange(range, sampleCount, rampV)
  if (!rampV) {
    return { startIndex: 0, endIndex: sampleCount, rampDirection: 'unknown', evidence: 'No ramp channel: the whole record is used.', segmentCount: 0 }
  }
  // The ramp is smoothed over ~1 % of the record; that scale allows working on block means of up to 1/8 of the
  // smoothing half-width, which keeps the passes short on long records (turning points to within one block).
  const half = Math.max(1, Math.round(sampleCount / 200))
  const block = Math.max(1, Math.floor(half / 8))
  const smooth = smoothRamp(blockMeans(rampV, block), Math.max(1, Math.round(half / block)))
  const blocks = smooth.length
  let lo = Infinity
  let hi = -Infinity
  for (let b = 0; b < blocks; b++) {
    const v = smooth[b]
    if (Number.isFinite(v)) {
      if (v < lo) lo = v
      if (v > hi) hi = v
    }
  }
  const span = hi - lo
  if (!(span > 0)) {
    return { startIndex: 0, endIndex: sampleCount, rampDirection: 'unknown', evidence: 'The ramp channel is constant: the whole record is used.', segmentCount: 0 }
  }
  const centre = (b: number) => Math.min(sampleCount - 1, b * block + ((Math.min(sampleCount, (b + 1) * block) - b * block - 1) >> 1))
  const blockOf = (i: number) => Math.min(blocks - 1, Math.floor(i / block))
  const turns = turningPoints(smooth, turnFraction * span).map(centre)
  const bounds = [0, ...turns, sampleCount - 1]
  let best = { start: 0, end: sampleCount, length: -1 }
  for (let k = 0; k + 1 < bounds.length; k++) {
    const start = k === 0 ? bounds[k] : bounds[k] + guardSamples
    const end = k + 2 === bounds.length ? bounds[k + 1] + 1 : bounds[k + 1] - guardSamples
    if (end - start > best.length) best = { start, end, length: end - start }
  }
  const rising = smooth[blockOf(Math.min(best.end - 1, sampleCount - 1))] > smooth[blockOf(best.start)]
  // A short reverse leg at either end of the record turns by less than the hysteresis: trim the segment to its
  // own extremes (the lowest point before it rises, the highest before it falls, for a rising ramp).
  const firstBlock = blockOf(best.start)
  const lastBlock = blockOf(best.end - 1)
  let lowBlock = firstBlock
  let highBlock = firstBlock
  for (let b = firstBlock; b <= lastBlock; b++) {
    const v = smooth[b]
    if (!Number.isFinite(v)) continue
    if (rising ? v < smooth[lowBlock] : v > smooth[lowBlock]) lowBlock = b
    if (rising ? v > smooth[highBlock] : v < smooth[highBlock]) highBlock = b
  }
  const lowIndex = lowBlock === firstBlock ? best.start : centre(lowBlock)
  const highIndex = highBlock === firstBlock ? best.start : centre(highBlock)
  if (highIndex < best.end - 1 - guardSamples) best.end = Math.max(best.start + 3, highIndex - guardSamples)
  if (lowIndex > best.start + guardSamples && lowIndex + guardSamples < best.end - 3) best.start = lowIndex + guardSamples
  best.length = best.end - best.start
  const segmentCount = bounds.length - 1
  return {
    startIndex: best.start,
    endIndex: best.end,
    rampDirection: rising ? 'rising' : 'falling',
    evidence:
      segmentCount === 1
        ? 'The ramp is monotonic over the whole record.'
        : `The ramp turns ${turns.length} time(s); the longest monotonic part (${best.length} of ${sampleCount} samples) is used.`,
    segmentCount,
  }
}

function assertSampleCount(sampleCount: number): void {
  if (!Number.isInteger(sampleCount) || sampleCount < 3) {
    throw new EngineError('too_few_samples', `A sweep needs at least 3 samples, got ${sampleCount}`)
  }
}

function userRange(range: { startIndex: number; endIndex: number }, sampleCount: number, rampV: Float64Array | null): SweepSelection {
  const startIndex = Math.max(0, Math.floor(range.startIndex))
  const endIndex = Math.min(sampleCount, Math.ceil(range.endIndex))
  if (!(endIndex - startIndex >= 3)) {
    throw new EngineError('invalid_sweep_part', `The chosen sweep part holds ${Math.max(0, endIndex - startIndex)} samples; it needs at least 3`)
  }
  let rampDirection: SweepSelection['rampDirection'] = 'unknown'
  if (rampV) rampDirection = rampV[endIndex - 1] >= rampV[startIndex] ? 'rising' : 'falling'
  return { startIndex, endIndex, rampDirection, evidence: 'The sweep part was chosen by the user.', segmentCount: 0 }
}

/** Mean of each block of `block` samples (NaN samples skipped; NaN for a block without a finite one). */
function blockMeans(rampV: Float64Array, block: number): Float64Array {
  const n = rampV.length
  if (block === 1) return rampV
  const out = new Float64Array(Math.ceil(n / block))
  for (let b = 0; b < out.length; b++) {
    let sum = 0
    let count = 0
    const end = Math.min(n, (b + 1) * block)
    for (let i = b * block; i < end; i++) {
      const v = rampV[i]
      if (v - v === 0) { sum += v; count++ }
    }
    out[b] = count > 0 ? sum / count : NaN
  }
  return out
}

/** Centred moving average over 2·half + 1 points (NaN points are skipped). */
function smoothRamp(rampV: Float64Array, half: number): Float64Array {
  const n = rampV.length
  const out = new Float64Array(n)
  let sum = 0
  let count = 0
  let lo = 0
  let hi = -1
  for (let i = 0; i < n; i++) {
    const want0 = Math.max(0, i - half)
    const want1 = Math.min(n - 1, i + half)
    while (hi < want1) {
      hi++
      if (Number.isFinite(rampV[hi])) { sum += rampV[hi]; count++ }
    }
    while (lo < want0) {
      if (Number.isFinite(rampV[lo])) { sum -= rampV[lo]; count-- }
      lo++
    }
    out[i] = count > 0 ? sum / count : NaN
  }
  return out
}

/** Indices of alternating extrema that differ from the previous one by more than `hysteresis`. */
function turningPoints(smooth: Float64Array, hysteresis: number): number[] {
  const turns: number[] = []
  let trend = 0
  let minIndex = 0
  let maxIndex = 0
  for (let i = 1; i < smooth.length; i++) {
    const v = smooth[i]
    if (!Number.isFinite(v)) continue
    if (v > smooth[maxIndex] || !Number.isFinite(smooth[maxIndex])) maxIndex = i
    if (v < smooth[minIndex] || !Number.isFinite(smooth[minIndex])) minIndex = i
    if (trend >= 0 && v < smooth[maxIndex] - hysteresis) {
      if (maxIndex > 0) turns.push(maxIndex)
      trend = -1
      minIndex = i
    } else if (trend <= 0 && v > smooth[minIndex] + hysteresis) {
      if (minIndex > 0) turns.push(minIndex)
      trend = 1
      maxIndex = i
    }
  }
  return turns
}
