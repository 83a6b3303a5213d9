import { describe, expect, it } from 'vitest'
import { generateSweptTrace, type SweptTraceOptions } from '../../../shared/sim'
import { indexAt } from './helpers'

const base: SweptTraceOptions = {
  gouyOneWayRad: 0.7,
  finesse: 200,
  orderPowers: [0.9, 0.1],
  sampleCount: 100_000,
  fsrCount: 2.5,
  startDetuningFsr: 0.2,
  seed: 11,
}

describe('generateSweptTrace detector, noise and digitiser', () => {
  it('when the seed is the same then the trace is identical; when it differs then the noise differs', () => {
    const a = generateSweptTrace(base)
    const b = generateSweptTrace(base)
    const c = generateSweptTrace({ ...base, seed: 12 })
    let same = 0
    for (let i = 0; i < a.transmissionV.length; i++) {
      if (a.transmissionV[i] === b.transmissionV[i] && a.rampV![i] === b.rampV![i]) same++
    }
    expect(same).toBe(a.transmissionV.length)
    expect(a.truth).toEqual(b.truth)
    let differing = 0
    for (let i = 0; i < a.transmissionV.length; i++) if (a.transmissionV[i] !== c.transmissionV[i]) differing++
    expect(differing).toBeGreaterThan(99_000)
  })

  it('when no start detuning is given then the seed chooses it', () => {
    const { startDetuningFsr: _ignored, ...seeded } = base
    const a = generateSweptTrace({ ...seeded, seed: 1 }).truth.peaks[0].t
    const b = generateSweptTrace({ ...seeded, seed: 2 }).truth.peaks[0].t
    expect(a).not.toBe(b)
  })

  it('when noise is added then its rms is noiseFraction × peakHeightV around the dark offset', () => {
    const noisy = generateSweptTrace({ ...base, noiseFraction: 0.003, peakHeightV: 2, darkOffsetV: 0.05 })
    const clean = generateSweptTrace({ ...base, noiseFraction: 0, peakHeightV: 2, darkOffsetV: 0.05 })
    let sum = 0
    let sumSq = 0
    const n = noisy.transmissionV.length
    for (let i = 0; i < n; i++) {
      const d = noisy.transmissionV[i] - clean.transmissionV[i]
      sum += d
      sumSq += d * d
    }
    // Sample rms of 100 000 Gaussian deviates: relative spread ≈ 1/√(2n) ≈ 0.2 % (common practice).
    expect(Math.sqrt(sumSq / n) / 0.006).toBeCloseTo(1, 1)
    expect(Math.abs(sum / n)).toBeLessThan(1e-4)
    // On each TEM00 centre the noisy trace reads height + dark offset within 5σ (σ = 6 mV).
    for (const peak of noisy.truth.peaks.filter((p) => p.order === 0)) {
      const value = noisy.transmissionV[indexAt(noisy.tSeconds, peak.t)]
      expect(Math.abs(value - (peak.heightV + 0.05))).toBeLessThan(5 * 0.006)
    }
    // Between resonances the clean signal rests on the dark offset (Airy floor 1/(1 + (2𝓕/π)²) ≈ 6e-5 of 2 V).
    let minimum = Infinity
    for (const v of clean.transmissionV) minimum = Math.min(minimum, v)
    expect(minimum).toBeCloseTo(0.05, 3)
  })

  it('when the digitiser has 8 bits then the trace takes at most 256 evenly spaced levels', () => {
    const { transmissionV, rampV } = generateSweptTrace({ ...base, quantizationBits: 8 })
    const levels = [...new Set(transmissionV)].sort((x, y) => x - y)
    expect(levels.length).toBeLessThanOrEqual(256)
    // Full scale is just above the signal's span, so the peaks run through nearly every level.
    expect(levels.length).toBeGreaterThan(230)
    const step = levels[1] - levels[0]
    for (let k = 1; k < levels.length; k++) {
      const ratio = (levels[k] - levels[k - 1]) / step
      expect(Math.abs(ratio - Math.round(ratio))).toBeLessThan(1e-6)
    }
    expect(new Set(rampV).size).toBeLessThanOrEqual(256)
  })

  it('when the detector low-pass is on then each peak is delayed by the filter mean delay and its area is kept', () => {
    // A linear filter shifts a pulse's centroid by the mean of its impulse response and keeps its area
    // (first and zeroth moments of a convolution; common practice). Discrete single pole: α(1 − α)^k → delay (1 − α)/α samples.
    // High finesse keeps the Lorentzian wings at the window edges (which bias a truncated first moment) below 0.1 %.
    const options = { ...base, finesse: 1000, orderPowers: [1], noiseFraction: 0, darkOffsetV: 0 }
    const plain = generateSweptTrace(options)
    const tau = 2e-4
    const filtered = generateSweptTrace({ ...options, lowPassTauSeconds: tau })
    const dt = plain.sampleIntervalSeconds
    const alpha = 1 - Math.exp(-dt / tau)
    const peak = plain.truth.peaks[0]
    const from = indexAt(plain.tSeconds, peak.t - 0.3 * plain.truth.fsrSeconds)
    const to = indexAt(plain.tSeconds, peak.t + 0.3 * plain.truth.fsrSeconds)
    const moments = (v: Float64Array) => {
      let m0 = 0
      let m1 = 0
      for (let i = from; i < to; i++) {
        m0 += v[i]
        m1 += v[i] * plain.tSeconds[i]
      }
      return { area: m0, centroid: m1 / m0 }
    }
    const before = moments(plain.transmissionV)
    const after = moments(filtered.transmissionV)
    expect((after.centroid - before.centroid) / (((1 - alpha) / alpha) * dt)).toBeCloseTo(1, 2)
    expect(after.area / before.area).toBeCloseTo(1, 3)
    // The peak is lower: its width (360 µs) is comparable to τ = 200 µs.
    let top = 0
    for (let i = from; i < to; i++) top = Math.max(top, filtered.transmissionV[i])
    expect(top).toBeLessThan(0.8)
  })

  it('when the input power drifts then the peak heights follow within ±driftFraction', () => {
    const drifting = generateSweptTrace({ ...base, orderPowers: [1], noiseFraction: 0, darkOffsetV: 0, driftFraction: 0.1 })
    const steady = generateSweptTrace({ ...base, orderPowers: [1], noiseFraction: 0, darkOffsetV: 0 })
    let largest = 0
    let smallest = Infinity
    for (let i = 0; i < steady.transmissionV.length; i++) {
      if (steady.transmissionV[i] < 0.5) continue
      const ratio = drifting.transmissionV[i] / steady.transmissionV[i]
      largest = Math.max(largest, ratio)
      smallest = Math.min(smallest, ratio)
    }
    expect(largest).toBeLessThanOrEqual(1.1 + 1e-12)
    expect(smallest).toBeGreaterThanOrEqual(0.9 - 1e-12)
    expect(largest - smallest).toBeGreaterThan(0.02)
  })
})
