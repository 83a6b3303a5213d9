import { EngineError } from '../errors'
import { householderQr } from './householderQr'
import { solveUpperTriangular } from './solveUpperTriangular'

/** Result of a weighted nonlinear least-squares fit. */
export interface LeastSquaresResult {
  parameters: number[]
  /** sqrt(diag(covariance)); NaN where the covariance is undefined. */
  standardErrors: number[]
  /** s² (JᵀWJ)⁻¹ at the solution, s² = RSS / (n − p). */
  covariance: number[][]
  /** Σ wᵢ (yᵢ − f(xᵢ))² at the solution. */
  residualSumOfSquares: number
  /** Number of Jacobian evaluations (outer Levenberg–Marquardt iterations). */
  iterations: number
  /** True only when a convergence test passed at a point where every parameter is determined by the data. */
  converged: boolean
  /** Why the iteration stopped, in plain words. */
  message: string
}

export type ModelFactory = (parameters: number[]) => (x: number) => number

export interface LeastSquaresOptions {
  initialValues: number[]
  /** Maximum number of Jacobian evaluations. @default 1000 */
  maxIterations?: number
  /** Per-sample weights wᵢ (1/σᵢ²), each ≥ 0. @default all 1 */
  weights?: ArrayLike<number>
  /** Lower bounds; trial points are projected into the box. @default none */
  minValues?: number[]
  /** Upper bounds. @default none */
  maxValues?: number[]
  /** Analytic ∂f/∂pⱼ at x; the returned array is read at once, so it may be reused between calls. @default central differences */
  jacobian?: (parameters: number[], x: number) => number[]
  /**
   * Converged when a step changes the scaled parameters by less than this fraction, or when the actual and the
   * predicted relative RSS reductions both fall below its square. @default 1e-12
   */
  relativeTolerance?: number
  /**
   * Known variance of the weighted residuals (e.g. σ² of the noise with unit weights). When given, the covariance is
   * this × (JᵀWJ)⁻¹ instead of s²(JᵀWJ)⁻¹. @default s² = RSS / (n − p)
   */
  knownResidualVariance?: number
}

/** Gradient cosine below which the point is stationary to working precision (MINPACK's gtol test). */
const GRADIENT_TOLERANCE = 1e-13
/** A Jacobian column whose norm fell below this fraction of its largest norm during the fit marks an undetermined parameter. */
const DEAD_COLUMN_FRACTION = 1e-10
/** Reciprocal condition number of the column-scaled Jacobian below which the covariance is not trusted. */
const MIN_RECIPROCAL_CONDITION = 1e-13
/** cbrt(machine epsilon): the step that balances truncation and round-off in a central difference. */
const CENTRAL_DIFFERENCE_STEP = Math.cbrt(Number.EPSILON)
const INITIAL_DAMPING = 1e-3
const MAX_DAMPING = 1e32

/**
 * Weighted nonlinear least squares by Levenberg–Marquardt: each step solves (JᵀJ + λD²)δ = Jᵀr by Householder QR
 * of J and of [R; √λ·D], with D the running maximum of the Jacobian column norms; λ is updated from the gain ratio.
 * Sources: D. W. Marquardt, J. SIAM 11, 431 (1963); J. J. Moré, "The Levenberg–Marquardt algorithm: implementation and theory", in Numerical Analysis, Springer LNM 630, 105 (1978)
 * (scaling and convergence tests); H. B. Nielsen, IMM-REP-1999-05, DTU (1999) (damping update).
 * Standard errors come from s²(JᵀWJ)⁻¹ with s² = RSS/(n − p) (or a known residual variance). A point where some parameter has no effect on the
 * model, or the Jacobian is numerically rank-deficient, is reported with `converged: false`.
 */
