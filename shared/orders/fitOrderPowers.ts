import { EngineError } from '../errors'

/** One predicted resonance: a transverse order in one FSR period, at a known place on the frequency axis. */
export interface PredictedLine {
  /** Position on the calibrated axis, FSR units. */
  nu: number
  order: number
  /** True when the line lies in a whole FSR period that the shares count. */
  counted: boolean
}

export interface FitOrderPowersOptions {
  /** Finesse: every line is an Airy resonance of this width (the cavity linewidth is shared by the low orders). */
  finesse: number
  /** Phase-modulation sidebands folded into each line: offset (FSR) and power relative to the carrier. @default null */
  sidebands?: { offsetFsr: number; ratio: number } | null
  /** Noise σ of one sample, volts. */
  sigmaV: number
  /** Each line is modelled out to ± this many linewidths (at most half an FSR). @default 15 */
  supportLinewidths?: number
  /** Half-width of the summation window for the area measure, in linewidths (plus the sideband offset). @default 6 */
  areaLinewidths?: number
}

export interface LinePower {
  /** Least-squares height of the line, volts (the template amplitude). */
  heightV: number
  heightErrorV: number
  /**
   * Integrated power expressed as an equivalent height: data summed over the line's window on the frequency axis
   * (neighbours' fitted lines removed), divided by the same sum of the model's unit line. Robust to ringing, dither
   * and undersampling, which change the shape but not the area.
   */
  areaHeightV: number
  areaHeightErrorV: number
  /** True when samples constrain the line. */
  observed: boolean
}

export interface OrderPowerFit {
  lines: LinePower[]
  /** Residual constant level fitted with the lines, volts. */
  offsetV: number
  /** Σ residual² / (σ² (n − p)) over the samples the lines cover. */
  reducedChiSquare: number
  /** Covariance of the line heights, σ²(JᵀJ)⁻¹, row-major lines × lines. */
  covariance: Float64Array
}

/**
 * Measures every predicted resonance at once: with positions and the shared linewidth known, the heights enter the
 * model linearly, so one linear least-squares solve (normal equations by Cholesky; Press et al., "Numerical
 * Recipes", §15.4, §2.9) gives all heights and their covariance. Fitting a known shape is the matched filter, the
 * least-noisy estimate in white noise, so weak orders are measured, not merely detected. Lines are Airy functions
 * 1/(1 + (2𝓕/π)² sin²(πΔν)) (Born & Wolf, "Principles of Optics", §7.6). Equal shapes make the height ratios the
 * power ratios. A second pass sums the data in a window about each line (neighbours removed) for the area measure.
 */
