import { EngineError } from '../errors'
import { frequencyAt, type SweepCalibration } from './calibrateSweep'

/** A resonance whose transverse order is known, as a calibration point. */
export interface OrderedPoint {
  tSeconds: number
  /** Transverse order N (0 for TEM00). */
  order: number
  /** Relative weight (1/σ² of the position; e.g. the squared signal-to-noise ratio of the resonance). */
  weight: number
}

export interface CalibrateWithOrdersOptions {
  /** Highest polynomial order. @default 3 */
  maxOrder?: number
  /** Largest allowed change of ψ from the prediction, rad. @default 0.03·ψ */
  maxGouyShiftRad?: number
  /** Points farther than this (FSR units, and than 4 robust σ of the residuals) from the fit are dropped. @default 0.002 */
  outlierFsr?: number
}

export interface OrderCalibration {
  calibration: SweepCalibration
  /** ψ refined together with the sweep (within the bound). */
  gouyRad: number
  /** True when the refinement hit the bound. */
  gouyAtBound: boolean
}

/**
 * Refines the time → frequency map with every resonance of known order, not only TEM00: order N sits at
 * p ± N·ψ/π FSR (Siegman, "Lasers" (1986), ch. 19; sign by sweep direction), so one weighted linear least-squares
 * problem (Press et al., "Numerical Recipes", §15.4) gives the polynomial coefficients and ψ together. Between two
 * TEM00 resonances the transverse modes pin the piezo nonlinearity that a polynomial through TEM00 alone cannot
 * see. ψ is held within a bound of the geometry's prediction, so noise cannot drag it away.
 */
