import { transverseOffsetFsr } from '../cavity'
import type { OrderPowerFit, PredictedLine } from './fitOrderPowers'
import type { ShareInputs } from './measureOrderShares'

/** Lines are modelled out to ± this many linewidths (at most half an FSR): the Airy wing left out there is 1e-4 of the height (1/(4·50²)), below the noise of any record. */
export const SUPPORT_LINEWIDTHS = 50

/** The predicted lines of every order over the sweep, and the samples they reach (all, and every k-th for searches). */
export interface LineProblem {
  lines: PredictedLine[]
  /** Each line's predicted place before it was moved to a resonance found there (FSR units). */
  predictedNu: number[]
  /** Half-width of the sample windows about each line, FSR units (support plus the split reach). */
  windowFsr: number
  all: { y: Float64Array; nu: Float64Array; stepFsr: Float64Array; background: { x: Float64Array; degree: number } }
  coarse: { y: Float64Array; nu: Float64Array; stepFsr: Float64Array; background: { x: Float64Array; degree: number } }
}

export function lineProblem(input: ShareInputs): LineProblem {
  const { signal, calibration, direction, gouy, finesse, firstIndex, lastIndex } = input
  const n = signal.length
  const c = calibration.coefficients
  // ν(i) = Σ cₖ uᵏ with u linear in the sample index: evaluated on a coarse grid first, then only in the windows
  // the lines reach (a high-finesse trace is mostly dark between its resonances).
  const u0 = (input.startSeconds - calibration.t0Seconds) / calibration.scaleSeconds
  const du = input.dtSeconds / calibration.scaleSeconds
  const cell = Math.max(1, Math.floor(n / 4096))
  const gridNu = gridFrequencies(n, cell, u0, du, c)
  let lo = Infinity
  let hi = -Infinity
  for (let g = 0; g < gridNu.length; g++) {
    if (gridNu[g] < lo) lo = gridNu[g]
    if (gridNu[g] > hi) hi = gridNu[g]
  }
  const sign = direction === 'up' ? 1 : -1
  const lines: PredictedLine[] = []
  const predictedNu: number[] = []
  const epsilon = 1e-6
  const sidebandReach = input.sidebands && input.sidebands.ratio > 0 ? input.sidebands.offsetFsr : 0
  const support = Math.min(0.5, SUPPORT_LINEWIDTHS / finesse) + sidebandReach
  // Lines just past either end of the record are modelled too (not counted): a tall resonance cut by the end of
  // the record leaves its wing in the data.
  const reach = Math.min(support, 10 / finesse + sidebandReach)
  // Only the calibrated span (first to last TEM00, plus the reach) is modelled: beyond it the sweep model is
  // extrapolated, and a record without a ramp channel may run past a turn of the sweep, where resonances come
  // back at places no line predicts and would bend the shared linewidth.
  lo = Math.max(lo, Math.min(firstIndex, lastIndex) - reach)
  hi = Math.min(hi, Math.max(firstIndex, lastIndex) + reach)
  for (let p = Math.floor(lo) - 1; p <= Math.ceil(hi) + 1; p++) {
    for (const order of input.orders) {
      const at = p + sign * transverseOffsetFsr(order, gouy)
      if (at < lo - reach || at > hi + reach) continue
      const counted = direction === 'up' ? at >= firstIndex - epsilon && at < lastIndex - epsilon : at > firstIndex + epsilon && at <= lastIndex + epsilon
      // A line found where its order was matched sits where it was found: the calibration between TEM00
      // resonances is only as good as the sweep model, and a line misplaced by a linewidth loses its height.
      let placed = at
      let nearest = input.placementToleranceFsr
      for (const d of input.detected) {
        if (d.order === order && Math.abs(d.nu - at) <= nearest) {
          nearest = Math.abs(d.nu - at)
          placed = d.nu
        }
      }
      lines.push({ nu: placed, order, counted })
      predictedNu.push(at)
    }
  }
  const centres = Float64Array.from(lines, (l) => l.nu).sort()
  // Room for split orders (see splitLines): the samples stay the same whatever split is tried.
  const windowFsr = support + (input.splitReachFsr ?? 0)
  // The line model sees the record less its dark level, not the drift-following baseline: block levels also
  // carry the wings of the resonances in each block, which would bend the lines. Slow drift is a quadratic
  // background fitted with the lines instead.
  const { y, nu, stepFsr, x } = samplesNearLines(input.raw, input.darkLevelV, cell, gridNu, centres, windowFsr, u0, du, c, lo, hi)
  // Searches run on every k-th sample (about 8 per linewidth pin a width; on long windows down to 4 per
  // linewidth, keeping it near 15,000 samples); the final fit uses all.
  const stride = Math.max(1, Math.floor(input.samplesPerLinewidth / 8), Math.min(Math.floor(input.samplesPerLinewidth / 4), Math.ceil(y.length / 8_000)))
  const every = (a: Float64Array) => {
    if (stride === 1) return a
    const out = new Float64Array(Math.ceil(a.length / stride))
    for (let i = 0, k = 0; i < a.length; i += stride, k++) out[k] = a[i]
    return out
  }
  return {
    lines,
    predictedNu,
    windowFsr,
    all: { y, nu, stepFsr, background: { x, degree: 2 } },
    coarse: { y: every(y), nu: every(nu), stepFsr: every(stepFsr), background: { x: every(x), degree: 2 } },
  }
}

