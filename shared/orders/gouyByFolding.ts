import { frequencyAt, type SweepCalibration } from '../calibration/calibrateSweep'
import { frac, median } from '../numbers'

export interface FoldingInputs {
  /** The selected part as recorded, less its dark level (volts). */
  signal: Float64Array
  sigmaV: number
  calibration: SweepCalibration
  /** Time of the part's first sample and the sample interval, seconds. */
  startSeconds: number
  dtSeconds: number
  /** The counting window on the calibrated axis (whole FSR periods between TEM00), FSR units. */
  firstIndex: number
  lastIndex: number
  direction: 'up' | 'down'
  finesse: number
  /** Also search with the sweep the other way (when nothing settled the direction). @default false */
  bothDirections?: boolean
  /** The geometry's one-way Gouy phase, rad: the search runs over ±searchRelative of it. */
  predictedGouyRad: number
  /** @default 0.2 */
  searchRelative?: number
  /** Transverse orders whose places are summed. @default 1 … 4 */
  orders?: number[]
}

export interface FoldedGouy {
  gouyRad: number
  direction: 'up' | 'down'
  /** χ² the transverse lines explain at the phase found, and at the geometry's (matched filter, orders summed). */
  chiSquareExplained: number
  chiSquareAtPredicted: number
  /** The best phase read with the sweep the other way, and the χ² it explains (orders N at 1 − N·ψ/π). */
  mirror: { gouyRad: number; chiSquareExplained: number } | null
}

/** At most this many bins over one FSR (four per linewidth below it). */
const MAX_BINS = 16_384
/** The matched filter reaches ± this many linewidths. */
const FILTER_LINEWIDTHS = 6
/** Places within this many linewidths of TEM00 are left out (an order there cannot be told from TEM00's wing). */
const CLEAR_OF_TEM00_LINEWIDTHS = 8
/** χ² of one order's lines for it to stand out on its own (3σ). */
const ORDER_STANDS_CHI_SQUARE = 9

/**
 * The Gouy phase from lines too weak to be found one by one. Every sample of the whole FSR periods is folded onto one
 * FSR on the calibrated axis (the cavity's spectrum repeats every FSR), TEM00's line is taken out, and the folded
 * profile is cross-correlated with the Airy line: the matched filter, whose output at each place is the least-squares
 * height of a line there and whose square over its variance is the χ² that line explains (Press et al., "Numerical
 * Recipes", §13.1 and §15.4). Order N sits at N·ψ/π of an FSR from TEM00 (Siegman, "Lasers" (1986), §19.3): the phase
 * whose orders explain most χ² together is the one the data hold. Returns null when the sweep holds no whole FSR.
 */
export function gouyByFolding(input: FoldingInputs): FoldedGouy | null {
  const { signal, sigmaV, calibration, startSeconds, dtSeconds, finesse, direction, predictedGouyRad } = input
  const { searchRelative = 0.2, orders = [1, 2, 3, 4] } = input
  const lo = Math.min(input.firstIndex, input.lastIndex)
  const hi = Math.max(input.firstIndex, input.lastIndex)
  if (!(hi - lo >= 1 - 1e-9) || !(finesse > 1) || !(sigmaV > 0)) return null
  const bins = Math.min(MAX_BINS, Math.max(64, Math.ceil(4 * finesse)))
  const sum = new Float64Array(bins)
  const count = new Float64Array(bins)
  for (let i = 0; i < signal.length; i++) {
    const nu = frequencyAt(calibration, startSeconds + i * dtSeconds)
    if (!(nu >= lo && nu < hi) || !Number.isFinite(signal[i])) continue
    const b = Math.min(bins - 1, Math.floor((nu - Math.floor(nu)) * bins))
    sum[b] += signal[i]
    count[b]++
  }
  const k2 = ((2 * finesse) / Math.PI) ** 2
  const line = (dx: number) => {
    const s = Math.sin(Math.PI * dx)
    return 1 / (1 + k2 * s * s)
  }
  const reach = Math.max(1, Math.ceil((FILTER_LINEWIDTHS / finesse) * bins))
  // The matched filter at every bin: height h = Σ nᵦ yᵦ L / Σ nᵦ L², explained χ² = h² Σ nᵦ L² / σ² (bins hold means).
  const filter = (values: Float64Array) => {
    const height = new Float64Array(bins)
    const weight = new Float64Array(bins)
    for (let c = 0; c < bins; c++) {
      let num = 0
      let den = 0
      for (let d = -reach; d <= reach; d++) {
        const b = (((c + d) % bins) + bins) % bins
        if (count[b] === 0) continue
        const l = line(d / bins)
        num += count[b] * values[b] * l
        den += count[b] * l * l
      }
      height[c] = den > 0 ? num / den : 0
      weight[c] = den
    }
    return { height, weight }
  }
  const mean = Float64Array.from(sum, (s, b) => (count[b] > 0 ? s / count[b] : 0))
  // TEM00 (at bin 0) and the background level out first: the least-squares height of TEM00's line, then the median
  // level of the bins, removed from the folded profile.
  const atZero = filter(mean).height[0]
  for (let b = 0; b < bins; b++) mean[b] -= atZero * line(b / bins)
  const level = median(Array.from(mean).filter((_, b) => count[b] > 0))
  for (let b = 0; b < bins; b++) mean[b] -= level
  const { height, weight } = filter(mean)
  const clear = CLEAR_OF_TEM00_LINEWIDTHS / finesse
  // χ² explained by the orders at ψ, and how many of them stand out on their own (3σ each).
  let standing = 0
  const explained = (psi: number, sign: number) => {
    let chi = 0
    standing = 0
    for (const n of orders) {
      const x = frac((sign * n * psi) / Math.PI)
      if (Math.min(x, 1 - x) < clear) continue
      const b = Math.min(bins - 1, Math.round(x * bins) % bins)
      if (!(height[b] > 0)) continue
      const own = (height[b] * height[b] * weight[b]) / (sigmaV * sigmaV)
      chi += own
      if (own >= ORDER_STANDS_CHI_SQUARE) standing++
    }
    return chi
  }
  // Steps small enough that the highest order moves a quarter of a bin.
  const top = Math.max(...orders)
  const step = Math.PI / (4 * top * bins)
  const from = Math.max(step, predictedGouyRad * (1 - searchRelative))
  const to = Math.min(Math.PI - step, predictedGouyRad * (1 + searchRelative))
  const search = (sign: number) => {
    let best = predictedGouyRad
    let bestChi = explained(predictedGouyRad, sign)
    for (let psi = from; psi <= to; psi += step) {
      const chi = explained(psi, sign)
      // One line alone can be met by many phases (and by any artefact at a fixed place): two orders at least must stand.
      if (chi > bestChi && standing >= 2) {
        bestChi = chi
        best = psi
      }
    }
    return { gouyRad: best, chiSquareExplained: bestChi }
  }
  const sign = direction === 'up' ? 1 : -1
  const own = search(sign)
  const other = input.bothDirections ? search(-sign) : null
  const flip = other !== null && other.chiSquareExplained > own.chiSquareExplained
  const best = flip ? other! : own
  return {
    gouyRad: best.gouyRad,
    direction: flip ? (direction === 'up' ? 'down' : 'up') : direction,
    chiSquareExplained: best.chiSquareExplained,
    chiSquareAtPredicted: explained(predictedGouyRad, flip ? -sign : sign),
    mirror: other === null ? null : flip ? { ...own } : { ...other },
  }
}
