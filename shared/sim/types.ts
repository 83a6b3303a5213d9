/**
 * Types of the synthetic swept-cavity trace generator.
 *
 * Entry points (import from `shared/sim/index.ts`):
 * - `generateSweptTrace(options: SweptTraceOptions): SweptTrace` — `shared/sim/generateSweptTrace.ts`
 * - `simPresets: Record<string, SweptTraceOptions>` — `shared/sim/simPresets.ts`
 */

import type { CavityGeometry } from '../cavity'

export type { CavityGeometry }

export interface SweptTraceOptions {
  /** One-way Gouy phase ψ in radians; ignored when `cavity` is given (then ψ comes from the geometry). */
  gouyOneWayRad: number
  /** Cavity geometry: gives ψ and fsrHz (c / 2L). */
  cavity?: CavityGeometry
  /** FSR in Hz when no `cavity` is given (needed for sidebands and ringing); `cavity` wins when both are given. */
  fsrHz?: number
  /** Cavity finesse 𝓕 (Lorentzian-limit FSR / FWHM; Airy coefficient of finesse (2𝓕/π)²), e.g. 50 … 3000. */
  finesse: number
  /** Relative power per transverse order, index = order N; normalised by the generator (truth reports shares). */
  orderPowers: number[]
  /** Number of samples: typically 2,500 … 2,000,000 (accepted 16 … 20,000,000). */
  sampleCount: number
  /** How many FSRs the sweep part covers (e.g. 2.3). */
  fsrCount: number
  /** Fraction of the record spent sweeping; the rest is flyback / turnaround. @default 0.9 */
  sweepFractionOfRecord?: number
  /** Optical frequency increasing ('up') or decreasing ('down') with time during the sweep. @default 'up' */
  direction?: 'up' | 'down'
  /**
   * Sawtooth: the flyback fills the rest of the record. Triangle: the ramp reverses at the sweep's speed (period
   * 2 × sweep time). Either way the main sweep is centred in the record. @default 'sawtooth'
   */
  rampShape?: 'sawtooth' | 'triangle'
  /** Optical detuning at the start of the sweep, in FSR units above a TEM00 resonance. @default seeded, in [0, 1) */
  startDetuningFsr?: number
  /**
   * Fractional piezo nonlinearity k (−0.9 … 0.9): the local sweep rate runs from about (1 − 0.42k) to (1 + k) times its
   * mean across the sweep (quadratic + cubic response). The ramp channel stays linear in time. @default 0
   */
  nonlinearity?: number
  /** Sample interval in seconds. @default 1e-5 */
  sampleIntervalSeconds?: number
  /** Time of the first sample. @default −(sampleCount/2)·sampleIntervalSeconds (trigger centred) */
  startTimeSeconds?: number
  /** TEM00 carrier peak height before noise, in volts (the largest order's when TEM00 has no power). @default 1 */
  peakHeightV?: number
  /** White-noise rms as a fraction of the TEM00 height. @default 0.003 */
  noiseFraction?: number
  /** Digitiser bits (8 → 256 levels over a full scale just above the signal's range). @default none */
  quantizationBits?: number
  /** Photodiode dark offset in volts. @default 0.01 */
  darkOffsetV?: number
  /** Slow multiplicative drift of the input power across the record (0.05 → ±5 %). @default 0 */
  driftFraction?: number
  /** Detector single-pole low-pass time constant in seconds. @default 0 */
  lowPassTauSeconds?: number
  /**
   * Ringing frequency f_r of an under-damped second-order detector (photodiode amplifier), in Hz: each sharp
   * resonance is followed by a decaying oscillation at f_r. Unit DC gain, so slow signals and peak areas are kept.
   * Must lie below the Nyquist frequency 1/(2·sampleIntervalSeconds). 0 turns it off. @default 0
   */
  detectorRingHz?: number
  /**
   * Amplitude decay time τ of that ringing (envelope e^(−t/τ)), in seconds; ignored when detectorRingHz is 0.
   * @default 1.5 / detectorRingHz (one and a half periods: successive same-sign swings shrink by e^(−1/1.5) ≈ 0.51)
   */
  detectorRingDecaySeconds?: number
  /** Phase-modulation frequency in MHz: first-order sidebands at ±f_mod on every carrier order (needs an FSR in Hz). */
  modulationMHz?: number
  /** Power in each first-order sideband relative to its carrier. @default 0 (0.05 when modulationMHz is given) */
  sidebandPowerFraction?: number
  /**
   * Astigmatic split Δ = (ψx − ψy)/π in FSR units: order N = m + n splits into N + 1 lines HG_mn at (m − n)·Δ/2
   * about its mean place, so N·Δ apart end to end (Siegman, "Lasers" (1986), ch. 20); the order's power is shared
   * equally among them. @default 0
   */
  astigmatismSplitFsr?: number
  /** Integrate the intracavity field through the sweep (ring-down oscillation after fast crossings). @default false */
  ringing?: boolean
  /** Amplitude of a sinusoidal laser-frequency dither in FSR units. @default 0 */
  ditherAmplitudeFsr?: number
  /** Dither frequency in Hz. @default 0 */
  ditherFrequencyHz?: number
  /** Also output the ramp-monitor channel. @default true */
  includeRamp?: boolean
  /** Seed of the deterministic pseudo-random generator. @default 1 */
  seed?: number
}

