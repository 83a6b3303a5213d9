import { EngineError } from '../errors'
import { fitLeastSquares } from './fitLeastSquares'

export type PeakModel = 'lorentzian' | 'airy'

/** Starting values for one resonance, in the caller's x and y units. */
export interface PeakGuess {
  center: number
  height: number
  fwhm: number
}

/** One fitted resonance with 1σ uncertainties. */
export interface FittedPeak {
  center: number
  /** Peak value above the baseline. */
  height: number
  /** Full width at half maximum; for 'airy' the Lorentzian-limit width period / F (see fitPeakGroup). */
  fwhm: number
  /** Integral above the baseline: π·h·fwhm/2 (Lorentzian) or over one period (Airy). */
  area: number
  errors: { center: number; height: number; fwhm: number; area: number }
}

export interface PeakGroupFit {
  peaks: FittedPeak[]
  baseline: number
  /** 0 when the baseline was fixed. */
  baselineError: number
  residualSumOfSquares: number
  /** RSS / ((n − p) σ²) with σ = noiseSigma; without noiseSigma, RSS / (n − p) in y units². */
  reducedChiSquare: number
  iterations: number
  converged: boolean
  model: PeakModel
}

export interface PeakGroupOptions {
  /** Line shape. @default 'lorentzian' */
  model?: PeakModel
  /** Period of the Airy model in x units (the FSR); required for 'airy'. */
  period?: number
  /** Known noise standard deviation of y; uncertainties then use it instead of the residual scatter. @default none */
  noiseSigma?: number
  /** Hold the baseline at this value instead of fitting it. @default none (fitted) */
  fixedBaseline?: number
}

/** Relative parameter tolerance for peak fits: far below any noise-limited uncertainty, and cheap. */
const PEAK_RELATIVE_TOLERANCE = 1e-9
const PEAK_MAX_ITERATIONS = 200
/** Lower bound on a fitted width, as a fraction of its guess, to keep the model finite. */
const MIN_FWHM_FRACTION = 1e-4

/**
 * Fits several overlapping resonances together on a constant baseline by Levenberg–Marquardt with analytic Jacobians.
 * 'lorentzian': h / (1 + ((x − c)/(fwhm/2))²), area = π h fwhm / 2.
 * 'airy': h / (1 + (2F/π)² sin²(π(x − c)/period)) with F = period/fwhm, area = h·period/√(1 + (2F/π)²) (one period).
 * Sources: Lorentzian limit and Airy function — Born & Wolf, "Principles of Optics", §7.6; Siegman, "Lasers" (1986),
 * ch. 11. Airy area over one period from the standard integral ∫₀^π dφ / (1 + K sin²φ) = π / √(1 + K).
 * x and y are shifted and scaled internally (x to the first guess's width, y to the tallest guess) for conditioning.
 */
