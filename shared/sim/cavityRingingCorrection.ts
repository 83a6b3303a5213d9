/** One stretch of samples where the dynamic field differs from the steady-state Lorentzian. */
export interface RingingSegment {
  startIndex: number
  /** Dynamic intensity minus steady-state Lorentzian intensity, volts, for samples startIndex, startIndex + 1, … */
  deltaV: Float64Array
}

export interface CavityRingingInput {
  /** Sampled laser detuning from the cavity, FSR units. */
  detuningFsr: Float64Array
  /** The same detuning at any time inside the record (for sub-steps between samples). */
  detuningAt: (tSeconds: number) => number
  startTimeSeconds: number
  sampleIntervalSeconds: number
  fsrHz: number
  finesse: number
  /** Resonance of this mode family, FSR units (resonant where detuning − offset is an integer). */
  offsetFsr: number
  /** Steady-state peak height of this mode, volts. */
  heightV: number
}

/** Crossings slower than this (linewidths swept per amplitude decay time) follow the steady state: skipped. */
const ADIABATIC_LIMIT = 1e-4
/** The field starts in its steady state this many linewidths before a crossing. */
const LINEWIDTHS_BEFORE = 20
/** After a crossing, integrate at least this many linewidths and this many amplitude decay times (intensity e^-30). */
const LINEWIDTHS_AFTER = 20
const DECAY_TIMES_AFTER = 15
/** Bound on sub-steps per sample, to keep pathological inputs from running for minutes. */
const MAX_SUBSTEPS = 4096

/**
 * Ringing of the intracavity field when the laser crosses a resonance faster than the cavity storage time:
 * integrates the slowly varying field dE/dt = (−1/τ + i·2πΔ(t))·E + √H/τ, whose steady state
 * |E|² = H / (1 + (2Δ/δν)²) is the Lorentzian peak of FWHM δν = FSR/𝓕, with amplitude decay time τ = 1/(π δν)
 * (twice the energy storage time 𝓕/(2π FSR)). Source: Poirson et al., J. Opt. Soc. Am. B 14, 2811 (1997);
 * Siegman, "Lasers" (1986), ch. 11 (cavity decay). Each step is integrated exactly for the detuning at its midpoint.
 * Returns the difference from the steady state near every fast crossing; slow crossings return nothing.
 */