export function fitLeastSquares(
  x: ArrayLike<number>,
  y: ArrayLike<number>,
  model: ModelFactory,
  options: LeastSquaresOptions,
): LeastSquaresResult {
  const {
    initialValues,
    maxIterations = 1000,
    weights,
    minValues,
    maxValues,
    jacobian,
    relativeTolerance = 1e-12,
    knownResidualVariance,
  } = options
  const n = x.length
  assertSamples(x, y)
  assertParameterVector(initialValues, 'initialValues')
  const p = initialValues.length
  if (n < p) {
    throw new EngineError('too_few_samples', `Cannot fit ${p} parameters to ${n} samples: need at least as many samples as parameters`)
  }
  if (!Number.isInteger(maxIterations) || maxIterations < 1) {
    throw new EngineError('invalid_argument', `maxIterations must be a positive integer, got ${String(maxIterations)}`)
  }
  if (!(relativeTolerance > 0 && relativeTolerance < 1)) {
    throw new EngineError('invalid_argument', `relativeTolerance must be between 0 and 1, got ${String(relativeTolerance)}`)
  }
  if (knownResidualVariance !== undefined && !(Number.isFinite(knownResidualVariance) && knownResidualVariance > 0)) {
    throw new EngineError('invalid_argument', `knownResidualVariance must be a positive number, got ${String(knownResidualVariance)}`)
  }
  const lower = boundVector(minValues, p, 'minValues', -Infinity)
  const upper = boundVector(maxValues, p, 'maxValues', Infinity)
  for (let j = 0; j < p; j++) {
    if (lower[j] > upper[j]) throw new EngineError('invalid_argument', `minValues[${j}] is greater than maxValues[${j}]`)
  }
  const sqrtWeights = weightRoots(weights, n)
  const xtol = relativeTolerance
  const ftol = relativeTolerance * relativeTolerance

  const evaluateResiduals = (parameters: Float64Array, out: Float64Array): number => {
    const f = model(Array.from(parameters))
    let sum = 0
    for (let i = 0; i < n; i++) {
      const ri = sqrtWeights[i] * (y[i] - f(x[i]))
      out[i] = ri
      sum += ri * ri
    }
    return sum
  }
  const evaluateJacobian = makeJacobian(x, sqrtWeights, model, jacobian, initialValues, p)

  let params = clampInto(Float64Array.from(initialValues), lower, upper)
  let residuals = new Float64Array(n)
  let rss = evaluateResiduals(params, residuals)
  if (!Number.isFinite(rss)) {
    throw new EngineError('non_finite_model', 'The model gives a non-finite value at the initial parameters')
  }

  const scale = new Float64Array(p)
  const columnNorms = new Float64Array(p)
  let trialResiduals = new Float64Array(n)
  const jd = new Float64Array(n)
  let lambda = INITIAL_DAMPING
  let nu = 2
  let iterations = 0
  let stopped: { converged: boolean; message: string } | null = null

  while (stopped === null) {
    if (iterations >= maxIterations) {
      stopped = { converged: false, message: `Stopped after the maximum of ${maxIterations} iterations without meeting the tolerance` }
      break
    }
    iterations++
    const jac = evaluateJacobian(params)
    let gradientCosine = 0
    const rNorm = Math.sqrt(rss)
    for (let j = 0; j < p; j++) {
      let sq = 0
      let g = 0
      for (let i = 0; i < n; i++) {
        const v = jac[j * n + i]
        sq += v * v
        g += v * residuals[i]
      }
      columnNorms[j] = Math.sqrt(sq)
      scale[j] = Math.max(scale[j], columnNorms[j])
      if (columnNorms[j] > 0 && rNorm > 0) gradientCosine = Math.max(gradientCosine, Math.abs(g) / (columnNorms[j] * rNorm))
    }
    if (rss === 0) {
      stopped = { converged: true, message: 'The model fits the data exactly' }
      break
    }
    if (gradientCosine <= GRADIENT_TOLERANCE) {
      stopped = { converged: true, message: 'The residuals are orthogonal to the Jacobian to working precision' }
      break
    }

    const r = Float64Array.from(jac)
    const qtr = Float64Array.from(residuals)
    householderQr(r, n, p, qtr)
    const d = Float64Array.from(scale, (s) => (s > 0 ? s : 1))
    let paramNorm = 0
    for (let j = 0; j < p; j++) paramNorm += (d[j] * params[j]) ** 2
    paramNorm = Math.sqrt(paramNorm)

    // Inner loop: raise λ until a step lowers the RSS (or a convergence test says no better point exists).
    for (;;) {
      const delta = dampedStep(r, n, qtr, d, lambda, p)
      const trial = clampInto(Float64Array.from(params, (v, j) => v + delta[j]), lower, upper)
      let stepNorm = 0
      for (let j = 0; j < p; j++) {
        delta[j] = trial[j] - params[j]
        stepNorm += (d[j] * delta[j]) ** 2
      }
      stepNorm = Math.sqrt(stepNorm)
      jd.fill(0)
      for (let j = 0; j < p; j++) {
        const dj = delta[j]
        if (dj === 0) continue
        for (let i = 0; i < n; i++) jd[i] += jac[j * n + i] * dj
      }
      let predicted = 0
      for (let i = 0; i < n; i++) predicted += jd[i] * (2 * residuals[i] - jd[i])
      const rssTrial = evaluateResiduals(trial, trialResiduals)
      const actualRelative = Number.isFinite(rssTrial) ? (rss - rssTrial) / rss : -Infinity
      const predictedRelative = Math.max(predicted, 0) / rss
      const ratio = predicted > 0 ? (rss - rssTrial) / predicted : -1

      if (Number.isFinite(rssTrial) && ratio > 0) {
        params = trial
        const previous = residuals
        residuals = trialResiduals
        trialResiduals = previous
        rss = rssTrial
        lambda *= Math.max(1 / 3, 1 - (2 * ratio - 1) ** 3)
        nu = 2
      } else {
        lambda *= nu
        nu *= 2
      }
      if (Math.abs(actualRelative) <= ftol && predictedRelative <= ftol && ratio <= 2) {
        stopped = { converged: true, message: 'The relative reduction of the residual sum of squares is below the tolerance' }
        break
      }
      if (stepNorm <= xtol * paramNorm) {
        stopped = { converged: true, message: 'The relative change of the parameters is below the tolerance' }
        break
      }
      if (ratio > 0) break
      if (lambda > MAX_DAMPING) {
        stopped = { converged: false, message: 'No step lowers the residual sum of squares; the fit is stuck' }
        break
      }
    }
  }

  const variance = knownResidualVariance ?? (n > p ? rss / (n - p) : NaN)
  const statistics = covarianceAt(evaluateJacobian(params), scale, n, p, variance)
  const undetermined = statistics.problem !== null
  return {
    parameters: Array.from(params),
    standardErrors: statistics.covariance.map((row, j) => Math.sqrt(row[j])),
    covariance: statistics.covariance,
    residualSumOfSquares: rss,
    iterations,
    converged: stopped.converged && !undetermined,
    message: undetermined ? `${stopped.message}; but ${statistics.problem}` : stopped.message,
  }
}

