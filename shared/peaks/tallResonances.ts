import { median } from '../numbers'
import { findResonances } from './findResonances'

/** A tall resonance measured from its half-maximum crossings. */
export interface TallResonance {
  centerIndex: number
  heightV: number
  fwhmSamples: number
}

/**
 * A laser-frequency dither of about a linewidth or more, faster than the sweep crosses a linewidth, breaks each
 * resonance into a train of spikes, one or two per dither period, which the search finds one by one. Such trains
 * show as gaps of two sizes: short ones inside a train, long ones between resonances. When the sorted gaps jump
 * by 4× or more and the groups below the jump hold four or more spikes each (a carrier with two sidebands makes
 * three), each group is one resonance: its centre the height-weighted mean, its width its extent. Null when the
 * tall resonances are no such trains.
 */
function mergeSpikeTrains(tall: TallResonance[]): TallResonance[] | null {
  if (tall.length < 8) return null
  const gaps = tall.slice(1).map((t, k) => t.centerIndex - tall[k].centerIndex)
  const sorted = gaps.slice().sort((a, b) => a - b)
  let jump = 0
  let at = -1
  for (let k = 2; k + 1 < sorted.length; k++) {
    const ratio = sorted[k + 1] / Math.max(sorted[k], 1e-9)
    if (ratio > jump) {
      jump = ratio
      at = k
    }
  }
  if (jump < 4 || at < 0) return null
  const limit = Math.sqrt(sorted[at] * sorted[at + 1])
  const groups: TallResonance[][] = [[tall[0]]]
  for (let k = 1; k < tall.length; k++) {
    if (gaps[k - 1] < limit) groups[groups.length - 1].push(tall[k])
    else groups.push([tall[k]])
  }
  const sizes = groups.map((g) => g.length).sort((a, b) => a - b)
  if (sizes[sizes.length >> 1] < 4) return null
  return groups.map((g) => {
    const weight = g.reduce((sum, t) => sum + t.heightV, 0)
    const width = median(g.map((t) => t.fwhmSamples))
    return {
      centerIndex: g.reduce((sum, t) => sum + t.heightV * t.centerIndex, 0) / weight,
      heightV: Math.max(...g.map((t) => t.heightV)),
      fwhmSamples: g[g.length - 1].centerIndex - g[0].centerIndex + width,
    }
  })
}

/**
 * The tallest resonances (at least a fifth of the highest sample), each measured between its half-maximum crossings
 * on the raw samples: enough for the TEM00 comb and its width, whatever the sampling (a slope shallower than the
 * noise cannot stop a walk to half height, unlike a walk to the valleys).
 */
export function tallResonances(signal: Float64Array, sigmaV: number): TallResonance[] & { spikeTrains?: boolean } {
  const found = singleTallResonances(signal, sigmaV)
  const merged = mergeSpikeTrains(found)
  return merged ? Object.assign(merged, { spikeTrains: true }) : found
}

function singleTallResonances(signal: Float64Array, sigmaV: number): TallResonance[] {
  let top = 0
  for (let i = 0; i < signal.length; i++) if (signal[i] > top) top = signal[i]
  const threshold = Math.max(Math.max(5, Math.sqrt(2 * Math.log(Math.max(signal.length, 2))) + 1), (0.2 * top) / sigmaV)
  const found = findResonances(signal, sigmaV, { thresholdSigma: threshold })
  return found.map((c) => {
    const half = c.maxV / 2
    let a = c.peakIndex
    while (a > 0 && signal[a - 1] > half) a--
    let b = c.peakIndex
    while (b + 1 < signal.length && signal[b + 1] > half) b++
    // Interpolated crossings on each side.
    const left = a > 0 ? a - (signal[a] - half) / (signal[a] - signal[a - 1] || 1) : a
    const right = b + 1 < signal.length ? b + (signal[b] - half) / (signal[b] - signal[b + 1] || 1) : b
    return { centerIndex: (left + right) / 2, heightV: c.maxV, fwhmSamples: Math.max(0.5, right - left) }
  })
}

export function rawMax(signal: Float64Array, index: number, reach: number): number {
  let top = -Infinity
  for (let i = Math.max(0, index - reach); i <= Math.min(signal.length - 1, index + reach); i++) if (signal[i] > top) top = signal[i]
  return top
}
