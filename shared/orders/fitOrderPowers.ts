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
  /**
   * Width of each sample on the frequency axis, FSR units (|dν/dt|·Δt). Needed when the samples are not contiguous
   * (only the windows around the lines are handed over). @default from the neighbouring samples' ν
   */
  stepFsr?: Float64Array | null
  /**
   * Abscissa of a slow background (e.g. the sample's time scaled to [−1, 1]) and the degree of the polynomial in it
   * fitted with the lines (slow drift of the dark level). Without it the background is one constant. @default null
   */
  background?: { x: Float64Array; degree: number } | null
  /**
   * Only the heights and χ² (from the normal equations: RSS = yᵀy − βᵀAᵀy), no covariance and no area pass: for
   * searches that call the fit many times. @default false
   */
  residualOnly?: boolean
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
  /** Residual constant level fitted with the lines, volts (the constant term of the background). */
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
  const { finesse, sidebands = null, sigmaV, supportLinewidths = 15, areaLinewidths = 6, stepFsr = null, background = null, residualOnly = false } = options
  if (nu.length !== signalV.length) throw new EngineError('invalid_argument', 'signalV and nu must have the same length')
  if (stepFsr && stepFsr.length !== signalV.length) throw new EngineError('invalid_argument', 'signalV and stepFsr must have the same length')
  if (!(finesse > 1)) throw new EngineError('invalid_argument', `finesse must be above 1, got ${finesse}`)
  if (!(sigmaV > 0)) throw new EngineError('invalid_argument', `sigmaV must be above 0, got ${sigmaV}`)
  if (background && background.x.length !== signalV.length) throw new EngineError('invalid_argument', 'signalV and background.x must have the same length')
  const m = lines.length
  const backgroundX = background && background.degree > 0 ? background.x : null
  const terms = backgroundX ? background!.degree + 1 : 1
  const p = m + terms
  const order = lines.map((_, j) => j).sort((a, b) => lines[a].nu - lines[b].nu)
  const sortedNu = Float64Array.from(order, (j) => lines[j].nu)
  const shape = lineShapeOf(finesse, sidebands)
  const support = Math.min(0.5, supportLinewidths / finesse) + shape.delta
  const sortedOrder = Int32Array.from(order)

  // Pass 1: normal equations over the samples within reach of some line, plus the constant level.
  const ata = new Float64Array(p * p)
  const aty = new Float64Array(p)
  const squares = new Float64Array(1)
  const used = accumulateNormalEquations(signalV, nu, backgroundX, terms, sortedNu, sortedOrder, support, shape, ata, aty, squares)
  const observed = lines.map((_, j) => ata[j * p + j] > 0)
  for (let j = 0; j < p; j++) {
    if (!(ata[j * p + j] > 0)) { ata[j * p + j] = 1; aty[j] = 0 }
  }
  const factor = cholesky(ata, p)
  const solution = choleskySolve(factor, p, aty)
  const heights = solution.subarray(0, m)
  const backgroundV = solution.subarray(m, p)
  const offsetV = solution[m]
  if (residualOnly) {
    let explained = 0
    for (let j = 0; j < p; j++) explained += solution[j] * aty[j]
    const rssQuick = Math.max(0, squares[0] - explained)
    return {
      lines: lines.map((_, j) => ({ heightV: observed[j] ? heights[j] : 0, heightErrorV: Infinity, areaHeightV: 0, areaHeightErrorV: Infinity, observed: observed[j] })),
      offsetV,
      reducedChiSquare: used > p ? rssQuick / (sigmaV * sigmaV * (used - p)) : NaN,
      covariance: new Float64Array(0),
    }
  }

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
  const sums = { data: new Float64Array(m), unit: new Float64Array(m), width2: new Float64Array(m) }
  const areaHalf = Math.min(support, areaLinewidths / finesse + shape.delta)
  const rss = residualsAndAreas(signalV, nu, stepFsr, backgroundX, backgroundV, sortedNu, sortedOrder, support, areaHalf, shape, heights, sums)
  const result: LinePower[] = lines.map((_, j) => ({
    heightV: observed[j] ? heights[j] : 0,
    heightErrorV: observed[j] ? Math.sqrt(Math.max(0, covariance[j * m + j])) : Infinity,
    areaHeightV: sums.unit[j] > 0 ? sums.data[j] / sums.unit[j] : 0,
    areaHeightErrorV: sums.unit[j] > 0 ? (sigmaV * Math.sqrt(sums.width2[j])) / sums.unit[j] : Infinity,
    observed: observed[j],
  }))
  return { lines: result, offsetV, reducedChiSquare: used > p ? rss / (sigmaV * sigmaV * (used - p)) : NaN, covariance }
}

/**
 * The lines' part of the model at each sample, Σⱼ hⱼ·line(ν − νⱼ), without the background: the same Airy shape and
 * support as {@link fitOrderPowers} uses.
 */
export function lineModelValues(
  nu: Float64Array,
  lines: PredictedLine[],
  heightsV: ArrayLike<number>,
  options: Pick<FitOrderPowersOptions, 'finesse' | 'sidebands' | 'supportLinewidths'>,
): Float64Array {
  const { finesse, sidebands = null, supportLinewidths = 15 } = options
  const shape = lineShapeOf(finesse, sidebands)
  const support = Math.min(0.5, supportLinewidths / finesse) + shape.delta
  const order = lines.map((_, j) => j).sort((a, b) => lines[a].nu - lines[b].nu)
  const out = new Float64Array(nu.length)
  let first = 0
  for (let i = 0; i < nu.length; i++) {
    const v = nu[i]
    if (!(v - v === 0)) continue
    while (first < order.length && lines[order[first]].nu < v - support) first++
    let sum = 0
    for (let s = first; s < order.length && lines[order[s]].nu <= v + support; s++) sum += heightsV[order[s]] * unitLine(v - lines[order[s]].nu, shape)
    out[i] = sum
  }
  return out
}

