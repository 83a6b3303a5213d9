import { fitLeastSquares } from '../fit'

export interface RingdownFitOptions {
  /** Optical sweep rate at the resonance, Hz per second (its sign does not matter). */
  rateHzPerSecond: number
  /** Starting values: resonance time, steady-state height and field decay time. */
  guess: { centerSeconds: number; heightV: number; decaySeconds: number }
  /** Noise σ of one sample, volts. */
  sigmaV: number
}

export interface RingdownFit {
  /** Field (amplitude) decay time τ = 1/(π δν), seconds, and its standard error. */
  decaySeconds: number
  decayErrorSeconds: number
  /** Time the laser crosses the resonance, seconds; steady-state height, volts. */
  centerSeconds: number
  heightV: number
  reducedChiSquare: number
}

/** Sub-steps per sample at most (a guard against pathological inputs). */
const MAX_SUBSTEPS = 64

/**
 * Fits the transmitted power of one resonance crossed faster than the cavity stores light. The intracavity field
 * obeys dE/dt = (−1/τ + i·2πΔ(t))·E + √H/τ with the detuning Δ(t) = r·(t − t₀) of a linear sweep; the photodiode
 * sees |E|², which rings after the crossing (Poirson et al., J. Opt. Soc. Am. B 14, 2811 (1997); Siegman, "Lasers"
 * (1986), ch. 11). With r known from the calibration, the free parameters are H, t₀ and τ, found by
 * Levenberg–Marquardt on the samples `y` at times `tSeconds` (equally spaced). τ gives the true linewidth
 * δν = 1/(πτ) even where the ringing has widened the peak. Null when the fit does not converge.
 */
export function fitRingdown(tSeconds: Float64Array, y: Float64Array, options: RingdownFitOptions): RingdownFit | null {
  const { rateHzPerSecond, guess, sigmaV } = options
  const n = tSeconds.length
  if (n < 8 || !(Math.abs(rateHzPerSecond) > 0) || !(guess.decaySeconds > 0) || !(guess.heightV > 0)) return null
  const rate = Math.abs(rateHzPerSecond)
  const t0 = tSeconds[0]
  const dt = (tSeconds[n - 1] - t0) / (n - 1)
  const curveOf = (heightV: number, centerSeconds: number, decaySeconds: number): Float64Array => {
    const curve = new Float64Array(n)
    const amplitude = Math.sqrt(Math.max(heightV, 0))
    const drive = amplitude / decaySeconds
    // Steps short against τ and against the chirp (phase curvature π·r·h² well below 1).
    const stepLimit = Math.min(decaySeconds / 2, 0.25 / Math.sqrt(2 * Math.PI * rate))
    const substeps = Math.min(MAX_SUBSTEPS, Math.max(1, Math.ceil(dt / stepLimit)))
    const h = dt / substeps
    const decayFactor = Math.exp(-h / decaySeconds)
    // Steady state at the first sample: E = √H / (1 − i·ωτ).
    const omega0 = 2 * Math.PI * rate * (t0 - centerSeconds)
    const denominator = 1 + omega0 * omega0 * decaySeconds * decaySeconds
    let re = amplitude / denominator
    let im = (amplitude * omega0 * decaySeconds) / denominator
    curve[0] = re * re + im * im
    for (let i = 1; i < n; i++) {
      const tStart = t0 + (i - 1) * dt
      for (let j = 0; j < substeps; j++) {
        const omega = 2 * Math.PI * rate * (tStart + (j + 0.5) * h - centerSeconds)
        // Exact step for constant ω: E ← E·e^{λh} + drive·(e^{λh} − 1)/λ, λ = −1/τ + iω.
        const cos = Math.cos(omega * h)
        const sin = Math.sin(omega * h)
        const eRe = decayFactor * cos
        const eIm = decayFactor * sin
        const lambdaRe = -1 / decaySeconds
        const lambdaIm = omega
        const norm = lambdaRe * lambdaRe + lambdaIm * lambdaIm
        const numRe = eRe - 1
        const numIm = eIm
        const fracRe = (numRe * lambdaRe + numIm * lambdaIm) / norm
        const fracIm = (numIm * lambdaRe - numRe * lambdaIm) / norm
        const nextRe = re * eRe - im * eIm + drive * fracRe
        const nextIm = re * eIm + im * eRe + drive * fracIm
        re = nextRe
        im = nextIm
      }
      curve[i] = re * re + im * im
    }
    return curve
  }
  const x = Float64Array.from({ length: n }, (_, i) => i)
  // The centre is a sample position within the window (never near 0, so the fitter's relative steps bite).
  const centerGuess = (guess.centerSeconds - t0) / dt
  const model = (p: number[]) => {
    const curve = curveOf(p[0], t0 + p[1] * dt, Math.exp(p[2]))
    return (index: number) => curve[index]
  }
  const logGuess = Math.log(guess.decaySeconds)
  const fit = fitLeastSquares(x, y, model, {
    initialValues: [guess.heightV, centerGuess, logGuess],
    minValues: [0, 1, logGuess - Math.log(30)],
    maxValues: [50 * guess.heightV, n - 2, logGuess + Math.log(30)],
    knownResidualVariance: sigmaV * sigmaV,
    maxIterations: 200,
  })
  if (!fit.converged) return null
  const decaySeconds = Math.exp(fit.parameters[2])
  return {
    decaySeconds,
    decayErrorSeconds: decaySeconds * fit.standardErrors[2],
    centerSeconds: t0 + fit.parameters[1] * dt,
    heightV: fit.parameters[0],
    reducedChiSquare: fit.residualSumOfSquares / (sigmaV * sigmaV * Math.max(1, n - 3)),
  }
}
