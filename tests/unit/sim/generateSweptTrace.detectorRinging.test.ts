import { describe, expect, it } from 'vitest'
import { generateSweptTrace, type SweptTrace, type SweptTraceOptions } from '../../../shared/sim'
import { errorOf, indexAt } from './helpers'

const RING_HZ = 87e3

/**
 * Sharp resonances: FSR ≈ 9 ms on the time axis, finesse 3000 → FWHM ≈ 3 µs, shorter than the 11.5 µs ringing period,
 * so each TEM00 crossing kicks the detector hard. No noise, so the ringing can be read far down its tail.
 * The start detuning puts the peaks off the sample grid.
 */
const base: SweptTraceOptions = {
  gouyOneWayRad: 0.7,
  finesse: 3000,
  orderPowers: [0.8, 0.12, 0.08],
  sampleCount: 20_000,
  sampleIntervalSeconds: 1e-6,
  fsrCount: 2,
  startDetuningFsr: 0.21379,
  noiseFraction: 0,
  darkOffsetV: 0.01,
  seed: 5,
}

/** The ringing alone: the trace minus the same trace without it (same seed, no noise). */
function ringingResidual(ringing: SweptTrace, plain: SweptTrace): Float64Array {
  return ringing.transmissionV.map((v, i) => v - plain.transmissionV[i])
}

/** Times where `values` changes sign in [from, to), by linear interpolation between the two samples. */
function zeroCrossingTimes(tSeconds: Float64Array, values: Float64Array, from: number, to: number): number[] {
  const times: number[] = []
  for (let i = from; i < to - 1; i++) {
    const a = values[i]
    const b = values[i + 1]
    if (a === 0 || Math.sign(a) === Math.sign(b)) continue
    times.push(tSeconds[i] + (a / (a - b)) * (tSeconds[i + 1] - tSeconds[i]))
  }
  return times
}

/** Values of the local maxima of sign·values in (from, to), each refined by the parabola through it and its neighbours. */
function extremumValues(values: Float64Array, from: number, to: number, sign: 1 | -1): number[] {
  const found: number[] = []
  for (let i = from + 1; i < to - 1; i++) {
    const a = sign * values[i - 1]
    const b = sign * values[i]
    const c = sign * values[i + 1]
    if (b > 0 && b > a && b >= c) found.push(b - (a - c) ** 2 / (8 * (a - 2 * b + c)))
  }
  return found
}

/** TEM00 carriers whose ringing tail of `periods` ring periods stays inside the main sweep. */
function tem00PeaksWithRoomAfter(trace: SweptTrace, periods: number) {
  return trace.truth.peaks.filter((p) => p.order === 0 && p.kind === 'carrier' && p.t + periods / RING_HZ < trace.truth.sweepEndSeconds)
}

/**
 * The free ringing after each TEM00 peak, read from one period after it (the light has gone) to `periods` periods:
 * mean zero-crossing spacing and the ratios of successive positive and of successive negative swings.
 */
function readTails(options: SweptTraceOptions, ringing: Pick<SweptTraceOptions, 'detectorRingHz' | 'detectorRingDecaySeconds'>, periods: number) {
  const plain = generateSweptTrace(options)
  const residual = ringingResidual(generateSweptTrace({ ...options, ...ringing }), plain)
  const ratios = (swings: number[]) => swings.slice(1).map((swing, k) => swing / swings[k])
  return tem00PeaksWithRoomAfter(plain, periods).map((peak) => {
    const from = indexAt(plain.tSeconds, peak.t + 1 / RING_HZ)
    const to = indexAt(plain.tSeconds, peak.t + periods / RING_HZ)
    const crossings = zeroCrossingTimes(plain.tSeconds, residual, from, to)
    return {
      crossingCount: crossings.length,
      crossingSpacingSeconds: (crossings[crossings.length - 1] - crossings[0]) / (crossings.length - 1),
      positiveRatios: ratios(extremumValues(residual, from, to, 1)),
      negativeRatios: ratios(extremumValues(residual, from, to, -1)),
    }
  })
}