export interface SimulatedPeakTruth {
  /** Time of the peak centre on the trace's own time axis, seconds. */
  t: number
  /** Transverse order N of the carrier (for a sideband: of the carrier it belongs to). */
  order: number
  kind: 'carrier' | 'sideband'
  /** Relative integrated power (area per FSR, in units of the total carrier power: carriers sum to 1 per FSR). */
  power: number
  /** This peak's own Airy height in volts before drift, low-pass, ringing (cavity or detector) and noise (split sub-peaks may overlap). */
  heightV: number
  /** Time the sweep takes for one FSR at this peak (the inverse local sweep rate), seconds; null at the sweep's ends. */
  fsrSecondsHere: number | null
}

export interface SweptTraceTruth {
  /** P0 / Σ P_N over carriers (sidebands excluded). */
  fundamentalFraction: number
  /** Carrier power share per order, index = order N, sums to 1. */
  orderShares: number[]
  /**
   * Mean TEM00 spacing on the time axis: (last − first)/(count − 1) over the TEM00 peaks of the main sweep, seconds
   * (what an analysis averaging its TEM00 spacings should find). Falls back to `sweepMeanFsrSeconds` with fewer than two.
   */
  fsrSeconds: number
  /** Sweep duration / fsrCount: the mean time per FSR over the whole main sweep, seconds (equal to fsrSeconds for a linear piezo). */
  sweepMeanFsrSeconds: number
  /** FSR in Hz when known (from `cavity`), else null. */
  fsrHz: number | null
  finesse: number
  gouyOneWayRad: number
  /** Linewidth (FSR / finesse) in samples at the mean sweep rate (sweepMeanFsrSeconds / finesse / sample interval). */
  samplesPerLinewidth: number
  direction: 'up' | 'down'
  /** Start and end of the main sweep (the monotonic part; the rest is flyback or turnaround), seconds. */
  sweepStartSeconds: number
  sweepEndSeconds: number
  /** Every resonance centre inside the main sweep, in time order (crossings during flyback/turnaround are not listed). */
  peaks: SimulatedPeakTruth[]
}

export interface SweptTrace {
  tSeconds: Float64Array
  transmissionV: Float64Array
  /** Ramp-monitor (piezo drive) channel, or null when `includeRamp` is false. */
  rampV: Float64Array | null
  sampleIntervalSeconds: number
  truth: SweptTraceTruth
}
