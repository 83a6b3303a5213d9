import { transverseOffsetFsr } from '../cavity'
import type { FundamentalComb, PeakPosition } from './findFundamentals'

export interface LadderReadingOptions {
  /** Transverse orders that may be seen (degenerate families' lowest members). @default [0, 1, 2, 3] */
  allowedOrders?: number[]
  /** Each comb member must be at most this fraction of the one before it (from the tallest end). @default 0.6 */
  maxStepRatio?: number
  /** Half-width of a position match, in samples. @default 0.03 of the comb spacing */
  toleranceSamples?: number
}

/**
 * How a candidate TEM00 comb is best read: as a comb, or as ONE TEM00 followed by its transverse orders 1, 2, … (a
 * ladder), or 'either' when a comb of two and nothing else fits both equally. Orders N sit
 * at N·ψ/π FSR (mod 1) (Siegman, "Lasers" (1986), ch. 19), so consecutive orders are equally spaced, by ψ/π FSR
 * or (the other sweep direction) 1 − ψ/π FSR, and a ladder of them mimics a comb. The ladder reading is chosen when
 * the members fall in height by a large factor at every step from the tallest end, no second TEM00 of the ladder's
 * FSR would fall inside the sweep, and the ladder places the resonances at least as well as the comb does (and,
 * for a comb of two, places some resonance besides them).
 */
export function ladderReading(
  peaks: PeakPosition[],
  comb: FundamentalComb,
  gouyOneWayRad: number,
  sweepLengthSamples: number,
  options: LadderReadingOptions = {},
): 'comb' | 'ladder' | 'either' {
  const { allowedOrders = [0, 1, 2, 3], maxStepRatio = 0.6 } = options
  const n = comb.members.length
  if (n < 2) return 'comb'
  for (let k = 1; k < n; k++) if (comb.fsrIndex[k] - comb.fsrIndex[k - 1] !== 1) return 'comb'
  const heights = comb.members.map((i) => peaks[i].height)
  const ordered = heights[0] >= heights[n - 1] ? comb.members : comb.members.slice().reverse()
  for (let k = 1; k < n; k++) if (peaks[ordered[k]].height > maxStepRatio * peaks[ordered[k - 1]].height) return 'comb'
  const first = peaks[ordered[0]].center
  const last = peaks[ordered[n - 1]].center
  const spacing = Math.abs(last - first) / (n - 1)
  if (!(spacing > 0)) return 'comb'
  const direction = last > first ? 1 : -1
  const { toleranceSamples = 0.03 * spacing } = options
  const gouyStep = transverseOffsetFsr(1, gouyOneWayRad)
  const circular = (d: number) => Math.abs(d - Math.round(d))
  const orders = allowedOrders.filter((o) => Number.isInteger(o) && o >= 0)

  // Comb reading: TEM00 at the tallest member, FSR = spacing, the better of the two sweep directions.
  const members = new Set(comb.members)
  const explainedBy = (fsrSamples: number, sign: number, stepFsr: number, othersOnly = false) => {
    const tolerance = toleranceSamples / fsrSamples
    let sum = 0
    peaks.forEach((p, i) => {
      if (othersOnly && members.has(i)) return
      const nu = (sign * (p.center - first)) / fsrSamples
      if (orders.some((o) => circular(nu - o * stepFsr) <= tolerance)) sum += p.height
    })
    return sum
  }
  const combScore = Math.max(explainedBy(spacing, 1, gouyStep), explainedBy(spacing, -1, gouyStep))

  let either = false
  for (const step of [gouyStep, 1 - gouyStep]) {
    if (step < 0.05 || step > 0.95) continue
    const fsrSamples = spacing / step
    // A second TEM00 one ladder FSR away inside the sweep would have joined the comb: this is no ladder.
    const otherInside = [first - fsrSamples, first + fsrSamples].some((c) => c >= 0 && c < sweepLengthSamples)
    if (otherInside) continue
    // In the ladder's frame, order N lies at N·step FSR along the sweep from the TEM00. Two members and nothing
    // else fit both readings (a TEM00 and an order 1 at half its height, or two TEM00 with the laser power
    // falling): the ladder must then also place some other resonance, else the comb stands (TEM00 is the usual
    // tall resonance).
    const ladderScore = explainedBy(fsrSamples, direction, step)
    const placesOthers = n >= 3 || explainedBy(fsrSamples, direction, step, true) > 0
    if (ladderScore >= combScore * (1 - 1e-9)) {
      if (placesOthers) return 'ladder'
      either = true
    }
  }
  return either ? 'either' : 'comb'
}