export function cavityRingingCorrection(input: CavityRingingInput): RingingSegment[] {
  const { detuningFsr, detuningAt, startTimeSeconds, sampleIntervalSeconds: dt, fsrHz, finesse, offsetFsr, heightV } = input
  const linewidthHz = fsrHz / finesse
  const tauSeconds = 1 / (Math.PI * linewidthHz)

  const windows = findCrossingWindows(detuningFsr, offsetFsr, dt, fsrHz, linewidthHz, tauSeconds)
  const segments: RingingSegment[] = []
  const drive = Math.sqrt(heightV) / tauSeconds
  const decay = -1 / tauSeconds

  for (const { order, startIndex, endIndex } of windows) {
    let maxRateHzPerSecond = 0
    for (let i = startIndex; i < endIndex; i++) {
      maxRateHzPerSecond = Math.max(maxRateHzPerSecond, (Math.abs(detuningFsr[i + 1] - detuningFsr[i]) * fsrHz) / dt)
    }
    // Steps short against the decay time and against the chirp (phase curvature π·rate·h² well below 1).
    const stepLimit = Math.min(tauSeconds / 2, 0.25 / Math.sqrt(2 * Math.PI * Math.max(maxRateHzPerSecond, 1)))
    const substeps = Math.min(MAX_SUBSTEPS, Math.max(1, Math.ceil(dt / stepLimit)))
    const h = dt / substeps
    const decayFactor = Math.exp(decay * h)

    const detuningHzAtSample = (i: number): number => fsrHz * (detuningFsr[i] - offsetFsr - order)
    const lorentzian = (detuningHz: number): number => {
      const x = (2 * detuningHz) / linewidthHz
      return heightV / (1 + x * x)
    }

    // Steady state at the window start: E = √H / (1 − i·2πΔτ).
    const omega0 = 2 * Math.PI * detuningHzAtSample(startIndex)
    const denominator = 1 + omega0 * omega0 * tauSeconds * tauSeconds
    let re = Math.sqrt(heightV) / denominator
    let im = (Math.sqrt(heightV) * omega0 * tauSeconds) / denominator

    const deltaV = new Float64Array(endIndex - startIndex + 1)
    for (let i = startIndex; i < endIndex; i++) {
      const tSample = startTimeSeconds + i * dt
      for (let j = 0; j < substeps; j++) {
        const omega = 2 * Math.PI * fsrHz * (detuningAt(tSample + (j + 0.5) * h) - offsetFsr - order)
        // Exact step for constant Δ: E ← E·e^{λh} + drive·(e^{λh} − 1)/λ, λ = −1/τ + iω.
        const eRe = decayFactor * Math.cos(omega * h)
        const eIm = decayFactor * Math.sin(omega * h)
        const numRe = eRe - 1
        const numIm = eIm
        const lambdaNorm = decay * decay + omega * omega
        const forcedRe = (drive * (numRe * decay + numIm * omega)) / lambdaNorm
        const forcedIm = (drive * (numIm * decay - numRe * omega)) / lambdaNorm
        const nextRe = re * eRe - im * eIm + forcedRe
        im = re * eIm + im * eRe + forcedIm
        re = nextRe
      }
      deltaV[i + 1 - startIndex] = re * re + im * im - lorentzian(detuningHzAtSample(i + 1))
    }
    segments.push({ startIndex, deltaV })
  }
  return segments
}

interface CrossingWindow {
  /** Which resonance of the family (detuning − offset = order). */
  order: number
  startIndex: number
  endIndex: number
}

/** Sample windows around every fast crossing of the family's resonances; windows of one resonance are merged. */
function findCrossingWindows(
  detuningFsr: Float64Array,
  offsetFsr: number,
  dt: number,
  fsrHz: number,
  linewidthHz: number,
  tauSeconds: number,
): CrossingWindow[] {
  const n = detuningFsr.length
  const lastByOrder = new Map<number, CrossingWindow>()
  const windows: CrossingWindow[] = []
  for (let i = 0; i + 1 < n; i++) {
    const a = Math.floor(detuningFsr[i] - offsetFsr)
    const b = Math.floor(detuningFsr[i + 1] - offsetFsr)
    if (a === b) continue
    const rateHzPerSecond = (Math.abs(detuningFsr[i + 1] - detuningFsr[i]) * fsrHz) / dt
    // Linewidths swept per amplitude decay time, divided by π: ringing shows when π·rate·τ² approaches 1.
    if (Math.PI * rateHzPerSecond * tauSeconds * tauSeconds < ADIABATIC_LIMIT) continue
    const linewidthSeconds = linewidthHz / rateHzPerSecond
    const before = Math.ceil((LINEWIDTHS_BEFORE * linewidthSeconds) / dt) + 1
    const after = Math.ceil(Math.max(LINEWIDTHS_AFTER * linewidthSeconds, DECAY_TIMES_AFTER * tauSeconds) / dt) + 1
    for (let order = Math.min(a, b) + 1; order <= Math.max(a, b); order++) {
      const startIndex = Math.max(0, i - before)
      const endIndex = Math.min(n - 1, i + 1 + after)
      const last = lastByOrder.get(order)
      if (last && startIndex <= last.endIndex) {
        last.endIndex = Math.max(last.endIndex, endIndex)
        continue
      }
      const window = { order, startIndex, endIndex }
      lastByOrder.set(order, window)
      windows.push(window)
    }
  }
  return windows
}
