/** Parameters of the piezo sweep, already validated. */
export interface SweepModelParameters {
  startTimeSeconds: number
  recordSeconds: number
  sweepFractionOfRecord: number
  rampShape: 'sawtooth' | 'triangle'
  direction: 'up' | 'down'
  fsrCount: number
  startDetuningFsr: number
  nonlinearity: number
  ditherAmplitudeFsr: number
  ditherFrequencyHz: number
}

/** Time → ramp position and optical detuning for one record. */
export interface SweepModel {
  sweepStartSeconds: number
  sweepEndSeconds: number
  /** Piezo drive position 0 … 1 (linear in time on every leg: what the ramp monitor shows). */
  rampPosition(tSeconds: number): number
  /** Laser detuning from the cavity in FSR units, including piezo nonlinearity and dither. */
  detuningFsr(tSeconds: number): number
  /** Time inside the main sweep at which the undithered detuning equals `detuningFsr`, or null outside it. */
  timeOfDetuning(detuningFsr: number): number | null
}

/**
 * The sweep of one record. The main sweep sits in the middle of the record (scopes centre the trigger);
 * before and after it the ramp returns: a fast flyback filling the rest of the period (sawtooth) or a reverse
 * leg at the same speed (triangle). The ramp is linear in time; the cavity length follows it through a smooth
 * monotonic piezo response with a quadratic and a cubic term (common practice model of piezo nonlinearity).
 */
export function createSweepModel(parameters: SweepModelParameters): SweepModel {
  const {
    startTimeSeconds,
    recordSeconds,
    sweepFractionOfRecord: s,
    rampShape,
    direction,
    fsrCount,
    startDetuningFsr,
    nonlinearity: k,
    ditherAmplitudeFsr,
    ditherFrequencyHz,
  } = parameters
  const lead = (1 - s) / 2
  const sign = direction === 'up' ? 1 : -1

  // Periodic ramp: one period per record (sawtooth) or 2·s records (triangle), phase 0 at the main sweep's start.
  const period = rampShape === 'sawtooth' ? 1 : 2 * s
  const rampPosition = (tSeconds: number): number => {
    const u = (tSeconds - startTimeSeconds) / recordSeconds
    const phase = u - lead - period * Math.floor((u - lead) / period)
    if (phase <= s) return phase / s
    return 1 - (phase - s) / (period - s)
  }

  // p(0) = 0, p(1) = 1, p'(r) = 1 + k·(0.7(2r − 1) + 0.3(6r² − 6r + 1)): between about 1 − 0.42k and 1 + k.
  const piezoResponse = (r: number): number => r + k * (0.7 * (r * r - r) + 0.3 * (2 * r * r * r - 3 * r * r + r))

  const nominal = (r: number): number => startDetuningFsr + sign * fsrCount * piezoResponse(r)

  const ditherOmega = 2 * Math.PI * ditherFrequencyHz
  const detuningFsr = (tSeconds: number): number => {
    const base = nominal(rampPosition(tSeconds))
    return ditherAmplitudeFsr === 0 ? base : base + ditherAmplitudeFsr * Math.sin(ditherOmega * tSeconds)
  }

  const sweepStartSeconds = startTimeSeconds + lead * recordSeconds
  const sweepEndSeconds = sweepStartSeconds + s * recordSeconds

  const timeOfDetuning = (target: number): number | null => {
    const fraction = (sign * (target - startDetuningFsr)) / fsrCount
    if (fraction < 0 || fraction > 1) return null
    // p is monotonic on [0, 1] for |k| < 1, so bisection always converges.
    let low = 0
    let high = 1
    for (let iteration = 0; iteration < 60; iteration++) {
      const middle = (low + high) / 2
      if (piezoResponse(middle) < fraction) low = middle
      else high = middle
    }
    return sweepStartSeconds + ((low + high) / 2) * s * recordSeconds
  }

  return { sweepStartSeconds, sweepEndSeconds, rampPosition, detuningFsr, timeOfDetuning }
}