export function calibrateWithOrders(
  points: OrderedPoint[],
  start: SweepCalibration,
  direction: 'up' | 'down',
  predictedGouyRad: number,
  options: CalibrateWithOrdersOptions = {},
): OrderCalibration {
  const { maxOrder = 3, maxGouyShiftRad = 0.03 * predictedGouyRad, outlierFsr = 0.002 } = options
  if (!(predictedGouyRad > 0)) throw new EngineError('invalid_argument', `predictedGouyRad must be above 0, got ${predictedGouyRad}`)
  const sign = direction === 'up' ? 1 : -1
  let usable = points.filter((p) => Number.isFinite(p.tSeconds) && p.weight > 0)
  const hasTransverse = usable.some((p) => p.order > 0)
  // As calibrateSweep: through up to four TEM00 alone the polynomial may interpolate (their centres are far more
  // precise than a linewidth); otherwise one point more than the parameters is kept to judge the fit.
  const degree = Math.max(1, Math.min(maxOrder, hasTransverse ? usable.length - 3 : usable.length <= 4 ? usable.length - 1 : usable.length - 2))
  if (usable.length < 3) return { calibration: start, gouyRad: predictedGouyRad, gouyAtBound: false }
  // The whole number of FSRs below each point, from the starting map.
  let periods = usable.map((p) => Math.round(frequencyAt(start, p.tSeconds) - (sign * p.order * predictedGouyRad) / Math.PI))
  let u = usable.map((p) => (p.tSeconds - start.t0Seconds) / start.scaleSeconds)
  const solve = (fixedGouy: number | null) => {
    const size = degree + 1 + (fixedGouy === null && hasTransverse ? 1 : 0)
    const a = Array.from({ length: size }, () => new Array<number>(size + 1).fill(0))
    const row = new Array<number>(size)
    for (let i = 0; i < usable.length; i++) {
      let power = 1
      for (let k = 0; k <= degree; k++) { row[k] = power; power *= u[i] }
      const shift = (sign * usable[i].order) / Math.PI
      let target = periods[i]
      if (size > degree + 1) row[degree + 1] = -shift
      else target += shift * (fixedGouy ?? predictedGouyRad)
      const w = usable[i].weight
      for (let r = 0; r < size; r++) {
        for (let c = 0; c < size; c++) a[r][c] += w * row[r] * row[c]
        a[r][size] += w * row[r] * target
      }
    }
    return gaussSolve(a)
  }
  let solution = solve(null)
  let gouyRad = hasTransverse && solution.length > degree + 1 ? solution[degree + 1] : predictedGouyRad
  let gouyAtBound = false
  if (!Number.isFinite(gouyRad) || Math.abs(gouyRad - predictedGouyRad) > maxGouyShiftRad) {
    gouyRad = Number.isFinite(gouyRad) ? predictedGouyRad + Math.sign(gouyRad - predictedGouyRad) * maxGouyShiftRad : predictedGouyRad
    gouyAtBound = true
    solution = solve(gouyRad)
  }
  // Misassigned resonances (beyond the last TEM00 the map is extrapolated) must not bend it: drop the points far
  // off the fit, by a robust scale (1.4826·MAD; Hampel, J. Am. Stat. Assoc. 69, 383 (1974)), and solve again.
  for (let round = 0; round < 2; round++) {
    const residuals = usable.map((p, i) => {
      let v = 0
      for (let k = degree; k >= 0; k--) v = v * u[i] + solution[k]
      return v - (sign * p.order * gouyRad) / Math.PI - periods[i]
    })
    const scale = 1.4826 * medianOf(residuals.map(Math.abs))
    const limit = Math.max(4 * scale, outlierFsr)
    const keep = residuals.map((r) => Math.abs(r) <= limit)
    if (keep.every(Boolean) || keep.filter(Boolean).length < degree + 3) break
    usable = usable.filter((_, i) => keep[i])
    periods = periods.filter((_, i) => keep[i])
    u = u.filter((_, i) => keep[i])
    // ψ is free again: an outlier may have been what pushed it to the bound.
    solution = solve(null)
    gouyRad = hasTransverse && solution.length > degree + 1 ? solution[degree + 1] : predictedGouyRad
    gouyAtBound = false
    if (!Number.isFinite(gouyRad) || Math.abs(gouyRad - predictedGouyRad) > maxGouyShiftRad) {
      gouyRad = Number.isFinite(gouyRad) ? predictedGouyRad + Math.sign(gouyRad - predictedGouyRad) * maxGouyShiftRad : predictedGouyRad
      gouyAtBound = true
      solution = solve(gouyRad)
    }
  }
  const coefficients = solution.slice(0, degree + 1)
  if (!coefficients.every(Number.isFinite)) return { calibration: start, gouyRad: predictedGouyRad, gouyAtBound: false }
  let ss = 0
  let count = 0
  for (let i = 0; i < usable.length; i++) {
    if (usable[i].order !== 0) continue
    let v = 0
    for (let k = degree; k >= 0; k--) v = v * u[i] + coefficients[k]
    ss += (v - periods[i]) ** 2
    count++
  }
  return {
    calibration: { ...start, coefficients, polynomialOrder: degree, residualRmsFsr: count ? Math.sqrt(ss / count) : start.residualRmsFsr },
    gouyRad,
    gouyAtBound,
  }
}

function medianOf(values: number[]): number {
  const s = values.slice().sort((a, b) => a - b)
  const m = s.length >> 1
  return s.length === 0 ? 0 : s.length % 2 ? s[m] : (s[m - 1] + s[m]) / 2
}

/** Gaussian elimination with partial pivoting on an augmented matrix (size × size+1). */
function gaussSolve(a: number[][]): number[] {
  const size = a.length
  for (let col = 0; col < size; col++) {
    let pivot = col
    for (let r = col + 1; r < size; r++) if (Math.abs(a[r][col]) > Math.abs(a[pivot][col])) pivot = r
    ;[a[col], a[pivot]] = [a[pivot], a[col]]
    if (a[col][col] === 0) continue
    for (let r = 0; r < size; r++) {
      if (r === col) continue
      const f = a[r][col] / a[col][col]
      for (let c = col; c <= size; c++) a[r][c] -= f * a[col][c]
    }
  }
  return a.map((row, r) => (row[r] === 0 ? NaN : row[size] / row[r]))
}