export function fitPeakGroup(
  x: ArrayLike<number>,
  y: ArrayLike<number>,
  guesses: PeakGuess[],
  options: PeakGroupOptions = {},
): PeakGroupFit {
  const { model = 'lorentzian', period, noiseSigma, fixedBaseline } = options
  assertPeakInput(x, y, guesses, model, period, noiseSigma, fixedBaseline)

  const n = x.length
  let xMin = Infinity
  let xMax = -Infinity
  let yMin = Infinity
  let yAbsMax = 0
  for (let i = 0; i < n; i++) {
    xMin = Math.min(xMin, x[i])
    xMax = Math.max(xMax, x[i])
    yMin = Math.min(yMin, y[i])
    yAbsMax = Math.max(yAbsMax, Math.abs(y[i]))
  }
  const x0 = (xMin + xMax) / 2
  const xScale = guesses[0].fwhm
  const yScale = Math.max(yAbsMax, ...guesses.map((g) => Math.abs(g.height))) || 1
  const xs = Float64Array.from({ length: n }, (_, i) => (x[i] - x0) / xScale)
  const ys = Float64Array.from({ length: n }, (_, i) => y[i] / yScale)
  const periodScaled = period === undefined ? 0 : period / xScale
  const fitBaseline = fixedBaseline === undefined
  const baselineScaled = fitBaseline ? 0 : fixedBaseline / yScale

  const peakCount = guesses.length
  const initialValues: number[] = []
  const minValues: number[] = []
  const maxValues: number[] = []
  for (const guess of guesses) {
    const fwhmScaled = guess.fwhm / xScale
    initialValues.push((guess.center - x0) / xScale, guess.height / yScale, fwhmScaled)
    minValues.push(-Infinity, -Infinity, fwhmScaled * MIN_FWHM_FRACTION)
    maxValues.push(Infinity, Infinity, model === 'airy' ? periodScaled : Infinity)
  }
  if (fitBaseline) {
    // The lowest sample is a fair start for a constant under resonances that fall to the wings.
    initialValues.push(yMin / yScale)
    minValues.push(-Infinity)
    maxValues.push(Infinity)
  }

  const shape = model === 'airy' ? airyShape(periodScaled) : lorentzianShape
  const evaluate = (params: number[]) => {
    const base = fitBaseline ? params[3 * peakCount] : baselineScaled
    return (xv: number): number => {
      let sum = base
      for (let k = 0; k < peakCount; k++) sum += shape.value(xv, params[3 * k], params[3 * k + 1], params[3 * k + 2])
      return sum
    }
  }
  // One row buffer for every sample: fitLeastSquares copies it before asking for the next row.
  const row = new Array<number>(initialValues.length).fill(0)
  const jacobian = (params: number[], xv: number): number[] => {
    for (let k = 0; k < peakCount; k++) shape.gradient(xv, params[3 * k], params[3 * k + 1], params[3 * k + 2], row, 3 * k)
    if (fitBaseline) row[3 * peakCount] = 1
    return row
  }

  const sigmaScaled = noiseSigma === undefined ? undefined : noiseSigma / yScale
  const result = fitLeastSquares(xs, ys, evaluate, {
    initialValues,
    minValues,
    maxValues,
    jacobian,
    maxIterations: PEAK_MAX_ITERATIONS,
    relativeTolerance: PEAK_RELATIVE_TOLERANCE,
    knownResidualVariance: sigmaScaled === undefined ? undefined : sigmaScaled ** 2,
  })

  const p = result.parameters
  const cov = result.covariance
  const peaks: FittedPeak[] = []
  for (let k = 0; k < peakCount; k++) {
    const [ic, ih, iw] = [3 * k, 3 * k + 1, 3 * k + 2]
    const c = p[ic]
    const h = p[ih]
    const w = p[iw]
    const { area, dAreaDh, dAreaDw } = shape.area(h, w)
    const areaVariance = dAreaDh ** 2 * cov[ih][ih] + dAreaDw ** 2 * cov[iw][iw] + 2 * dAreaDh * dAreaDw * cov[ih][iw]
    peaks.push({
      center: x0 + c * xScale,
      height: h * yScale,
      fwhm: w * xScale,
      area: area * xScale * yScale,
      errors: {
        center: Math.sqrt(cov[ic][ic]) * xScale,
        height: Math.sqrt(cov[ih][ih]) * yScale,
        fwhm: Math.sqrt(cov[iw][iw]) * xScale,
        area: Math.sqrt(Math.max(areaVariance, 0)) * xScale * yScale,
      },
    })
  }
  const parameterCount = p.length
  const rss = result.residualSumOfSquares * yScale * yScale
  const dof = n - parameterCount
  const residualVariance = dof > 0 ? rss / dof : NaN
  return {
    peaks,
    baseline: fitBaseline ? p[3 * peakCount] * yScale : (fixedBaseline as number),
    baselineError: fitBaseline ? Math.sqrt(cov[3 * peakCount][3 * peakCount]) * yScale : 0,
    residualSumOfSquares: rss,
    reducedChiSquare: noiseSigma === undefined ? residualVariance : residualVariance / noiseSigma ** 2,
    iterations: result.iterations,
    converged: result.converged,
    model,
  }
}

interface PeakShape {
  value: (x: number, c: number, h: number, w: number) => number
  /** Writes ∂f/∂c, ∂f/∂h, ∂f/∂w into row[offset..offset+2]. */
  gradient: (x: number, c: number, h: number, w: number, row: number[], offset: number) => void
  area: (h: number, w: number) => { area: number; dAreaDh: number; dAreaDw: number }
}

