import { describe, expect, it } from 'vitest'
import { generateSweptTrace, type SweptTraceOptions } from '../../../shared/sim'
import { areaBetween, argMax, fullWidthAtHalfMaximum, indexAt, refinedPeakTime } from './helpers'

/** Noiseless, finely sampled, linear up-sweep: the signal is the pure optical model plus nothing. */
const clean: SweptTraceOptions = {
  gouyOneWayRad: Math.acos(0.6), // symmetric cavity, L = 100 mm, R = 250 mm (OPTICS-CHECKS 2(a))
  finesse: 1000,
  orderPowers: [0.7, 0.15, 0.1, 0.05],
  sampleCount: 200_000,
  fsrCount: 2.2,
  startDetuningFsr: 0.4,
  noiseFraction: 0,
  darkOffsetV: 0,
  includeRamp: true,
  seed: 7,
}

describe('generateSweptTrace truth against its own signal', () => {
  it('when the sweep is linear then every TEM00 truth peak sits on a signal maximum of the stated height', () => {
    const trace = generateSweptTrace(clean)
    const { truth, tSeconds, transmissionV } = trace
    const fundamentals = truth.peaks.filter((p) => p.order === 0)
    // The sweep covers detuning 0.4 … 2.6 FSR: TEM00 at 1 and 2.
    expect(fundamentals).toHaveLength(2)
    for (const peak of fundamentals) {
      const i = indexAt(tSeconds, peak.t)
      const top = argMax(transmissionV, i - 200, i + 200)
      const measuredT = refinedPeakTime(tSeconds, transmissionV, top)
      expect(Math.abs(measuredT - peak.t)).toBeLessThan(0.05 * trace.sampleIntervalSeconds)
      // Airy maximum = height of the peak; other orders add their far wings (≲ 1e-4 of it at 𝓕 = 1000).
      expect(transmissionV[top]).toBeCloseTo(peak.heightV, 3)
      expect(peak.heightV).toBe(1)
    }
  })

  it('when the sweep is linear then consecutive TEM00 peaks are exactly fsrSeconds apart', () => {
    const { truth } = generateSweptTrace(clean)
    const [a, b] = truth.peaks.filter((p) => p.order === 0)
    expect(b.t - a.t).toBeCloseTo(truth.fsrSeconds, 12)
    // Sweep part = 0.9 of a 2 s record (200 000 × 10 µs) over 2.2 FSR.
    expect(truth.fsrSeconds).toBeCloseTo((0.9 * 2) / 2.2, 12)
    expect(truth.sweepMeanFsrSeconds).toBeCloseTo(truth.fsrSeconds, 12)
    expect(truth.samplesPerLinewidth).toBeCloseTo(truth.fsrSeconds / 1000 / 1e-5, 9)
  })

  it('when orders are given then each sits N·ψ/π FSR (mod 1) after TEM00, in the signal too', () => {
    // Offsets for ψ = arccos(0.6): 0.2951672, 0.5903345, 0.8855017 FSR (OPTICS-CHECKS 2(a), from
    // Kogelnik & Li, Appl. Opt. 5, 1550 (1966) and Siegman, "Lasers" (1986), ch. 19).
    const expected = [0, 0.2951672, 0.5903345, 0.8855017]
    const { truth, tSeconds, transmissionV, sampleIntervalSeconds } = generateSweptTrace(clean)
    const t0 = truth.peaks.find((p) => p.order === 0)!.t
    for (const peak of truth.peaks) {
      const offset = ((((peak.t - t0) / truth.fsrSeconds) % 1) + 1) % 1
      expect(offset).toBeCloseTo(expected[peak.order], 6)
      const i = indexAt(tSeconds, peak.t)
      const top = argMax(transmissionV, i - 50, i + 50)
      expect(Math.abs(refinedPeakTime(tSeconds, transmissionV, top) - peak.t)).toBeLessThan(0.1 * sampleIntervalSeconds)
    }
  })

  it('when the sweep runs down then the transverse orders appear mirrored: 1 − N·ψ/π FSR after TEM00', () => {
    const { truth } = generateSweptTrace({ ...clean, direction: 'down' })
    expect(truth.direction).toBe('down')
    const t0 = truth.peaks.find((p) => p.order === 0)!.t
    const first = truth.peaks.find((p) => p.order === 1 && p.t > t0)!
    expect((first.t - t0) / truth.fsrSeconds).toBeCloseTo(1 - 0.2951672, 6)
  })

  it('when areas are integrated on a noiseless finely sampled trace then their shares match orderShares', () => {
    // Equal Airy areas per unit power (area per FSR 1/√(1 + (2𝓕/π)²) for every order; Born & Wolf,
    // "Principles of Optics", §7.6): integrating ±0.04 FSR around each peak keeps the same fraction of every peak;
    // neighbours' far wings add < 0.5 % to the smallest one at 𝓕 = 3000.
    const trace = generateSweptTrace({ ...clean, finesse: 3000, fsrCount: 1, startDetuningFsr: -0.05 })
    const { truth, tSeconds, transmissionV, sampleIntervalSeconds } = trace
    const halfWindow = Math.round((0.04 * truth.fsrSeconds) / sampleIntervalSeconds)
    const areas = [0, 0, 0, 0]
    for (const peak of truth.peaks) {
      const i = indexAt(tSeconds, peak.t)
      areas[peak.order] += areaBetween(transmissionV, sampleIntervalSeconds, i - halfWindow, i + halfWindow)
    }
    const total = areas.reduce((s, a) => s + a, 0)
    expect(truth.orderShares).toEqual([0.7, 0.15, 0.1, 0.05])
    expect(truth.fundamentalFraction).toBe(0.7)
    areas.forEach((area, order) => expect(Math.abs(area / total - truth.orderShares[order])).toBeLessThan(1e-3))
  })

  it('when the finesse is high then the Airy FWHM equals FSR/𝓕', () => {
    // FWHM = FSR/𝓕 in the Lorentzian limit (Born & Wolf, "Principles of Optics", §7.6; OPTICS-CHECKS 2(c)).
    const { truth, tSeconds, transmissionV } = generateSweptTrace({ ...clean, orderPowers: [1] })
    const peak = truth.peaks[0]
    const top = argMax(transmissionV, indexAt(tSeconds, peak.t) - 100, indexAt(tSeconds, peak.t) + 100)
    const fwhm = fullWidthAtHalfMaximum(tSeconds, transmissionV, top)
    expect(fwhm / (truth.fsrSeconds / 1000)).toBeCloseTo(1, 3)
  })

  it('when the finesse is low then the FWHM follows the exact Airy function, not the Lorentzian FSR/𝓕', () => {
    // Exact Airy half width: sin(πx) = 1/√F_c, F_c = (2𝓕/π)² → FWHM = (2/π)·arcsin(π/(2𝓕)) FSR
    // (Born & Wolf §7.6; OPTICS-CHECKS 2(c): 2 % apart from FSR/𝓕 at R = 0.5).
    const finesse = 5
    const { truth, tSeconds, transmissionV } = generateSweptTrace({ ...clean, finesse, orderPowers: [1] })
    const peak = truth.peaks[0]
    const top = argMax(transmissionV, indexAt(tSeconds, peak.t) - 100, indexAt(tSeconds, peak.t) + 100)
    const fwhmFsr = fullWidthAtHalfMaximum(tSeconds, transmissionV, top) / truth.fsrSeconds
    const exact = (2 / Math.PI) * Math.asin(Math.PI / (2 * finesse))
    // Half of the height above zero (no dark offset here), as the formula is defined.
    expect(fwhmFsr / exact).toBeCloseTo(1, 4)
    expect(Math.abs(fwhmFsr * finesse - 1)).toBeGreaterThan(0.01)
  })

  it('when peaks are listed then they are in time order and all inside the main sweep', () => {
    const { truth } = generateSweptTrace({ ...clean, rampShape: 'triangle', sweepFractionOfRecord: 0.5 })
    expect(truth.peaks.length).toBeGreaterThan(4)
    for (let k = 1; k < truth.peaks.length; k++) expect(truth.peaks[k].t).toBeGreaterThan(truth.peaks[k - 1].t)
    for (const peak of truth.peaks) {
      expect(peak.t).toBeGreaterThanOrEqual(truth.sweepStartSeconds)
      expect(peak.t).toBeLessThanOrEqual(truth.sweepEndSeconds)
    }
  })
})
