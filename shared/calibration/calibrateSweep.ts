import { EngineError } from '../errors'

/** Map from the file's time axis to optical frequency in FSR units: ν(t) = Σ cₖ uᵏ, u = (t − t0)/scale. */
export interface SweepCalibration {
  coefficients: number[]
  t0Seconds: number
  scaleSeconds: number
  /** Polynomial order used (1 = linear, 2 = quadratic, 3 = cubic; 0 = no TEM00 pair, nominal rate only). */
  polynomialOrder: number
  /** RMS misfit of the TEM00 positions, FSR units (0 when the polynomial passes through every point). */
  residualRmsFsr: number
  /** Median spacing of successive TEM00 resonances, seconds (per FSR). */
  fsrSeconds: number
  /** Mean spacing of successive TEM00 resonances, seconds. */
  meanSpacingSeconds: number
  /** Spread of single spacings (min, max), seconds. */
  spacingRangeSeconds: [number, number]
}

export interface CalibrateSweepOptions {
  /** Highest polynomial order. @default 3 */
  maxOrder?: number
}

/**
 * Maps time to optical frequency from TEM00 resonances one FSR apart: a least-squares polynomial of
 * fsrIndex against time (through up to four points it interpolates — TEM00 centres are far more precise than a
 * linewidth and a piezo's response is close to cubic; from five on, order ≤ points − 2 leaves a residual to judge it) takes out
 * the piezo's nonlinearity (common practice; polynomial least squares as in Press et al., "Numerical Recipes", §15.4).
 */
export function calibrateSweep(timesSeconds: number[], fsrIndex: number[], options: CalibrateSweepOptions = {}): SweepCalibration {
  const { maxOrder = 3 } = options
  if (timesSeconds.length !== fsrIndex.length) {
    throw new EngineError('invalid_argument', 'timesSeconds and fsrIndex must have the same length')
  }
  if (timesSeconds.length < 2) {
    throw new EngineError('single_fundamental', 'Calibration needs at least two TEM00 resonances')
  }
  const count = timesSeconds.length
  const spacings: number[] = []
  for (let k = 1; k < count; k++) {
    spacings.push((timesSeconds[k] - timesSeconds[k - 1]) / (fsrIndex[k] - fsrIndex[k - 1]))
  }
  const sorted = spacings.slice().sort((a, b) => a - b)
  const m = sorted.length >> 1
  const fsrSeconds = sorted.length % 2 ? sorted[m] : (sorted[m - 1] + sorted[m]) / 2
  const meanSpacingSeconds = (timesSeconds[count - 1] - timesSeconds[0]) / (fsrIndex[count - 1] - fsrIndex[0])
  const order = Math.min(maxOrder, count <= 4 ? count - 1 : count - 2)
  const t0Seconds = (timesSeconds[0] + timesSeconds[count - 1]) / 2
  const scaleSeconds = Math.max((timesSeconds[count - 1] - timesSeconds[0]) / 2, 1e-300)
  const u = timesSeconds.map((t) => (t - t0Seconds) / scaleSeconds)
  const coefficients = polyfit(u, fsrIndex, order)
  let ss = 0
  for (let k = 0; k < count; k++) ss += (polyval(coefficients, u[k]) - fsrIndex[k]) ** 2
  return {
    coefficients,
    t0Seconds,
    scaleSeconds,
    polynomialOrder: order,
    residualRmsFsr: Math.sqrt(ss / count),
    fsrSeconds,
    meanSpacingSeconds,
    spacingRangeSeconds: [sorted[0], sorted[sorted.length - 1]],
  }
}

/** The part of a calibration that maps time to frequency. */
export type SweepMap = Pick<SweepCalibration, 'coefficients' | 't0Seconds' | 'scaleSeconds'>

/** Optical frequency in FSR units at time t. */
export function frequencyAt(calibration: SweepMap, tSeconds: number): number {
  return polyval(calibration.coefficients, (tSeconds - calibration.t0Seconds) / calibration.scaleSeconds)
}

/** Local sweep rate dν/dt in FSR per second at time t. */
export function sweepRateAt(calibration: SweepMap, tSeconds: number): number {
  const u = (tSeconds - calibration.t0Seconds) / calibration.scaleSeconds
  const c = calibration.coefficients
  let d = 0
  for (let k = c.length - 1; k >= 1; k--) d = d * u + k * c[k]
  return d / calibration.scaleSeconds
}

function polyval(c: number[], u: number): number {
  let v = 0
  for (let k = c.length - 1; k >= 0; k--) v = v * u + c[k]
  return v
}

/** Least squares by normal equations on a centred, scaled abscissa (|u| ≤ 1 keeps them well conditioned at order ≤ 3). */
function polyfit(u: number[], y: number[], order: number): number[] {
  const size = order + 1
  const a = Array.from({ length: size }, () => new Array<number>(size + 1).fill(0))
  for (let i = 0; i < u.length; i++) {
    const powers = [1]
    for (let k = 1; k <= 2 * order; k++) powers.push(powers[k - 1] * u[i])
    for (let r = 0; r < size; r++) {
      for (let c = 0; c < size; c++) a[r][c] += powers[r + c]
      a[r][size] += powers[r] * y[i]
    }
  }
  // Gaussian elimination with partial pivoting.
  for (let col = 0; col < size; col++) {
    let pivot = col
    for (let r = col + 1; r < size; r++) if (Math.abs(a[r][col]) > Math.abs(a[pivot][col])) pivot = r
    ;[a[col], a[pivot]] = [a[pivot], a[col]]
    for (let r = 0; r < size; r++) {
      if (r === col || a[col][col] === 0) continue
      const f = a[r][col] / a[col][col]
      for (let c = col; c <= size; c++) a[r][c] -= f * a[col][c]
    }
  }
  return a.map((row, r) => (row[r] === 0 ? 0 : row[size] / row[r]))
}