export function fitOrderPowers(signalV: Float64Array, nu: Float64Array, lines: PredictedLine[], options: FitOrderPowersOptions): OrderPowerFit {
  const { finesse, sidebands = null, sigmaV, supportLinewidths = 15, areaLinewidths = 6 } = options
  if (nu.length !== signalV.length) throw new EngineError('invalid_argument', 'signalV and nu must have the same length')
  if (!(finesse > 1)) throw new EngineError('invalid_argument', `finesse must be above 1, got ${finesse}`)
  if (!(sigmaV > 0)) throw new EngineError('invalid_argument', `sigmaV must be above 0, got ${sigmaV}`)
  const m = lines.length
  const p = m + 1
  const order = lines.map((_, j) => j).sort((a, b) => lines[a].nu - lines[b].nu)
  const sortedNu = Float64Array.from(order, (j) => lines[j].nu)
  const k2 = ((2 * finesse) / Math.PI) ** 2
  const delta = sidebands && sidebands.ratio > 0 ? sidebands.offsetFsr : 0
  const ratio = delta > 0 ? sidebands!.ratio : 0
  const support = Math.min(0.5, supportLinewidths / finesse) + delta
  const airy = (z: number) => {
    const s = Math.sin(Math.PI * z)
    return 1 / (1 + k2 * s * s)
  }
  const unit = delta > 0 ? (z: number) => airy(z) + ratio * (airy(z - delta) + airy(z + delta)) : airy

  const n = signalV.length
  const ata = new Float64Array(p * p)
  const aty = new Float64Array(p)
  const active = new Int32Array(m + 1)
  const values = new Float64Array(m + 1)
  let first = 0
  let used = 0
  let yy = 0
  // Pass 1: normal equations over the samples within reach of some line, plus the constant level.
  for (let i = 0; i < n; i++) {
    const v = nu[i]
    const y = signalV[i]
    if (!Number.isFinite(v) || !Number.isFinite(y)) continue
    while (first < m && sortedNu[first] < v - support) first++
    let count = 0
    for (let s = first; s < m && sortedNu[s] <= v + support; s++) {
      active[count] = order[s]
      values[count] = unit(v - sortedNu[s])
      count++
    }
    if (count === 0) continue
    active[count] = m
    values[count] = 1
    count++
    used++
    yy += y * y
    for (let a = 0; a < count; a++) {
      const ra = active[a] * p
      const va = values[a]
      aty[active[a]] += va * y
      for (let b = 0; b < count; b++) ata[ra + active[b]] += va * values[b]
    }
  }
  const observed = lines.map((_, j) => ata[j * p + j] > 0)
  for (let j = 0; j < p; j++) {
    if (!(ata[j * p + j] > 0)) { ata[j * p + j] = 1; aty[j] = 0 }
  }
  const factor = cholesky(ata, p)
  const solution = choleskySolve(factor, p, aty)
  const heights = solution.subarray(0, m)
  const offsetV = solution[m]

  // Covariance σ²(AᵀA)⁻¹ for the line heights.
  const covariance = new Float64Array(m * m)
  const unitVector = new Float64Array(p)
  for (let j = 0; j < m; j++) {
    unitVector.fill(0)
    unitVector[j] = 1
    const column = choleskySolve(factor, p, unitVector)
    for (let r = 0; r < m; r++) covariance[r * m + j] = sigmaV * sigmaV * column[r]
  }

  // Pass 2: residuals and the windowed sums of the area measure.
  const areaHalf = lines.map(() => Math.min(support, areaLinewidths / finesse + delta))
  const sumData = new Float64Array(m)
  const sumUnit = new Float64Array(m)
  const sumWidth2 = new Float64Array(m)
  let rss = 0
  first = 0
  for (let i = 0; i < n; i++) {
    const v = nu[i]
    const y = signalV[i]
    if (!Number.isFinite(v) || !Number.isFinite(y)) continue
    while (first < m && sortedNu[first] < v - support) first++
    let count = 0
    let model = offsetV
    for (let s = first; s < m && sortedNu[s] <= v + support; s++) {
      const j = order[s]
      const b = unit(v - sortedNu[s])
      active[count] = s
      values[count] = b
      model += heights[j] * b
      count++
    }
    if (count === 0) continue
    rss += (y - model) ** 2
    const dnu = Math.abs((nu[Math.min(n - 1, i + 1)] - nu[Math.max(0, i - 1)]) / (Math.min(n - 1, i + 1) - Math.max(0, i - 1) || 1))
    for (let a = 0; a < count; a++) {
      const s = active[a]
      const j = order[s]
      if (Math.abs(v - sortedNu[s]) > areaHalf[j]) continue
      const own = heights[j] * values[a]
      sumData[j] += (y - (model - own)) * dnu
      sumUnit[j] += values[a] * dnu
      sumWidth2[j] += dnu * dnu
    }
  }
  const result: LinePower[] = lines.map((_, j) => ({
    heightV: observed[j] ? heights[j] : 0,
    heightErrorV: observed[j] ? Math.sqrt(Math.max(0, covariance[j * m + j])) : Infinity,
    areaHeightV: sumUnit[j] > 0 ? sumData[j] / sumUnit[j] : 0,
    areaHeightErrorV: sumUnit[j] > 0 ? (sigmaV * Math.sqrt(sumWidth2[j])) / sumUnit[j] : Infinity,
    observed: observed[j],
  }))
  void yy
  return { lines: result, offsetV, reducedChiSquare: used > p ? rss / (sigmaV * sigmaV * (used - p)) : NaN, covariance }
}

/** Cholesky factor L (row-major, lower) of a symmetric positive-definite matrix; tiny pivots are floored. */
function cholesky(a: Float64Array, size: number): Float64Array {
  const l = new Float64Array(size * size)
  for (let i = 0; i < size; i++) {
    for (let j = 0; j <= i; j++) {
      let s = a[i * size + j]
      for (let k = 0; k < j; k++) s -= l[i * size + k] * l[j * size + k]
      if (i === j) l[i * size + i] = Math.sqrt(Math.max(s, 1e-12 * Math.abs(a[i * size + i]) + 1e-300))
      else l[i * size + j] = s / l[j * size + j]
    }
  }
  return l
}

function choleskySolve(l: Float64Array, size: number, b: Float64Array): Float64Array {
  const y = new Float64Array(size)
  for (let i = 0; i < size; i++) {
    let s = b[i]
    for (let k = 0; k < i; k++) s -= l[i * size + k] * y[k]
    y[i] = s / l[i * size + i]
  }
  const x = new Float64Array(size)
  for (let i = size - 1; i >= 0; i--) {
    let s = y[i]
    for (let k = i + 1; k < size; k++) s -= l[k * size + i] * x[k]
    x[i] = s / l[i * size + i]
  }
  return x
}