/** δ minimising ‖[R; √λ D] δ − [Qᵀr; 0]‖, i.e. (JᵀJ + λD²)δ = Jᵀr, from the QR of J. */
function dampedStep(r: Float64Array, n: number, qtr: Float64Array, d: Float64Array, lambda: number, p: number): Float64Array {
  const rows = 2 * p
  const stacked = new Float64Array(rows * p)
  const rhs = new Float64Array(rows)
  for (let j = 0; j < p; j++) {
    for (let i = 0; i <= j; i++) stacked[j * rows + i] = r[j * n + i]
    rhs[j] = qtr[j]
    stacked[j * rows + p + j] = Math.sqrt(lambda) * d[j]
  }
  householderQr(stacked, rows, p, rhs)
  return solveUpperTriangular(stacked, rows, p, rhs)
}

interface CovarianceStatistics {
  covariance: number[][]
  /** Why the covariance (and so the solution) cannot be trusted, or null. */
  problem: string | null
}

function covarianceAt(
  jac: Float64Array,
  largestColumnNorms: Float64Array,
  n: number,
  p: number,
  s2: number,
): CovarianceStatistics {
  const nanMatrix = (): number[][] => Array.from({ length: p }, () => new Array<number>(p).fill(NaN))
  const norms = new Float64Array(p)
  for (let j = 0; j < p; j++) {
    let sq = 0
    for (let i = 0; i < n; i++) sq += jac[j * n + i] ** 2
    norms[j] = Math.sqrt(sq)
  }
  for (let j = 0; j < p; j++) {
    // A column that has collapsed to round-off compared with its size during the fit (e.g. a decay rate driven to
    // where the exponential underflows) means the data no longer determine that parameter.
    if (!(norms[j] > DEAD_COLUMN_FRACTION * largestColumnNorms[j])) {
      return { covariance: nanMatrix(), problem: `parameter ${j} has no measurable effect on the model at the solution, so the data do not determine it` }
    }
  }
  const scaled = new Float64Array(n * p)
  for (let j = 0; j < p; j++) {
    const inverse = 1 / norms[j]
    for (let i = 0; i < n; i++) scaled[j * n + i] = jac[j * n + i] * inverse
  }
  householderQr(scaled, n, p, new Float64Array(n))
  let maxDiag = 0
  let minDiag = Infinity
  for (let j = 0; j < p; j++) {
    const v = Math.abs(scaled[j * n + j])
    maxDiag = Math.max(maxDiag, v)
    minDiag = Math.min(minDiag, v)
  }
  if (!(minDiag > MIN_RECIPROCAL_CONDITION * maxDiag)) {
    return { covariance: nanMatrix(), problem: 'the Jacobian is rank-deficient at the solution (parameters are not separately determined)' }
  }
  // (JᵀJ)⁻¹ = S⁻¹ R⁻¹ R⁻ᵀ S⁻¹ with S the column norms and R from the QR of J S⁻¹.
  const rInverse = new Float64Array(p * p)
  for (let col = 0; col < p; col++) {
    const unit = new Float64Array(p)
    unit[col] = 1
    const solved = solveUpperTriangular(scaled, n, p, unit)
    for (let i = 0; i < p; i++) rInverse[i * p + col] = solved[i]
  }
  const covariance: number[][] = []
  for (let a = 0; a < p; a++) {
    const row: number[] = []
    for (let b = 0; b < p; b++) {
      let sum = 0
      for (let k = Math.max(a, b); k < p; k++) sum += rInverse[a * p + k] * rInverse[b * p + k]
      row.push((s2 * sum) / (norms[a] * norms[b]))
    }
    covariance.push(row)
  }
  return { covariance, problem: null }
}

