import { fitLeastSquares } from '../fit'
import { EngineError } from '../errors'

export interface ResonanceShapeGuess {
  centerIndex: number
  heightV: number
  fwhmSamples: number
}

export interface FitResonanceShapeOptions {
  /** First and last sample (inclusive) of the fit window. @default centre ± 3 FWHM (+ the sideband offset) */
  window?: [number, number]
  /** Offset of first-order modulation sidebands from the carrier, samples (both sides); null for none. @default null */
  sidebandOffsetSamples?: number | null
  /** Airy period (one FSR) in samples; null fits a Lorentzian. @default null */
  periodSamples?: number | null
  /** Noise σ of one sample, volts (for the uncertainties). */
  sigmaV: number
  /** Most points handed to the fitter; longer windows are averaged down. @default 400 */
  maxPoints?: number
}

export interface ResonanceShape {
  centerIndex: number
  heightV: number
  fwhmSamples: number
  fwhmErrorSamples: number
  /** Fitted power of each sideband relative to the carrier (0 without sidebands). */
  sidebandRatio: number
  reducedChiSquare: number
  converged: boolean
}

/**
 * Fits one resonance on a zero baseline by Levenberg–Marquardt: a Lorentzian h/(1 + (2(x − c)/w)²), or the Airy
 * function h/(1 + (2𝓕/π)² sin²(π(x − c)/P)) with 𝓕 = P/w (Born & Wolf, "Principles of Optics", §7.6); with a
 * modulation frequency, two first-order sidebands of the same width at ±d with a fitted relative power share the
 * fit, so that unresolved sidebands do not widen the carrier (sidebands of a phase-modulated beam: Black,
 * Am. J. Phys. 69, 79 (2001)).
 */
export function fitResonanceShape(signalV: Float64Array, guess: ResonanceShapeGuess, options: FitResonanceShapeOptions): ResonanceShape | null {
  const { sidebandOffsetSamples = null, periodSamples = null, sigmaV, maxPoints = 400 } = options
  if (!(sigmaV > 0)) throw new EngineError('invalid_argument', `sigmaV must be greater than 0, got ${sigmaV}`)
  const d = sidebandOffsetSamples ?? 0
  const reach = 3 * guess.fwhmSamples + d + 2
  const [lo, hi] = options.window ?? [Math.ceil(guess.centerIndex - reach), Math.floor(guess.centerIndex + reach)]
  const first = Math.max(0, lo)
  const last = Math.min(signalV.length - 1, hi)
  const count = last - first + 1
  const withSidebands = d > 0
  const parameterCount = withSidebands ? 4 : 3
  if (count < parameterCount + 2) return null
  const step = Math.max(1, Math.floor(count / maxPoints))
  const x: number[] = []
  const y: number[] = []
  for (let i = first; i <= last; i += step) {
    let s = 0
    let m = 0
    for (let j = i; j < Math.min(i + step, last + 1); j++) {
      if (Number.isFinite(signalV[j])) { s += signalV[j]; m++ }
    }
    if (m === 0) continue
    x.push(i + (Math.min(i + step, last + 1) - i - 1) / 2)
    y.push(s / m)
  }
  if (x.length < parameterCount + 2) return null
  const line = periodSamples
    ? (z: number, w: number) => {
        const k = (2 * periodSamples) / (Math.PI * w)
        const sn = Math.sin((Math.PI * z) / periodSamples)
        return 1 / (1 + k * k * sn * sn)
      }
    : (z: number, w: number) => {
        const u = (2 * z) / w
        return 1 / (1 + u * u)
      }
  const model = (p: number[]) => (xi: number) => {
    const z = xi - p[0]
    let v = line(z, p[2])
    if (withSidebands) v += p[3] * (line(z - d, p[2]) + line(z + d, p[2]))
    return p[1] * v
  }
  const w0 = Math.max(guess.fwhmSamples, 0.5)
  const initialValues = withSidebands ? [guess.centerIndex, guess.heightV, w0, 0.05] : [guess.centerIndex, guess.heightV, w0]
  const minValues = withSidebands ? [guess.centerIndex - 2 * w0 - 2, 0, 0.05 * w0, 0] : [guess.centerIndex - 2 * w0 - 2, 0, 0.05 * w0]
  const maxValues = withSidebands ? [guess.centerIndex + 2 * w0 + 2, 10 * guess.heightV + 1e-300, 5 * w0 + 5, 1] : [guess.centerIndex + 2 * w0 + 2, 10 * guess.heightV + 1e-300, 5 * w0 + 5]
  try {
    const fit = fitLeastSquares(x, y, model, {
      initialValues,
      minValues,
      maxValues,
      maxIterations: 60,
      relativeTolerance: 1e-8,
      knownResidualVariance: (sigmaV * sigmaV) / step,
    })
    const [c, h, w] = fit.parameters
    if (!(Number.isFinite(c) && h > 0 && w > 0)) return null
    return {
      centerIndex: c,
      heightV: h,
      fwhmSamples: w,
      fwhmErrorSamples: fit.standardErrors[2],
      sidebandRatio: withSidebands ? fit.parameters[3] : 0,
      reducedChiSquare: fit.residualSumOfSquares / (((sigmaV * sigmaV) / step) * Math.max(1, x.length - parameterCount)),
      converged: fit.converged || fit.iterations >= 60,
    }
  } catch {
    return null
  }
}