/** Airy line 1/(1 + k² sin²(πz)) with optional sidebands of relative power `ratio` at ±delta. */
interface LineShape {
  k2: number
  delta: number
  ratio: number
}

function lineShapeOf(finesse: number, sidebands: { offsetFsr: number; ratio: number } | null): LineShape {
  const withSidebands = sidebands !== null && sidebands.ratio > 0
  return { k2: ((2 * finesse) / Math.PI) ** 2, delta: withSidebands ? sidebands.offsetFsr : 0, ratio: withSidebands ? sidebands.ratio : 0 }
}

function unitLine(z: number, shape: LineShape): number {
  const s = Math.sin(Math.PI * z)
  let v = 1 / (1 + shape.k2 * s * s)
  if (shape.delta > 0) {
    const a = Math.sin(Math.PI * (z - shape.delta))
    const b = Math.sin(Math.PI * (z + shape.delta))
    v += shape.ratio * (1 / (1 + shape.k2 * a * a) + 1 / (1 + shape.k2 * b * b))
  }
  return v
}

// The per-sample passes live in small functions of their own: the JavaScript engine then compiles each hot loop
// once and keeps it compiled, instead of recompiling one long function at every loop it reaches.

/** Adds every sample within reach of a line to AᵀA and Aᵀy; returns the number of samples used. */
function accumulateNormalEquations(
  signalV: Float64Array,
  nu: Float64Array,
  backgroundX: Float64Array | null,
  terms: number,
  sortedNu: Float64Array,
  sortedOrder: Int32Array,
  support: number,
  shape: LineShape,
  ata: Float64Array,
  aty: Float64Array,
  squares: Float64Array,
): number {
  const n = signalV.length
  const m = sortedNu.length
  const p = m + terms
  const active = new Int32Array(p)
  const values = new Float64Array(p)
  let first = 0
  let used = 0
  for (let i = 0; i < n; i++) {
    const v = nu[i]
    const y = signalV[i]
    if (!(v - v === 0) || !(y - y === 0)) continue
    while (first < m && sortedNu[first] < v - support) first++
    let count = 0
    for (let s = first; s < m && sortedNu[s] <= v + support; s++) {
      active[count] = sortedOrder[s]
      values[count] = unitLine(v - sortedNu[s], shape)
      count++
    }
    if (count === 0) continue
    // The background terms 1, x, x², … of the slow level.
    let power = 1
    const x = backgroundX ? backgroundX[i] : 0
    for (let t = 0; t < terms; t++) {
      active[count] = m + t
      values[count] = power
      power *= x
      count++
    }
    used++
    squares[0] += y * y
    // One triangle of the symmetric AᵀA: each pair once, folded together below.
    for (let a = 0; a < count; a++) {
      const ra = active[a] * p
      const va = values[a]
      aty[active[a]] += va * y
      for (let b = a; b < count; b++) ata[ra + active[b]] += va * values[b]
    }
  }
  for (let i = 0; i < p; i++) {
    for (let j = i + 1; j < p; j++) {
      const sum = ata[i * p + j] + ata[j * p + i]
      ata[i * p + j] = sum
      ata[j * p + i] = sum
    }
  }
  return used
}

/** Residual sum of squares of the fitted lines, and per line the windowed sums of the area measure. */
function residualsAndAreas(
  signalV: Float64Array,
  nu: Float64Array,
  stepFsr: Float64Array | null,
  backgroundX: Float64Array | null,
  backgroundV: Float64Array,
  sortedNu: Float64Array,
  sortedOrder: Int32Array,
  support: number,
  areaHalf: number,
  shape: LineShape,
  heights: Float64Array,
  sums: { data: Float64Array; unit: Float64Array; width2: Float64Array },
): number {
  const n = signalV.length
  const m = sortedNu.length
  const active = new Int32Array(m + 1)
  const values = new Float64Array(m + 1)
  let first = 0
  let rss = 0
  for (let i = 0; i < n; i++) {
    const v = nu[i]
    const y = signalV[i]
    if (!(v - v === 0) || !(y - y === 0)) continue
    while (first < m && sortedNu[first] < v - support) first++
    let count = 0
    let model = 0
    let power = 1
    const x = backgroundX ? backgroundX[i] : 0
    for (let t = 0; t < backgroundV.length; t++) {
      model += backgroundV[t] * power
      power *= x
    }
    for (let s = first; s < m && sortedNu[s] <= v + support; s++) {
      const b = unitLine(v - sortedNu[s], shape)
      active[count] = s
      values[count] = b
      model += heights[sortedOrder[s]] * b
      count++
    }
    if (count === 0) continue
    rss += (y - model) * (y - model)
    const lo = i > 0 ? i - 1 : 0
    const hi = i + 1 < n ? i + 1 : n - 1
    const dnu = stepFsr ? stepFsr[i] : Math.abs((nu[hi] - nu[lo]) / (hi - lo || 1))
    for (let a = 0; a < count; a++) {
      const s = active[a]
      if (Math.abs(v - sortedNu[s]) > areaHalf) continue
      const j = sortedOrder[s]
      const own = heights[j] * values[a]
      sums.data[j] += (y - (model - own)) * dnu
      sums.unit[j] += values[a] * dnu
      sums.width2[j] += dnu * dnu
    }
  }
  return rss
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