function makeJacobian(
  x: ArrayLike<number>,
  sqrtWeights: Float64Array,
  model: ModelFactory,
  analytic: LeastSquaresOptions['jacobian'],
  initialValues: number[],
  p: number,
): (params: Float64Array) => Float64Array {
  const n = x.length
  if (analytic) {
    return (params) => {
      const list = Array.from(params)
      const out = new Float64Array(n * p)
      for (let i = 0; i < n; i++) {
        const row = analytic(list, x[i])
        for (let j = 0; j < p; j++) out[j * n + i] = sqrtWeights[i] * row[j]
      }
      return out
    }
  }
  return (params) => {
    const out = new Float64Array(n * p)
    const work = Array.from(params)
    for (let j = 0; j < p; j++) {
      const size = Math.max(Math.abs(params[j]), Math.abs(initialValues[j]) * 1e-3, 1e-8)
      const h = CENTRAL_DIFFERENCE_STEP * size
      work[j] = params[j] + h
      const up = model(work.slice())
      work[j] = params[j] - h
      const down = model(work.slice())
      work[j] = params[j]
      // Use the actual representable step, not h, to keep the quotient exact in its denominator.
      const span = params[j] + h - (params[j] - h)
      for (let i = 0; i < n; i++) out[j * n + i] = (sqrtWeights[i] * (up(x[i]) - down(x[i]))) / span
    }
    return out
  }
}

function assertSamples(x: ArrayLike<number>, y: ArrayLike<number>): void {
  if (x.length !== y.length) {
    throw new EngineError('invalid_argument', `x and y must have the same length, got ${x.length} and ${y.length}`)
  }
  for (let i = 0; i < x.length; i++) {
    if (!Number.isFinite(x[i]) || !Number.isFinite(y[i])) {
      throw new EngineError('invalid_argument', `x and y must be finite numbers; sample ${i} is (${x[i]}, ${y[i]})`)
    }
  }
}

function assertParameterVector(values: unknown, name: string): asserts values is number[] {
  if (!Array.isArray(values) || values.length === 0) {
    throw new EngineError('invalid_argument', `${name} must be a non-empty array of numbers`)
  }
  values.forEach((v, j) => {
    if (typeof v !== 'number' || !Number.isFinite(v)) {
      throw new EngineError('invalid_argument', `${name}[${j}] must be a finite number, got ${String(v)}`)
    }
  })
}

function boundVector(values: number[] | undefined, p: number, name: string, fallback: number): Float64Array {
  if (values === undefined) return new Float64Array(p).fill(fallback)
  if (!Array.isArray(values) || values.length !== p) {
    throw new EngineError('invalid_argument', `${name} must have one entry per parameter (${p})`)
  }
  return Float64Array.from(values, (v, j) => {
    if (typeof v !== 'number' || Number.isNaN(v)) throw new EngineError('invalid_argument', `${name}[${j}] must be a number`)
    return v
  })
}

function weightRoots(weights: ArrayLike<number> | undefined, n: number): Float64Array {
  if (weights === undefined) return new Float64Array(n).fill(1)
  if (weights.length !== n) {
    throw new EngineError('invalid_argument', `weights must have one entry per sample (${n}), got ${weights.length}`)
  }
  return Float64Array.from({ length: n }, (_, i) => {
    const w = weights[i]
    if (!Number.isFinite(w) || w < 0) throw new EngineError('invalid_argument', `weights[${i}] must be a finite number ≥ 0, got ${w}`)
    return Math.sqrt(w)
  })
}

function clampInto(values: Float64Array, lower: Float64Array, upper: Float64Array): Float64Array {
  for (let j = 0; j < values.length; j++) values[j] = Math.min(upper[j], Math.max(lower[j], values[j]))
  return values
}