/** Per order: the summed fitted heights of its counted lines and the variance of that sum. */
export function orderHeightSums(lines: PredictedLine[], fit: OrderPowerFit, order: number): { heightSum: number; heightVariance: number } {
  const m = lines.length
  let heightSum = 0
  let heightVariance = 0
  for (let j = 0; j < m; j++) {
    if (!lines[j].counted || lines[j].order !== order) continue
    heightSum += fit.lines[j].heightV
    for (let l = 0; l < m; l++) if (lines[l].counted && lines[l].order === order) heightVariance += fit.covariance[j * m + l]
  }
  return { heightSum, heightVariance }
}

/** ν at every `cell`-th sample (and the last), ν = Σ cₖ uᵏ with u = u0 + i·du. */
function gridFrequencies(n: number, cell: number, u0: number, du: number, c: number[]): Float64Array {
  const cellCount = Math.ceil((n - 1) / cell)
  const gridNu = new Float64Array(cellCount + 1)
  for (let g = 0; g <= cellCount; g++) {
    const u = u0 + Math.min(n - 1, g * cell) * du
    let v = 0
    for (let k = c.length - 1; k >= 0; k--) v = v * u + c[k]
    gridNu[g] = v
  }
  return gridNu
}

/**
 * The samples within `support` of some line centre (whole grid cells whose ν range, widened by half its span for
 * curvature, meets a line's support) and inside [windowLo, windowHi], with their ν and their width on the ν axis.
 */
function samplesNearLines(
  raw: Float64Array,
  darkLevelV: number,
  cell: number,
  gridNu: Float64Array,
  centres: Float64Array,
  support: number,
  u0: number,
  du: number,
  c: number[],
  windowLo = -Infinity,
  windowHi = Infinity,
): { y: Float64Array; nu: Float64Array; stepFsr: Float64Array; x: Float64Array } {
  const n = raw.length
  const cellCount = gridNu.length - 1
  const take = new Uint8Array(cellCount)
  let total = 0
  for (let g = 0; g < cellCount; g++) {
    const a0 = Math.min(gridNu[g], gridNu[g + 1])
    const b0 = Math.max(gridNu[g], gridNu[g + 1])
    const a = a0 - 0.5 * (b0 - a0) - support
    const b = b0 + 0.5 * (b0 - a0) + support
    // First line centre at or above a; the cell is reached when it lies at or below b.
    let l = 0
    let h = centres.length
    while (l < h) {
      const mid = (l + h) >> 1
      if (centres[mid] < a) l = mid + 1
      else h = mid
    }
    if (l < centres.length && centres[l] <= b) {
      take[g] = 1
      total += (g + 1 === cellCount ? n : (g + 1) * cell) - g * cell
    }
  }
  const y = new Float64Array(total)
  const nu = new Float64Array(total)
  const stepFsr = new Float64Array(total)
  const x = new Float64Array(total)
  let w = 0
  for (let g = 0; g < cellCount; g++) {
    if (!take[g]) continue
    const end = g + 1 === cellCount ? n : (g + 1) * cell
    for (let i = g * cell; i < end; i++) {
      const u = u0 + i * du
      let v = 0
      let d = 0
      for (let k = c.length - 1; k >= 0; k--) {
        d = d * u + v
        v = v * u + c[k]
      }
      if (v < windowLo || v > windowHi) continue
      y[w] = raw[i] - darkLevelV
      x[w] = n > 1 ? (2 * i) / (n - 1) - 1 : 0
      nu[w] = v
      stepFsr[w] = Math.abs(d * du)
      w++
    }
  }
  return w === total ? { y, nu, stepFsr, x } : { y: y.subarray(0, w), nu: nu.subarray(0, w), stepFsr: stepFsr.subarray(0, w), x: x.subarray(0, w) }
}
