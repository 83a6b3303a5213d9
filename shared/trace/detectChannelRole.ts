import type { ChannelRole } from './types'

export interface ChannelRoleGuess {
  role: ChannelRole
  /** One sentence with the measured features behind the choice. */
  evidence: string
}

export interface DetectChannelRoleOptions {
  /** Segments (along time) for the slow-trend average. @default 64 */
  segments?: number
  /** Share of variance the slow trend must explain for a ramp. @default 0.9 */
  smoothShareForRamp?: number
  /** Share of samples in the lowest (highest) quarter of the range for transmission (reflection). @default 0.6 */
  baselineShare?: number
}

/**
 * Guess what a channel records from the signal alone (common practice in swept-cavity work, no published rule):
 * a ramp monitor is smooth — a coarse segment average explains nearly all its variance — and spreads over its
 * range; transmission sits on a low baseline with narrow positive resonances; reflection sits high with dips.
 */
export function detectChannelRole(values: Float64Array, options: DetectChannelRoleOptions = {}): ChannelRoleGuess {
  const { segments = 64, smoothShareForRamp = 0.9, baselineShare = 0.6 } = options
  const n = values.length
  let finite = 0
  let min = Infinity
  let max = -Infinity
  let sum = 0
  for (let i = 0; i < n; i++) {
    const v = values[i]
    if (!Number.isFinite(v)) continue
    finite++
    sum += v
    if (v < min) min = v
    if (v > max) max = v
  }
  if (finite < 16) return { role: 'unknown', evidence: `Only ${finite} finite samples: too few to tell what the channel records.` }
  const range = max - min
  if (!(range > 0)) return { role: 'unknown', evidence: `The channel is constant at ${min}: it carries no signal to classify.` }
  const mean = sum / finite

  // Where the samples sit within the range (ten levels), and how much variance a segment average explains.
  const levels = new Float64Array(10)
  const segmentCount = Math.max(1, Math.min(segments, Math.floor(n / 4)))
  const levelScale = 10 / range
  let totalSquares = 0
  let residualSquares = 0
  for (let s = 0; s < segmentCount; s++) {
    const from = Math.floor((s * n) / segmentCount)
    const to = Math.floor(((s + 1) * n) / segmentCount)
    let segmentSum = 0
    let segmentN = 0
    for (let i = from; i < to; i++) {
      const v = values[i]
      if (v !== v) continue // NaN
      segmentSum += v
      segmentN++
      const level = ((v - min) * levelScale) | 0
      levels[level > 9 ? 9 : level]++
      totalSquares += (v - mean) * (v - mean)
    }
    if (segmentN === 0) continue
    const segmentMean = segmentSum / segmentN
    for (let i = from; i < to; i++) {
      const d = values[i] - segmentMean
      if (d === d) residualSquares += d * d
    }
  }
  const smoothShare = totalSquares > 0 ? 1 - residualSquares / totalSquares : 0
  const lowShare = (levels[0] + levels[1] + levels[2] * 0.5) / finite
  const highShare = (levels[9] + levels[8] + levels[7] * 0.5) / finite
  const occupied = levels.filter((count) => count >= 0.02 * finite).length
  const pct = (share: number): string => `${Math.round(share * 100)} %`
  const features = `a ${segmentCount}-segment average explains ${pct(smoothShare)} of the variance, values fill ${occupied} of 10 levels`

  if (smoothShare >= smoothShareForRamp && occupied >= 5) {
    return { role: 'ramp', evidence: `Smooth and spread over its range (${features}): a ramp monitor.` }
  }
  if (lowShare >= baselineShare && smoothShare < smoothShareForRamp) {
    return {
      role: 'transmission',
      evidence: `Low baseline with narrow positive peaks (${pct(lowShare)} of samples in the lowest quarter of the range, peaks up to ${max.toPrecision(3)}; ${features}): transmitted light.`,
    }
  }
  if (highShare >= baselineShare && smoothShare < smoothShareForRamp) {
    return {
      role: 'reflection',
      evidence: `High level with narrow dips (${pct(highShare)} of samples in the top quarter of the range, dips down to ${min.toPrecision(3)}; ${features}): reflected light.`,
    }
  }
  return {
    role: 'unknown',
    evidence: `Neither a smooth ramp nor a baseline with narrow peaks or dips (${features}).`,
  }
}
