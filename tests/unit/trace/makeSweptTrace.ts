/**
 * A tiny synthetic swept-cavity recording for the reader's tests: a sawtooth ramp monitor, a transmission
 * channel (Lorentzian peaks on a small baseline) and a reflection channel (the same peaks as dips from a high
 * level). Invented data, no noise: what is written must come back.
 */
export interface SweptTrace {
  sampleInterval: number
  startTime: number
  channels: { name: string; unit: string; values: Float64Array }[]
}

export interface MakeSweptTraceOptions {
  /** @default 2000 */
  sampleCount?: number
  /** Seconds. @default 2e-6 */
  sampleInterval?: number
  /** Seconds. @default -1e-3 */
  startTime?: number
  /** Sawtooth periods over the record. @default 2 */
  sweeps?: number
  /** Peak half-width at half maximum, in samples. @default 3 */
  halfWidthSamples?: number
  /** Which channels to make. @default ['ramp', 'transmission', 'reflection'] */
  channels?: ('ramp' | 'transmission' | 'reflection')[]
}

/** Lorentzian line shape L(x) = 1 / (1 + (x/γ)²) (Siegman, "Lasers" (1986), ch. 2). */
function lorentzian(offset: number, halfWidth: number): number {
  return 1 / (1 + (offset / halfWidth) ** 2)
}

export function makeSweptTrace(options: MakeSweptTraceOptions = {}): SweptTrace {
  const {
    sampleCount: n = 2000,
    sampleInterval = 2e-6,
    startTime = -1e-3,
    sweeps = 2,
    halfWidthSamples = 3,
    channels = ['ramp', 'transmission', 'reflection'],
  } = options
  const period = n / sweeps
  // One TEM00-like tall peak and three smaller ones per sweep, at fixed fractions of the sweep.
  const peaks = [
    { at: 0.15, height: 1 },
    { at: 0.4, height: 0.25 },
    { at: 0.65, height: 1 },
    { at: 0.9, height: 0.1 },
  ]
  const ramp = new Float64Array(n)
  const transmission = new Float64Array(n)
  const reflection = new Float64Array(n)
  for (let i = 0; i < n; i++) {
    const phase = (i % period) / period
    ramp[i] = -1 + 2 * phase
    let light = 0
    for (const peak of peaks) light += peak.height * lorentzian((phase - peak.at) * period, halfWidthSamples)
    transmission[i] = 0.02 + 2 * light
    reflection[i] = 1.5 - 1.2 * light
  }
  const all = { ramp, transmission, reflection }
  return {
    sampleInterval,
    startTime,
    channels: channels.map((name) => ({ name, unit: 'V', values: all[name] })),
  }
}