describe('generateSweptTrace detector ringing', () => {
  it('when the detector rings then every peak keeps its area above the dark offset within 1 %', () => {
    const plain = generateSweptTrace(base)
    const ringing = generateSweptTrace({ ...base, detectorRingHz: RING_HZ, detectorRingDecaySeconds: 3 / RING_HZ })
    const { fsrSeconds, sweepStartSeconds, sweepEndSeconds } = plain.truth
    // ±0.05 FSR (±450 µs) holds the whole ring-down (τ ≈ 34 µs) and stays clear of the neighbouring orders (0.22 FSR away).
    const halfWindow = 0.05 * fsrSeconds
    const peaks = plain.truth.peaks.filter((p) => p.t - halfWindow > sweepStartSeconds && p.t + halfWindow < sweepEndSeconds)
    expect(peaks.length).toBeGreaterThanOrEqual(5)
    const areaAboveDark = (values: Float64Array, from: number, to: number) => {
      let sum = 0
      for (let i = from; i < to; i++) sum += values[i] - base.darkOffsetV!
      return sum
    }
    for (const peak of peaks) {
      const from = indexAt(plain.tSeconds, peak.t - halfWindow)
      const to = indexAt(plain.tSeconds, peak.t + halfWindow)
      const ratio = areaAboveDark(ringing.transmissionV, from, to) / areaAboveDark(plain.transmissionV, from, to)
      expect(Math.abs(ratio - 1)).toBeLessThan(0.01)
    }
    // The ringing is really there: the tops of the sharp TEM00 peaks overshoot.
    for (const peak of peaks.filter((p) => p.order === 0)) {
      const i = indexAt(plain.tSeconds, peak.t)
      let top = 0
      for (let k = i - 20; k < i + 20; k++) top = Math.max(top, ringing.transmissionV[k])
      expect(top - plain.transmissionV[i]).toBeGreaterThan(0.05)
    }
  })

  it('when the resonances are slow compared with the ringing then the signal passes unchanged within 1 % of the peak height', () => {
    // Finesse 50: FWHM ≈ 180 µs, about 16 ringing periods, so the detector follows the light (unit DC gain).
    // Only the main sweep, from 0.5 ms (30 τ) after its start: the flyback and the ramp's corner are fast and do ring.
    const slow = { ...base, finesse: 50 }
    const plain = generateSweptTrace(slow)
    const ringing = generateSweptTrace({ ...slow, detectorRingHz: RING_HZ })
    const from = indexAt(plain.tSeconds, plain.truth.sweepStartSeconds + 5e-4)
    const to = indexAt(plain.tSeconds, plain.truth.sweepEndSeconds)
    let largest = 0
    for (let i = from; i < to; i++) largest = Math.max(largest, Math.abs(ringing.transmissionV[i] - plain.transmissionV[i]))
    expect(largest).toBeLessThan(0.01)
    // …while the same detector does ring on the sharp resonances of the base trace.
    const sharpPlain = generateSweptTrace(base)
    const sharpRinging = generateSweptTrace({ ...base, detectorRingHz: RING_HZ })
    let sharpLargest = 0
    for (let i = from; i < to; i++) {
      sharpLargest = Math.max(sharpLargest, Math.abs(sharpRinging.transmissionV[i] - sharpPlain.transmissionV[i]))
    }
    expect(sharpLargest).toBeGreaterThan(0.1)
  })

  it('when a teaching-lab scope samples every 5 µs then the tail after each TEM00 peak crosses zero every 1/(2 f_r)', () => {
    // 87 kHz ringing at 5 µs sampling: 2.3 samples per period, as on a real trace. Six periods of free ringing.
    const tails = readTails({ ...base, sampleCount: 4000, sampleIntervalSeconds: 5e-6 }, { detectorRingHz: RING_HZ }, 7)
    expect(tails.length).toBeGreaterThanOrEqual(2)
    for (const tail of tails) {
      expect(tail.crossingCount).toBeGreaterThanOrEqual(10)
      expect(Math.abs(tail.crossingSpacingSeconds * 2 * RING_HZ - 1)).toBeLessThan(0.05)
    }
  })

  it('when the decay time is given then successive same-sign swings shrink by exp(−1/(f_r τ)) and cross zero every 1/(2 f_r)', () => {
    // A damped sine e^(−t/τ)·sin(2πf_r t + φ) has zeros every half period and same-sign extrema one period apart
    // in the ratio e^(−1/(f_r τ)) (common practice). Sampled at 1 µs: 11.5 samples per period.
    // One period (not the default 1.5): each swing is e^(−1) ≈ 0.37 of the one before.
    const decaySeconds = 1 / RING_HZ
    const expectedRatio = Math.exp(-1 / (RING_HZ * decaySeconds))
    const tails = readTails(base, { detectorRingHz: RING_HZ, detectorRingDecaySeconds: decaySeconds }, 7)
    expect(tails.length).toBeGreaterThanOrEqual(2)
    for (const tail of tails) {
      expect(Math.abs(tail.crossingSpacingSeconds * 2 * RING_HZ - 1)).toBeLessThan(0.05)
      for (const ratios of [tail.positiveRatios, tail.negativeRatios]) {
        expect(ratios.length).toBeGreaterThanOrEqual(4)
        for (const ratio of ratios) expect(Math.abs(ratio / expectedRatio - 1)).toBeLessThan(0.15)
      }
    }
  })

  it('when no decay time is given then the ringing decays in 1.5 periods', () => {
    const expectedRatio = Math.exp(-1 / 1.5)
    const tails = readTails(base, { detectorRingHz: RING_HZ }, 5)
    expect(tails.length).toBeGreaterThanOrEqual(2)
    for (const tail of tails) {
      expect(tail.positiveRatios.length).toBeGreaterThanOrEqual(2)
      for (const ratio of [...tail.positiveRatios, ...tail.negativeRatios]) expect(Math.abs(ratio / expectedRatio - 1)).toBeLessThan(0.15)
    }
  })

  it('when detectorRingHz is absent then the trace is identical to detectorRingHz 0, whatever the decay time', () => {
    const options = { ...base, noiseFraction: 0.003, quantizationBits: 12 }
    const absent = generateSweptTrace(options).transmissionV
    const off = generateSweptTrace({ ...options, detectorRingHz: 0 }).transmissionV
    const offWithDecay = generateSweptTrace({ ...options, detectorRingHz: 0, detectorRingDecaySeconds: 1e-5 }).transmissionV
    const on = generateSweptTrace({ ...options, detectorRingHz: RING_HZ }).transmissionV
    const countSame = (a: Float64Array, b: Float64Array) => a.reduce((n, v, i) => (v === b[i] ? n + 1 : n), 0)
    expect(countSame(absent, off)).toBe(absent.length)
    expect(countSame(absent, offWithDecay)).toBe(absent.length)
    // The comparison can fail: switching the ringing on changes the samples around every resonance.
    expect(countSame(absent, on)).toBeLessThan(absent.length - 100)
  })

  it('when a ringing option is out of range then an EngineError names the option, the limit and the value', () => {
    expect(errorOf({ ...base, detectorRingHz: -1 })).toEqual({
      code: 'invalid_sim_options',
      message: 'detectorRingHz must be a number from 0 to 1000000000000000, got -1',
    })
    expect(errorOf({ ...base, detectorRingHz: Number.NaN }).message).toMatch(/^detectorRingHz must be a number .* got NaN$/)
    // 1 µs sampling: Nyquist exactly 500 kHz, which the ringing must stay strictly below; 5 µs: 100 kHz.
    expect(errorOf({ ...base, detectorRingHz: 5e5 }).message).toBe(
      'detectorRingHz must be below the Nyquist frequency 1/(2·sampleIntervalSeconds) = 500000 Hz, got 500000',
    )
    expect(generateSweptTrace({ ...base, detectorRingHz: 4.99e5 }).transmissionV.every(Number.isFinite)).toBe(true)
    expect(errorOf({ ...base, sampleIntervalSeconds: 5e-6, detectorRingHz: 1.2e5 }).message).toBe(
      'detectorRingHz must be below the Nyquist frequency 1/(2·sampleIntervalSeconds) = 100000 Hz, got 120000',
    )
    for (const bad of [0, -1e-5, Number.POSITIVE_INFINITY, 2e3]) {
      expect(errorOf({ ...base, detectorRingHz: RING_HZ, detectorRingDecaySeconds: bad })).toEqual({
        code: 'invalid_sim_options',
        message: `detectorRingDecaySeconds must be a number above 0 and at most 1000, got ${String(bad)}`,
      })
    }
  })
})