const lorentzianShape: PeakShape = {
  value: (x, c, h, w) => {
    const u = (2 * (x - c)) / w
    return h / (1 + u * u)
  },
  gradient: (x, c, h, w, row, offset) => {
    const u = (2 * (x - c)) / w
    const l = 1 / (1 + u * u)
    row[offset] = ((4 * h * u) / w) * l * l
    row[offset + 1] = l
    row[offset + 2] = ((2 * h * u * u) / w) * l * l
  },
  area: (h, w) => ({ area: (Math.PI * h * w) / 2, dAreaDh: (Math.PI * w) / 2, dAreaDw: (Math.PI * h) / 2 }),
}

function airyShape(period: number): PeakShape {
  const k = Math.PI / period
  return {
    value: (x, c, h, w) => {
      const coefficient = (2 * period) / (Math.PI * w)
      const s = Math.sin(k * (x - c))
      return h / (1 + coefficient * coefficient * s * s)
    },
    gradient: (x, c, h, w, row, offset) => {
      const coefficient = (2 * period) / (Math.PI * w)
      const kk = coefficient * coefficient
      const phase = k * (x - c)
      const s = Math.sin(phase)
      const inv = 1 / (1 + kk * s * s)
      row[offset] = h * kk * k * Math.sin(2 * phase) * inv * inv
      row[offset + 1] = inv
      row[offset + 2] = ((2 * h * kk * s * s) / w) * inv * inv
    },
    area: (h, w) => {
      const coefficient = (2 * period) / (Math.PI * w)
      const kk = coefficient * coefficient
      const root = Math.sqrt(1 + kk)
      return { area: (h * period) / root, dAreaDh: period / root, dAreaDw: (h * period * kk) / (w * root ** 3) }
    },
  }
}

function assertPeakInput(
  x: ArrayLike<number>,
  y: ArrayLike<number>,
  guesses: PeakGuess[],
  model: PeakModel,
  period: number | undefined,
  noiseSigma: number | undefined,
  fixedBaseline: number | undefined,
): void {
  if (x.length !== y.length) {
    throw new EngineError('invalid_argument', `x and y must have the same length, got ${x.length} and ${y.length}`)
  }
  if (!Array.isArray(guesses) || guesses.length === 0) {
    throw new EngineError('invalid_argument', 'fitPeakGroup needs at least one peak guess')
  }
  guesses.forEach((g, k) => {
    if (!Number.isFinite(g.center) || !Number.isFinite(g.height)) {
      throw new EngineError('invalid_argument', `Peak guess ${k} must have a finite center and height`)
    }
    if (!(Number.isFinite(g.fwhm) && g.fwhm > 0)) {
      throw new EngineError('invalid_argument', `Peak guess ${k} must have a positive fwhm, got ${g.fwhm}`)
    }
  })
  if (model !== 'lorentzian' && model !== 'airy') {
    throw new EngineError('invalid_argument', `model must be 'lorentzian' or 'airy', got ${String(model)}`)
  }
  if (model === 'airy' && !(period !== undefined && Number.isFinite(period) && period > 0)) {
    throw new EngineError('invalid_argument', "The 'airy' model needs a positive period (the FSR in x units)")
  }
  if (noiseSigma !== undefined && !(Number.isFinite(noiseSigma) && noiseSigma > 0)) {
    throw new EngineError('invalid_argument', `noiseSigma must be a positive number, got ${noiseSigma}`)
  }
  if (fixedBaseline !== undefined && !Number.isFinite(fixedBaseline)) {
    throw new EngineError('invalid_argument', `fixedBaseline must be a finite number, got ${fixedBaseline}`)
  }
  const parameters = 3 * guesses.length + (fixedBaseline === undefined ? 1 : 0)
  if (x.length <= parameters) {
    throw new EngineError(
      'too_few_samples',
      `Cannot fit ${guesses.length} peak(s) (${parameters} parameters) to ${x.length} samples: need more samples than parameters`,
    )
  }
}
